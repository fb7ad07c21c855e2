// The ordered specification on a PO line, plus the instrument's profile and uncertainty, as the
// engine's piece specification.
import type { Instrument } from '../../db/models';
import type { PieceSpecInput } from '../../shared/optics';
import type { PartSpec } from '../../shared/schemas/spec';

export function pieceSpecFor(spec: PartSpec, instrument?: Pick<Instrument, 'uncertaintyWaves' | 'uncertaintyDeg' | 's3Sign' | 'angleSign'>): PieceSpecInput {
  return {
    nominalWaves: spec.nominalWaves,
    designWavelengthNm: spec.designWavelengthNm,
    retardanceTolWaves: spec.retardanceTolWaves,
    axisTolDeg: spec.axisTolDeg,
    decisionRule: spec.decisionRule,
    uncertaintyWaves: instrument?.uncertaintyWaves ?? 0,
    uncertaintyDeg: instrument?.uncertaintyDeg ?? 0,
    s3Sign: instrument?.s3Sign ?? 1,
    angleSign: instrument?.angleSign ?? 1,
    // A zero-order order is order 0: a multi-order plate shipped against it is then flagged.
    multiOrder: spec.construction === 'zero-order' ? 0 : spec.construction === 'multi-order' ? spec.multiOrder : undefined,
    bandNm: spec.construction === 'achromatic' ? spec.bandNm : undefined,
    maxDiattenuation: spec.maxDiattenuation,
    maxDepolarization: spec.maxDepolarization,
    material: spec.material,
  };
}
