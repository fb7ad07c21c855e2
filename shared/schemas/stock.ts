// Lots, pieces, locations and the stock ledger: the states and kinds every part of Phaselot shares.
import { z } from 'zod';
import { listQuerySchema } from './paging';

// A lot under a sort decision is 'sorting' while its remaining pieces are measured, and 'sorted' once
// every piece has gone by its own verdict.
export const LOT_STATES = ['quarantine', 'inspection', 'awaiting-disposition', 'accepted', 'rejected', 'sorting', 'sorted', 'use-as-is'] as const;
export const lotStateSchema = z.enum(LOT_STATES);
export type LotState = z.infer<typeof lotStateSchema>;
export const LOT_STATE_LABELS: Record<LotState, string> = {
  quarantine: 'Quarantine',
  inspection: 'Under inspection',
  'awaiting-disposition': 'Awaiting disposition',
  accepted: 'Accepted',
  rejected: 'Rejected',
  sorting: 'Sorting 100 %',
  sorted: 'Sorted',
  'use-as-is': 'Use as is',
};
/** Lots whose pieces may go to a stock bin (each piece still by its own verdict). */
export const RELEASABLE_LOT_STATES: readonly LotState[] = ['accepted', 'sorted', 'use-as-is'];
/** States in which a lot's decision is signed and its measurements are closed. */
export const DECIDED_LOT_STATES: readonly LotState[] = ['accepted', 'rejected', 'sorted', 'use-as-is'];

/** The one name of a lot on pages, in mails, documents and audit notes. */
export const lotName = (lotId: number) => `L-${lotId}`;

/** Pieces of a lot (or of every lot of a PO or PO line) by outcome: accepted = released to stock (in
 * a bin, or issued since); nonconforming = current verdict fail (wherever the piece is); returned =
 * in return-to-vendor, or shipped back to the vendor. */
export type PieceQuantities = { accepted: number; nonconforming: number; returned: number };

// 'scrapped' and 'shipped-back' pieces have left the site for good (NCR dispositions, returns).
export const PIECE_STATES = ['quarantine', 'held', 'in-stock', 'issued', 'returned', 'scrapped', 'shipped-back'] as const;
export const pieceStateSchema = z.enum(PIECE_STATES);
export type PieceState = z.infer<typeof pieceStateSchema>;
export const PIECE_STATE_LABELS: Record<PieceState, string> = {
  quarantine: 'Quarantine',
  held: 'Held',
  'in-stock': 'In stock',
  issued: 'Issued',
  returned: 'Returned to vendor',
  scrapped: 'Scrapped',
  'shipped-back': 'Shipped back to vendor',
};

export const LOCATION_KINDS = ['quarantine', 'inspection-hold', 'stock', 'material-review', 'return-to-vendor'] as const;
export const locationKindSchema = z.enum(LOCATION_KINDS);
export type LocationKind = z.infer<typeof locationKindSchema>;
export const LOCATION_KIND_LABELS: Record<LocationKind, string> = {
  quarantine: 'Quarantine',
  'inspection-hold': 'Inspection hold',
  stock: 'Stock bin',
  'material-review': 'Material review',
  'return-to-vendor': 'Return to vendor',
};
/** The state a piece takes where it lands; `null` is out of stores, by the move's reason. */
export function pieceStateAt(kind: LocationKind | null, reason: MoveReason = 'issue'): PieceState {
  switch (kind) {
    case null:
      return reason === 'scrap' ? 'scrapped' : reason === 'ship-to-vendor' ? 'shipped-back' : 'issued';
    case 'stock':
      return 'in-stock';
    case 'quarantine':
      return 'quarantine';
    case 'return-to-vendor':
      return 'returned';
    default:
      return 'held';
  }
}

export const MOVE_REASONS = ['receipt', 'inspection', 'release', 'transfer', 'issue', 'return', 'hold', 'return-to-vendor', 'scrap', 'ship-to-vendor'] as const;
/** Reasons that take pieces out of stores (no destination location). */
export const OUT_OF_STORES_REASONS: readonly MoveReason[] = ['issue', 'scrap', 'ship-to-vendor'];
export const moveReasonSchema = z.enum(MOVE_REASONS);
export type MoveReason = z.infer<typeof moveReasonSchema>;
export const MOVE_REASON_LABELS: Record<MoveReason, string> = {
  receipt: 'Received',
  inspection: 'To inspection',
  release: 'Released to stock',
  transfer: 'Transferred',
  issue: 'Issued to work order',
  return: 'Returned from work order',
  hold: 'Held for review',
  'return-to-vendor': 'Set aside for the vendor',
  scrap: 'Scrapped',
  'ship-to-vendor': 'Shipped back to vendor',
};

const id = z.coerce.number().int().positive();
const optionalId = z.preprocess((v) => (v === '' ? undefined : v), id.optional());
const serialText = z.string().trim().min(1, 'Give at least one serial number').max(200_000);

export const lotListQuerySchema = listQuerySchema.extend({
  state: lotStateSchema.optional(),
  partId: optionalId,
  supplierId: optionalId,
  purchaseOrderId: optionalId,
});
export type LotListQuery = z.infer<typeof lotListQuerySchema>;

export const stockQuerySchema = listQuerySchema.extend({
  partId: optionalId,
  locationId: optionalId,
  kind: locationKindSchema.optional(),
});
export type StockQuery = z.infer<typeof stockQuerySchema>;

export const moveListQuerySchema = listQuerySchema.extend({
  partId: optionalId,
  locationId: optionalId,
  lotId: optionalId,
  reason: moveReasonSchema.optional(),
  workOrder: z.string().trim().max(40).optional(),
});
export type MoveListQuery = z.infer<typeof moveListQuerySchema>;

export const workOrderSchema = z
  .string()
  .trim()
  .min(1, 'Give the work order')
  .max(40)
  .regex(/^[A-Za-z0-9._/-]+$/, 'Letters, digits and . _ / - only');

export const issueInputSchema = z.object({ partId: id, serials: serialText, workOrder: workOrderSchema });
export type IssueInput = z.input<typeof issueInputSchema>;

export const transferInputSchema = z.object({ partId: id, serials: serialText, toLocationId: id });
export type TransferInput = z.input<typeof transferInputSchema>;

export const releaseInputSchema = z.object({
  lotId: id,
  toLocationId: id,
  // Blank releases every piece of the lot still waiting.
  serials: z.string().trim().max(200_000).default(''),
});
export type ReleaseInput = z.input<typeof releaseInputSchema>;

export type LocationView = { id: number; code: string; name: string; kind: LocationKind; active: boolean };

export type StockRow = {
  partId: number;
  partNumber: string;
  partDescription: string;
  locationId: number;
  locationCode: string;
  locationKind: LocationKind;
  onHand: number;
};

export type MoveView = {
  id: number;
  movedAt: string;
  serial: string;
  pieceId: number;
  lotId: number;
  partNumber: string;
  from: string | null;
  to: string | null;
  reason: MoveReason;
  workOrder: string | null;
  note: string | null;
  actor: string | null;
};
