// The ordered optical specification of a wave plate. A part carries it; each PO line keeps a frozen
// copy made when the line is ordered, and inspection judges against that copy.
import { z } from 'zod';

export const CONSTRUCTIONS = ['zero-order', 'multi-order', 'achromatic'] as const;
export const MATERIALS = ['quartz', 'mgf2', 'polymer', 'mica', 'other'] as const;
export const DECISION_RULES = ['simple', 'guarded'] as const;

export const CONSTRUCTION_LABELS: Record<(typeof CONSTRUCTIONS)[number], string> = {
  'zero-order': 'Zero-order',
  'multi-order': 'Multi-order',
  achromatic: 'Achromatic',
};
export const MATERIAL_LABELS: Record<(typeof MATERIALS)[number], string> = {
  quartz: 'Crystal quartz',
  mgf2: 'MgF₂',
  polymer: 'Polymer film',
  mica: 'Mica',
  other: 'Other',
};
export const DECISION_RULE_LABELS: Record<(typeof DECISION_RULES)[number], string> = {
  simple: 'Simple acceptance',
  guarded: 'Guarded acceptance (instrument uncertainty)',
};

/** Empty form inputs (blank text, NaN from a number field, null) mean "not given". */
const blankToUndefined = (value: unknown) => (value === '' || value === null || (typeof value === 'number' && Number.isNaN(value)) ? undefined : value);

const positive = (label: string, max: number) =>
  z.coerce
    .number({ error: `${label} must be a number` })
    .positive(`${label} must be greater than 0`)
    .max(max, `${label} is at most ${max}`);

const optionalPositive = (label: string) => z.preprocess(blankToUndefined, positive(label, 20_000).optional());

const optionalFraction = z.preprocess(blankToUndefined, z.coerce.number().min(0, 'At least 0').max(1, 'At most 1').optional());

export const partSpecSchema = z
  .object({
    nominalWaves: positive('Nominal retardance', 100),
    designWavelengthNm: positive('Design wavelength', 20_000),
    retardanceTolWaves: positive('Retardance tolerance', 1),
    axisTolDeg: positive('Axis tolerance', 45),
    construction: z.enum(CONSTRUCTIONS),
    multiOrder: z.preprocess(blankToUndefined, z.coerce.number().int('The order is a whole number').min(1, 'The order is at least 1').max(500).optional()),
    // Each end may be blank in a form; the construction check below asks for both when they matter.
    bandNm: z.tuple([optionalPositive('Band start'), optionalPositive('Band end')]).optional(),
    material: z.enum(MATERIALS),
    clearApertureMm: positive('Clear aperture', 1000),
    diameterMm: positive('Diameter', 1000),
    maxDiattenuation: optionalFraction,
    maxDepolarization: optionalFraction,
    decisionRule: z.enum(DECISION_RULES),
  })
  .superRefine((spec, ctx) => {
    if (spec.construction === 'multi-order' && spec.multiOrder === undefined) {
      ctx.addIssue({ code: 'custom', path: ['multiOrder'], message: 'A multi-order plate needs its order' });
    }
    if (spec.construction === 'achromatic') {
      const [from, to] = spec.bandNm ?? [];
      if (from === undefined) ctx.addIssue({ code: 'custom', path: ['bandNm', 0], message: 'An achromatic plate needs its band' });
      if (to === undefined) ctx.addIssue({ code: 'custom', path: ['bandNm', 1], message: 'An achromatic plate needs its band' });
      if (from === undefined || to === undefined) return;
      if (from >= to) ctx.addIssue({ code: 'custom', path: ['bandNm', 1], message: 'The band must end above where it starts' });
      else if (spec.designWavelengthNm < from || spec.designWavelengthNm > to) {
        ctx.addIssue({ code: 'custom', path: ['designWavelengthNm'], message: 'The design wavelength must lie inside the band' });
      }
    }
    if (spec.clearApertureMm > spec.diameterMm) {
      ctx.addIssue({ code: 'custom', path: ['clearApertureMm'], message: 'The clear aperture cannot exceed the diameter' });
    }
  })
  // Fields that do not belong to the construction are dropped, so a stored spec never carries a stale order or band.
  .transform(({ multiOrder, bandNm, ...spec }): PartSpec => ({
    ...spec,
    ...(spec.construction === 'multi-order' ? { multiOrder } : {}),
    // The refinement above has made sure both ends are there.
    ...(spec.construction === 'achromatic' ? { bandNm: bandNm as [number, number] } : {}),
  }));

export type PartSpecInput = z.input<typeof partSpecSchema>;
export type PartSpec = {
  nominalWaves: number;
  designWavelengthNm: number;
  retardanceTolWaves: number;
  axisTolDeg: number;
  construction: (typeof CONSTRUCTIONS)[number];
  multiOrder?: number;
  bandNm?: [number, number];
  material: (typeof MATERIALS)[number];
  clearApertureMm: number;
  diameterMm: number;
  maxDiattenuation?: number;
  maxDepolarization?: number;
  decisionRule: (typeof DECISION_RULES)[number];
};

/** "λ/4 at 632.8 nm", "0.5 λ at 1064 nm", the short name of a retardance used in lists. */
export function retardanceName(spec: Pick<PartSpec, 'nominalWaves' | 'designWavelengthNm'>) {
  const fractions: Record<number, string> = { 0.25: 'λ/4', 0.5: 'λ/2', 0.125: 'λ/8', 1: 'λ' };
  return `${fractions[spec.nominalWaves] ?? `${spec.nominalWaves} λ`} at ${spec.designWavelengthNm} nm`;
}
