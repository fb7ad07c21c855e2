import { z } from 'zod';
import { todayUtc, type CalibrationStanding } from '../calibration';

export const INSTRUMENT_KINDS = ['stokes-polarimeter', 'rotating-plate', 'direct-retardance'] as const;
export const INSTRUMENT_KIND_LABELS: Record<(typeof INSTRUMENT_KINDS)[number], string> = {
  'stokes-polarimeter': 'Stokes polarimeter',
  'rotating-plate': 'Rotating-plate bench',
  'direct-retardance': 'Direct retardance meter',
};

const sign = z.union([z.literal(1), z.literal(-1)]);

const instrumentFields = z.object({
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
});

export const instrumentInputSchema = instrumentFields.refine((v) => v.calibrationDueOn > v.calibratedOn, {
  message: 'The due date must come after the calibration date',
  path: ['calibrationDueOn'],
});
export type InstrumentInput = z.input<typeof instrumentInputSchema>;

/** Editing an instrument's entry: its calibration dates follow its calibration records, recorded apart. */
export const instrumentUpdateSchema = instrumentFields.omit({ calibratedOn: true, calibrationDueOn: true });
export type InstrumentUpdate = z.input<typeof instrumentUpdateSchema>;

export type InstrumentView = z.output<typeof instrumentInputSchema> & { id: number; calibrationCurrent: boolean };

export const MAX_CERTIFICATE_BYTES = 10 * 1024 * 1024;
export const RETARDANCE_UNCERTAINTY_UNITS = ['waves', 'nm'] as const;

const blankless = (v: unknown) => (v === '' || v === null ? undefined : v);
const optionalNumber = (max: number, unit: string) =>
  z.preprocess(
    blankless,
    z.coerce
      .number({ error: `A number of ${unit}` })
      .min(0, 'Not negative')
      .max(max, `At most ${max} ${unit}`)
      .optional(),
  );

/** A calibration as recorded (sent as form fields beside the certificate PDF). */
export const calibrationInputSchema = z
  .object({
    calibratedOn: z.iso.date('The calibration date (YYYY-MM-DD)').refine((day) => day <= todayUtc(), 'The calibration date cannot be in the future'),
    dueOn: z.iso.date('The due date (YYYY-MM-DD)'),
    performedBy: z.string().trim().min(1, 'Say who calibrated it (laboratory or person)').max(200),
    certificateNumber: z.string().trim().max(80).default(''),
    uncertaintyRetardance: optionalNumber(1000, 'waves or nm'),
    uncertaintyRetardanceUnit: z.preprocess(blankless, z.enum(RETARDANCE_UNCERTAINTY_UNITS).optional()),
    uncertaintyAngleDeg: optionalNumber(90, 'degrees'),
    uncertaintyNote: z.string().trim().max(500).default(''),
  })
  .refine((v) => v.dueOn > v.calibratedOn, { message: 'The due date must come after the calibration date', path: ['dueOn'] })
  .refine((v) => v.uncertaintyRetardance === undefined || v.uncertaintyRetardanceUnit !== undefined, {
    message: 'Say whether the retardance uncertainty is in waves or nm',
    path: ['uncertaintyRetardanceUnit'],
  })
  .refine((v) => v.uncertaintyRetardanceUnit === undefined || v.uncertaintyRetardance !== undefined, {
    message: 'Give the retardance uncertainty, or no unit',
    path: ['uncertaintyRetardance'],
  });
export type CalibrationInput = z.input<typeof calibrationInputSchema>;

export type CalibrationView = {
  id: number;
  calibratedOn: string;
  dueOn: string;
  performedBy: string;
  certificateNumber: string;
  uncertaintyRetardance: number | null;
  uncertaintyRetardanceUnit: (typeof RETARDANCE_UNCERTAINTY_UNITS)[number] | null;
  uncertaintyAngleDeg: number | null;
  uncertaintyNote: string;
  certificate: { name: string; sizeBytes: number } | null;
  carriedOver: boolean;
  recordedBy: string | null;
  recordedAt: string;
  standing: CalibrationStanding;
};

export type InstrumentDetailView = InstrumentView & { calibrations: CalibrationView[] };

/** A bench file measured with an instrument, on its page. */
export type InstrumentFileView = {
  id: number;
  name: string;
  lotId: number;
  lot: string;
  method: string;
  measuredOn: string | null;
  rowCount: number;
  uploadedAt: string;
  uploadedBy: string;
};
