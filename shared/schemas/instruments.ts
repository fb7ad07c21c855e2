import { z } from 'zod';

export const INSTRUMENT_KINDS = ['stokes-polarimeter', 'rotating-plate', 'direct-retardance'] as const;
export const INSTRUMENT_KIND_LABELS: Record<(typeof INSTRUMENT_KINDS)[number], string> = {
  'stokes-polarimeter': 'Stokes polarimeter',
  'rotating-plate': 'Rotating-plate bench',
  'direct-retardance': 'Direct retardance meter',
};

const sign = z.union([z.literal(1), z.literal(-1)]);

export const instrumentInputSchema = z
  .object({
    code: z
      .string()
      .trim()
      .min(1, 'Give the instrument a code')
      .max(40)
      .regex(/^[A-Za-z0-9._-]+$/, 'Letters, digits, dot, dash and underscore only'),
    kind: z.enum(INSTRUMENT_KINDS),
    description: z.string().trim().max(200).default(''),
    // The instrument profile: exports with the opposite S3 sign or angle direction are corrected here.
    s3Sign: sign.default(1),
    angleSign: sign.default(1),
    uncertaintyWaves: z.coerce.number().min(0).max(0.1),
    uncertaintyDeg: z.coerce.number().min(0).max(10),
    calibratedOn: z.iso.date(),
    calibrationDueOn: z.iso.date(),
    active: z.boolean().default(true),
  })
  .refine((v) => v.calibrationDueOn > v.calibratedOn, { message: 'The due date must come after the calibration date', path: ['calibrationDueOn'] });
export type InstrumentInput = z.input<typeof instrumentInputSchema>;

export type InstrumentView = z.output<typeof instrumentInputSchema> & { id: number; calibrationCurrent: boolean };
