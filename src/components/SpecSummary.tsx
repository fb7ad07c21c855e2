// The ordered optical specification in words, the same wherever a part, PO line or lot shows it.
import { CONSTRUCTION_LABELS, DECISION_RULE_LABELS, MATERIAL_LABELS, retardanceName, type PartSpec } from '@shared/schemas/spec';
import { Details } from './Details';

export function constructionText(spec: PartSpec) {
  if (spec.construction === 'multi-order') return `Multi-order, order ${spec.multiOrder}`;
  if (spec.construction === 'achromatic' && spec.bandNm) return `Achromatic, ${spec.bandNm[0]}–${spec.bandNm[1]} nm`;
  return CONSTRUCTION_LABELS[spec.construction];
}

export function SpecSummary({ spec }: { spec: PartSpec }) {
  return (
    <Details
      columns={4}
      items={[
        ['Retardance', retardanceName(spec)],
        ['Retardance tolerance', `±${spec.retardanceTolWaves} λ`],
        ['Fast-axis tolerance', `±${spec.axisTolDeg}°`],
        ['Construction', constructionText(spec)],
        ['Material', MATERIAL_LABELS[spec.material]],
        ['Size', `Ø ${spec.diameterMm} mm, clear aperture ${spec.clearApertureMm} mm`],
        [
          'Limits',
          [
            spec.maxDiattenuation !== undefined && `diattenuation ≤ ${spec.maxDiattenuation}`,
            spec.maxDepolarization !== undefined && `depolarisation ≤ ${spec.maxDepolarization}`,
          ]
            .filter(Boolean)
            .join(', ') || 'none',
        ],
        ['Decision rule', DECISION_RULE_LABELS[spec.decisionRule]],
      ]}
    />
  );
}
