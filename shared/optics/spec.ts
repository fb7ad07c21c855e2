/** The ordered specification a piece is judged against (SPEC.json of readings.md). */
import { z } from 'zod';

const sign = z.union([z.literal(1), z.literal(-1)]);

export const pieceSpecSchema = z
  .object({
    /** Nominal retardance in waves: 0.25 quarter-wave, 0.5 half-wave, or custom (may include whole orders). */
    nominalWaves: z.number().positive(),
    designWavelengthNm: z.number().positive(),
    /** ± tolerance on the retardance, in waves. */
    retardanceTolWaves: z.number().nonnegative(),
    /** ± tolerance on the fast-axis mark, in degrees. */
    axisTolDeg: z.number().nonnegative(),
    /** Simple acceptance, or guarded acceptance by the expanded uncertainty (ILAC-G8:09/2019, ISO 14253-1:2017). */
    decisionRule: z.enum(['simple', 'guarded']).default('simple'),
    /** Expanded uncertainty U of the instrument on the retardance (waves) and on the axis (degrees). */
    uncertaintyWaves: z.number().nonnegative().default(0),
    uncertaintyDeg: z.number().nonnegative().default(0),
    /** Ordered construction: the order m (0 = zero-order). Absent when the order was not specified. */
    multiOrder: z.number().int().nonnegative().optional(),
    /** Achromatic parts: judged at every measured wavelength inside this band (nm). */
    bandNm: z
      .tuple([z.number().positive(), z.number().positive()])
      .refine(([low, high]) => low < high, 'bandNm must be [low, high] with low < high')
      .optional(),
    /** Limit on the diattenuation |D| (Stokes method). */
    maxDiattenuation: z.number().min(0).max(1).optional(),
    /** Limit on the depolarisation power Δ of the polar decomposition (Stokes method). */
    maxDepolarization: z.number().min(0).max(1).optional(),
    /** Instrument profile: -1 when the export's S3 (and R/L) have the opposite handedness. */
    s3Sign: sign.default(1),
    /** Instrument profile: -1 when the export's angles run from x toward -y. */
    angleSign: sign.default(1),
    /** Plate material, for the order and thickness estimated from several wavelengths. */
    material: z.enum(['quartz', 'mgf2', 'polymer', 'mica', 'other']).optional(),
  })
  .refine((s) => s.multiOrder === undefined || s.nominalWaves < 1 || Math.floor(s.nominalWaves) === s.multiOrder, {
    message: 'multiOrder disagrees with the whole waves of nominalWaves',
    path: ['multiOrder'],
  })
  .refine((s) => !s.bandNm || (s.designWavelengthNm >= s.bandNm[0] && s.designWavelengthNm <= s.bandNm[1]), {
    message: 'designWavelengthNm lies outside bandNm',
    path: ['bandNm'],
  });

/** A validated specification, defaults filled in. */
export type PieceSpec = z.output<typeof pieceSpecSchema>;
/** What a caller may pass before defaults (decisionRule, uncertainties and signs are optional). */
export type PieceSpecInput = z.input<typeof pieceSpecSchema>;

export type SpecParse = { ok: true; spec: PieceSpec } | { ok: false; message: string };

/** Validates a specification, with every problem in one readable message. */
export function parsePieceSpec(value: unknown): SpecParse {
  const parsed = pieceSpecSchema.safeParse(value);
  if (parsed.success) return { ok: true, spec: parsed.data };
  const problems = parsed.error.issues.map((issue) => `${issue.path.join('.') || 'spec'}: ${issue.message}`);
  return { ok: false, message: problems.join('; ') };
}

/** The nominal retardance measurable at one wavelength: the fractional part of the nominal, in [0, 1). */
export const nominalFraction = (spec: PieceSpec): number => spec.nominalWaves - Math.floor(spec.nominalWaves);
