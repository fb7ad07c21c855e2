// Corrective-action requests (CARs) to suppliers: raised from NCRs, answered by the supplier through
// a mailed link, accepted or returned by quality, verified on later lots and closed.
import { z } from 'zod';
import { listQuerySchema } from './paging';

export const CAR_STATUSES = ['awaiting-response', 'responded', 'accepted', 'closed'] as const;
export type CarStatus = (typeof CAR_STATUSES)[number];

export const CAR_STATUS_LABELS: Record<CarStatus, string> = {
  'awaiting-response': 'Awaiting the supplier',
  responded: 'Answer to review',
  accepted: 'Accepted, verifying',
  closed: 'Closed',
};

/** What the attachments of an answer may be, sniffed from their content. */
export const RESPONSE_FILE_TYPES = ['application/pdf', 'image/png', 'image/jpeg'] as const;
export const MAX_RESPONSE_FILE_BYTES = 10 * 1024 * 1024;
export const MAX_RESPONSE_FILES = 5;

export const CAR_ACCEPT_MEANING =
  "I accept the supplier's answer to this corrective-action request: its root cause, containment and actions address the nonconformance.";
export const CAR_CLOSE_MEANING = 'I close this corrective-action request: the later lots named were checked and show the action to be effective.';

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
const today = () => new Date().toISOString().slice(0, 10);

export const carRaiseSchema = z.object({
  nonconformanceIds: z.array(z.coerce.number().int().positive().max(2_147_483_647)).min(1, 'Choose at least one NCR').max(50),
  problem: z.string().trim().min(20, 'Describe what the supplier is asked to correct (20 characters or more)').max(4000),
  responseDueOn: z.iso
    .date('Give the date the answer is due')
    .refine((day) => day > today(), 'The answer is due after today')
    .refine((day) => day <= inDays(90), 'At most 90 days ahead'),
});
export type CarRaiseInput = z.input<typeof carRaiseSchema>;

const optionalDate = z.preprocess((v) => (v === '' || v === null ? undefined : v), z.iso.date('A date (YYYY-MM-DD)').optional());
const answer = (label: string) => z.string().trim().min(10, `Describe the ${label} (10 characters or more)`).max(8000);

/** The supplier's answer, as the public form sends it (multipart fields, files apart). */
export const supplierResponseSchema = z.object({
  responderName: z.string().trim().min(2, 'Give your name').max(120),
  rootCause: answer('root cause'),
  containment: answer('containment'),
  correctiveActions: answer('corrective actions'),
  preventiveActions: answer('preventive actions'),
  containmentOn: optionalDate,
  correctiveDueOn: z.iso.date('Give the date the corrective actions take effect'),
  preventiveDueOn: optionalDate,
});
export type SupplierResponseInput = z.input<typeof supplierResponseSchema>;

export const carReviewSchema = z.discriminatedUnion('decision', [
  z.object({
    decision: z.literal('accept'),
    note: z.string().trim().max(2000).default(''),
    password: z.string().min(1, 'Re-enter your password to sign'),
    meaningAcknowledged: z.literal(true, { error: 'Confirm the meaning of your signature' }),
  }),
  z.object({
    decision: z.literal('return'),
    // The supplier reads this with the new link.
    note: z.string().trim().min(10, 'Say what the answer lacks (10 characters or more)').max(2000),
  }),
]);
export type CarReviewInput = z.infer<typeof carReviewSchema>;

export const carCloseSchema = z.object({
  lotIds: z.array(z.coerce.number().int().positive().max(2_147_483_647)).min(1, 'Name at least one later lot that was checked').max(100),
  note: z.string().trim().min(10, 'Say what the later lots showed (10 characters or more)').max(2000),
  password: z.string().min(1, 'Re-enter your password to sign'),
  meaningAcknowledged: z.literal(true, { error: 'Confirm the meaning of your signature' }),
});
export type CarCloseInput = z.infer<typeof carCloseSchema>;

const optionalId = z.preprocess((v) => (v === '' ? undefined : v), z.coerce.number().int().positive().optional());
export const carListQuerySchema = listQuerySchema.extend({
  supplierId: optionalId,
  partId: optionalId,
  status: z.preprocess((v) => (v === '' ? undefined : v), z.enum(CAR_STATUSES).optional()),
  overdue: z.enum(['true', 'false']).optional(),
});
export type CarListQuery = z.infer<typeof carListQuerySchema>;

export type CarRow = {
  id: number;
  number: string;
  supplier: { id: number; name: string };
  part: { id: number; number: string };
  status: CarStatus;
  ncrs: string[];
  responseDueOn: string;
  overdue: boolean;
  requestedAt: string;
  responses: number;
};

export type CarResponseView = {
  id: number;
  responderName: string;
  rootCause: string;
  containment: string;
  correctiveActions: string;
  preventiveActions: string;
  containmentOn: string | null;
  correctiveDueOn: string;
  preventiveDueOn: string | null;
  submittedAt: string;
  address: string | null;
  review: 'accepted' | 'returned' | null;
  reviewedBy: string | null;
  reviewedAt: string | null;
  reviewNote: string | null;
  attachments: { id: number; name: string; mediaType: string; size: number }[];
};

export type CarView = CarRow & {
  part: { id: number; number: string; description: string };
  problem: string;
  sentTo: string;
  requestedBy: string | null;
  nonconformances: { id: number; number: string; lotId: number | null; description: string }[];
  links: { id: number; issuedAt: string; expiresAt: string; revokedAt: string | null; submittedAt: string | null; live: boolean }[];
  responseHistory: CarResponseView[];
  acceptedBy: string | null;
  acceptedAt: string | null;
  closedBy: string | null;
  closedAt: string | null;
  effectivenessNote: string | null;
  checkedLots: { id: number; supplierLot: string; decision: string | null }[];
  /** Lots of the part from the supplier received since the answer was accepted: what closing may name. */
  laterLots: { id: number; supplierLot: string; receivedAt: string; decision: string | null }[];
};

/** What the supplier sees through the link: the request, not the site's records. */
export type SupplierRequestView = {
  number: string;
  supplier: string;
  part: { number: string; description: string };
  problem: string;
  ncrs: { number: string; description: string; serials: string[] }[];
  responseDueOn: string;
  linkExpiresAt: string;
  /** Quality's note when an earlier answer was returned. */
  returnedNote: string | null;
};
