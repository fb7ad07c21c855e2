// The deviation register: what a supplier's part may deviate by, for how many pieces and until when,
// approved by a quality manager and a second, different approver before any decision may use it.
import { z } from 'zod';
import { listQuerySchema } from './paging';

export const DEVIATION_STATUSES = ['awaiting-approval', 'current', 'exhausted', 'expired', 'withdrawn', 'earlier'] as const;
export type DeviationStatus = (typeof DEVIATION_STATUSES)[number];

export const DEVIATION_STATUS_LABELS: Record<DeviationStatus, string> = {
  'awaiting-approval': 'Awaiting approval',
  current: 'Current',
  exhausted: 'Quantity used up',
  expired: 'Expired',
  withdrawn: 'Withdrawn',
  earlier: 'Recorded before the register',
};

/** What each approval signature means, shown before signing and stored with it. */
export const DEVIATION_APPROVAL_MEANINGS = {
  quality:
    'I approve this deviation as quality manager: pieces of this part from this supplier may be used as stated, within its quantity and until its expiry.',
  second: 'I approve this deviation as second approver: I have reviewed what it allows, its quantity and its expiry.',
} as const;

/** Today's date in UTC (YYYY-MM-DD): a deviation covers decisions up to and including its expiry day. */
export const todayUtc = () => new Date().toISOString().slice(0, 10);

const optionalTolerance = (max: number, unit: string) =>
  z.preprocess(
    (v) => (v === '' || v === null ? undefined : v),
    z.coerce
      .number({ error: `A number of ${unit}` })
      .positive('Greater than 0')
      .max(max, `At most ${max} ${unit}`)
      .optional(),
  );

export const deviationInputSchema = z.object({
  supplierId: z.coerce.number({ error: 'Choose a supplier' }).int().positive('Choose a supplier'),
  partId: z.coerce.number({ error: 'Choose a part' }).int().positive('Choose a part'),
  allowed: z.string().trim().min(10, 'Say what the deviation allows (10 characters or more)').max(4000),
  // Widened tolerances, when the deviation is about a measured quantity (± waves, ± degrees).
  retardanceTolWaves: optionalTolerance(0.5, 'waves'),
  axisTolDeg: optionalTolerance(45, 'degrees'),
  quantityLimit: z.coerce.number({ error: 'Give the number of pieces' }).int('A whole number').min(1, 'At least 1').max(1_000_000),
  expiresOn: z.iso.date('Give the last day it may be used').refine((day) => day >= todayUtc(), 'The expiry cannot be in the past'),
});
export type DeviationInput = z.input<typeof deviationInputSchema>;

export const deviationApprovalSchema = z.object({
  password: z.string().min(1, 'Re-enter your password to sign'),
  meaningAcknowledged: z.literal(true, { error: 'Confirm the meaning of your signature' }),
});
export type DeviationApprovalInput = z.infer<typeof deviationApprovalSchema>;

export const deviationWithdrawalSchema = z.object({
  reason: z.string().trim().min(10, 'State why it is withdrawn (10 characters or more)').max(2000),
});

const optionalId = z.preprocess((v) => (v === '' ? undefined : v), z.coerce.number().int().positive().optional());
export const deviationListQuerySchema = listQuerySchema.extend({
  supplierId: optionalId,
  partId: optionalId,
  status: z.preprocess((v) => (v === '' ? undefined : v), z.enum(DEVIATION_STATUSES).optional()),
});
export type DeviationListQuery = z.infer<typeof deviationListQuerySchema>;

export type DeviationRow = {
  id: number;
  number: string;
  supplier: { id: number; name: string };
  part: { id: number; number: string };
  allowed: string;
  retardanceTolWaves: number | null;
  axisTolDeg: number | null;
  quantityLimit: number | null;
  quantityUsed: number;
  /** Pieces it may still cover; null when no limit was recorded (entries from before the register). */
  quantityLeft: number | null;
  expiresOn: string | null;
  approvals: number;
  status: DeviationStatus;
};

export type DeviationView = DeviationRow & {
  part: { id: number; number: string; description: string };
  recordedBeforeRegister: boolean;
  createdBy: string | null;
  createdAt: string;
  withdrawn: { at: string; by: string | null; reason: string } | null;
  approvalsSigned: { slot: 'quality' | 'second'; approver: string; meaning: string; signedAt: string }[];
  uses: { lotId: number | null; source: 'lot' | 'nonconformance'; quantity: number; usedAt: string; releasedAt: string | null }[];
};
