// The ordered specification in words, for documents and mail.
import { MATERIAL_LABELS, type PartSpec } from '../../shared/schemas/spec';

export function constructionText(spec: PartSpec) {
  if (spec.construction === 'multi-order') return `multi-order (order ${spec.multiOrder})`;
  if (spec.construction === 'achromatic') return `achromatic, ${spec.bandNm?.[0]}–${spec.bandNm?.[1]} nm`;
  return 'zero-order';
}

export function specLines(spec: PartSpec): [string, string][] {
  const lines: [string, string][] = [
    ['Nominal retardance', `${spec.nominalWaves} λ at ${spec.designWavelengthNm} nm`],
    ['Retardance tolerance', `±${spec.retardanceTolWaves} λ`],
    ['Fast-axis mark tolerance', `±${spec.axisTolDeg}°`],
    ['Construction', `${constructionText(spec)}, ${MATERIAL_LABELS[spec.material]}`],
    ['Size', `Ø ${spec.diameterMm} mm, clear aperture ${spec.clearApertureMm} mm`],
  ];
  if (spec.maxDiattenuation !== undefined && spec.maxDiattenuation !== null) lines.push(['Diattenuation limit', `≤ ${spec.maxDiattenuation}`]);
  if (spec.maxDepolarization !== undefined && spec.maxDepolarization !== null) lines.push(['Depolarisation limit', `≤ ${spec.maxDepolarization}`]);
  return lines;
}
