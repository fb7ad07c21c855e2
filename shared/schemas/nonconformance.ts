// Nonconformance reports (NCRs) and returns to the vendor: the report's states and origins, the
// per-piece dispositions a quality manager signs, the defect-code catalogue, the return shipments
// (RMA), and the views both ends read.
import { z } from 'zod';
import { listQuerySchema } from './paging';
import type { LocationKind, PieceState } from './stock';

export const NCR_STATUSES = ['open', 'dispositioned', 'closed'] as const;
export type NcrStatus = (typeof NCR_STATUSES)[number];
export const NCR_STATUS_LABELS: Record<NcrStatus, string> = {
  open: 'Open: awaiting disposition',
  dispositioned: 'Dispositioned: being carried out',
  closed: 'Closed',
};

export const NCR_ORIGINS = ['rejection', 'sort', 'accepted-lot', 'found-later'] as const;
export type NcrOrigin = (typeof NCR_ORIGINS)[number];
export const NCR_ORIGIN_LABELS: Record<NcrOrigin, string> = {
  rejection: 'Lot rejected',
  sort: 'Nonconforming in a 100 % sort',
  'accepted-lot': 'Failed pieces of an accepted lot',
  'found-later': 'Found later',
};

export const NCR_DECISIONS = ['return-to-vendor', 'scrap', 'rework', 'use-as-is'] as const;
export type NcrDecision = (typeof NCR_DECISIONS)[number];
export const NCR_DECISION_LABELS: Record<NcrDecision | 'rework-release', string> = {
  'return-to-vendor': 'Return to vendor',
  scrap: 'Scrap',
  rework: 'Rework',
  'use-as-is': 'Use as is (deviation)',
  'rework-release': 'Released after rework',
};

/** What each signature means, shown before signing and stored with it. */
export const NCR_SIGNATURE_MEANINGS: Record<NcrDecision | 'rework-release', string> = {
  'return-to-vendor': 'I disposition these pieces as nonconforming, to be returned to the supplier.',
  scrap: 'I disposition these pieces as nonconforming and unusable: they are scrapped and leave stores for good.',
  rework: 'I disposition these pieces for rework: they are held for rework and re-inspection and may not be used before they are released.',
  'use-as-is': 'I release these nonconforming pieces for use as is under the deviation stated, for the reason given.',
  'rework-release': 'I release these reworked pieces for use: they were reworked and re-inspected, and conform as recorded in the reference given.',
};

const id = z.coerce.number().int().positive().max(2_147_483_647);
const optionalId = z.preprocess((v) => (v === '' || v === null ? undefined : v), id.optional());
const text = (min: number, message: string, max = 4000) => z.string().trim().min(min, message).max(max);

const signature = {
  password: z.string().min(1, 'Re-enter your password to sign'),
  meaningAcknowledged: z.literal(true, { error: 'Confirm the meaning of your signature' }),
};

export const ncrListQuerySchema = listQuerySchema.extend({
  status: z.preprocess((v) => (v === '' ? undefined : v), z.enum(NCR_STATUSES).optional()),
  origin: z.preprocess((v) => (v === '' ? undefined : v), z.enum(NCR_ORIGINS).optional()),
  supplierId: optionalId,
  partId: optionalId,
  lotId: optionalId,
  // NCRs still owed replacement pieces for pieces shipped back: what a replacement shipment may name.
  awaitingReplacement: z.stringbool().optional(),
});
export type NcrListQuery = z.infer<typeof ncrListQuerySchema>;

/** Opening an NCR by hand for pieces found nonconforming later (at assembly, in stock). */
export const ncrOpenSchema = z.object({
  partId: id,
  serials: z.string().trim().min(1, 'Give at least one serial number').max(20_000),
  defectCodeIds: z.array(id).min(1, 'Choose at least one defect code').max(20),
  description: text(10, 'Describe what was found (10 characters or more)'),
  containment: z.string().trim().max(4000).default(''),
  ownerId: optionalId,
});
export type NcrOpenInput = z.input<typeof ncrOpenSchema>;

export const ncrUpdateSchema = z.object({
  defectCodeIds: z.array(id).min(1, 'Choose at least one defect code').max(20),
  description: text(10, 'Describe the nonconformance (10 characters or more)'),
  containment: z.string().trim().max(4000).default(''),
  ownerId: z.preprocess((v) => (v === '' ? null : v), id.nullable()),
});
export type NcrUpdateInput = z.input<typeof ncrUpdateSchema>;

export const ncrDispositionSchema = z
  .object({
    ...signature,
    decision: z.enum(NCR_DECISIONS, { error: 'Choose a disposition' }),
    // The pieces it covers; none named covers every piece still awaiting a disposition.
    pieceIds: z.array(id).max(10_000).default([]),
    // Use as is: the register entry (a current deviation of the NCR's supplier and part) and the stock bin.
    deviationId: optionalId,
    justification: z.string().trim().max(2000).optional(),
    toLocationId: optionalId,
    note: z.string().trim().max(2000).optional(),
  })
  .superRefine((value, ctx) => {
    if (value.decision !== 'use-as-is') return;
    if (!value.deviationId) ctx.addIssue({ code: 'custom', path: ['deviationId'], message: 'Choose the deviation the pieces are used under' });
    if (!value.justification || value.justification.length < 10)
      ctx.addIssue({ code: 'custom', path: ['justification'], message: 'State the justification (10 characters or more)' });
    if (!value.toLocationId) ctx.addIssue({ code: 'custom', path: ['toLocationId'], message: 'Choose the stock bin the pieces go to' });
  });
export type NcrDispositionInput = z.input<typeof ncrDispositionSchema>;

export const reworkReleaseSchema = z.object({
  ...signature,
  pieceIds: z.array(id).max(10_000).default([]),
  toLocationId: id,
  reference: text(3, 'Give the re-inspection record (report or file name)', 200),
});
export type ReworkReleaseInput = z.input<typeof reworkReleaseSchema>;

export const ncrCloseSchema = z.object({ note: z.string().trim().max(2000).default('') });
export type NcrCloseInput = z.input<typeof ncrCloseSchema>;

export const REMEDIES = ['credit', 'replacement'] as const;
export type Remedy = (typeof REMEDIES)[number];
export const REMEDY_LABELS: Record<Remedy, string> = { credit: 'Credit', replacement: 'Replacement' };

export const returnInputSchema = z
  .object({
    nonconformanceId: id,
    // The pieces shipped; none named ships every piece of the NCR dispositioned for return and not yet shipped.
    pieceIds: z.array(id).max(10_000).default([]),
    rmaNumber: z
      .string()
      .trim()
      .min(1, 'Give the RMA number the supplier issued')
      .max(40)
      .regex(/^[A-Za-z0-9._/-]+$/, 'Letters, digits and . _ / - only'),
    shipDate: z.iso.date('Give the ship date'),
    carrier: text(1, 'Give the carrier', 80),
    tracking: z.string().trim().max(80).default(''),
    remedy: z.enum(REMEDIES, { error: 'Choose credit or replacement' }),
    creditAmount: z.preprocess((v) => (v === '' || v === null ? undefined : v), z.coerce.number({ error: 'An amount' }).min(0).max(1e9).optional()),
    note: z.string().trim().max(2000).default(''),
  })
  .superRefine((value, ctx) => {
    if (value.remedy === 'replacement' && value.creditAmount !== undefined)
      ctx.addIssue({ code: 'custom', path: ['creditAmount'], message: 'A replacement has no credit amount' });
  });
export type ReturnInput = z.input<typeof returnInputSchema>;

export const returnListQuerySchema = listQuerySchema.extend({
  supplierId: optionalId,
  nonconformanceId: optionalId,
  remedy: z.preprocess((v) => (v === '' ? undefined : v), z.enum(REMEDIES).optional()),
});
export type ReturnListQuery = z.infer<typeof returnListQuerySchema>;

const codeSchema = z
  .string()
  .trim()
  .min(2, 'At least 2 characters')
  .max(30)
  .regex(/^[a-z0-9][a-z0-9-]*$/, 'Lower-case letters, digits and - only');
export const defectCodeInputSchema = z.object({
  code: codeSchema,
  label: text(3, 'Give the label shown (3 characters or more)', 120),
  active: z.boolean().default(true),
});
export type DefectCodeInput = z.input<typeof defectCodeInputSchema>;

export type DefectCodeView = { id: number; code: string; label: string; active: boolean; inUse: number };

export type NcrRow = {
  id: number;
  number: string;
  status: NcrStatus;
  origin: NcrOrigin;
  supplierId: number;
  supplierName: string;
  partId: number;
  partNumber: string;
  lotId: number | null;
  pieces: number;
  awaiting: number;
  /** Pieces shipped back for a replacement that no replacement shipment has brought yet. */
  replacementOwed: number;
  defects: string[];
  owner: string | null;
  openedAt: string;
  closedAt: string | null;
};

export type NcrPieceView = {
  pieceId: number;
  serial: string;
  state: PieceState;
  location: { code: string; kind: LocationKind } | null;
  lotId: number;
  reasons: string[];
  disposition: { id: number; decision: NcrDecision } | null;
  reworkReleased: boolean;
  returnId: number | null;
  rmaNumber: string | null;
};

export type NcrDispositionView = {
  id: number;
  decision: NcrDecision | 'rework-release';
  meaning: string;
  deviation: { id: number | null; number: string } | null;
  justification: string | null;
  note: string | null;
  signer: string;
  signedAt: string;
  serials: string[];
};

export type ReturnView = {
  id: number;
  nonconformanceId: number;
  ncrNumber: string;
  supplierName: string;
  rmaNumber: string;
  shipDate: string;
  carrier: string;
  tracking: string;
  remedy: Remedy;
  creditAmount: number | null;
  currency: string | null;
  note: string;
  serials: string[];
  createdBy: string;
  createdAt: string;
};

export type ReturnRow = Omit<ReturnView, 'serials' | 'note' | 'createdBy'> & { pieces: number; replaced: number };

export type ReplacementView = { shipmentId: number; packingSlip: string; poNumber: string; receivedAt: string; lots: { id: number; quantity: number }[] };

export type NcrView = {
  id: number;
  number: string;
  status: NcrStatus;
  origin: NcrOrigin;
  supplier: { id: number; name: string };
  part: { id: number; number: string; description: string };
  lot: { id: number; supplierLot: string; poId: number; poNumber: string } | null;
  lotDecision: { id: number; decision: string; signedAt: string } | null;
  description: string;
  containment: string;
  owner: { id: number; name: string } | null;
  openedBy: string | null;
  openedAt: string;
  closedBy: string | null;
  closedAt: string | null;
  closingNote: string | null;
  defects: { id: number; code: string; label: string }[];
  pieces: NcrPieceView[];
  dispositions: NcrDispositionView[];
  returns: ReturnView[];
  replacements: ReplacementView[];
  /** What may be done next, in words, when nothing stops closing it: null. */
  openItems: string[];
};
