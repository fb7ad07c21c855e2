// Receiving a shipment against a PO line, and the views of shipments, lots and pieces.
import { z } from 'zod';
import { listQuerySchema } from './paging';
import type { PartSpec } from './spec';
import type { LocationKind, LotState, MoveReason, PieceQuantities, PieceState } from './stock';

export const MAX_ATTACHMENT_BYTES = 20 * 1024 * 1024;
export const ATTACHMENT_TYPES = ['application/pdf', 'image/png', 'image/jpeg'] as const;
export const ATTACHMENT_KINDS = ['packing-slip', 'certificate'] as const;
export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number];
export const ATTACHMENT_KIND_LABELS: Record<AttachmentKind, string> = {
  'packing-slip': 'Packing slip',
  certificate: "Supplier's certificate",
};
export const MAX_SERIAL_FILE_BYTES = 2 * 1024 * 1024;

const text = (max: number) => z.string().trim().max(max);

/** The text fields of the receiving form (multipart); the files travel beside them. */
export const shipmentReceiveSchema = z.object({
  poLineId: z.coerce.number({ error: 'Choose the PO line' }).int().positive('Choose the PO line'),
  packingSlipNumber: text(60).min(1, 'Give the packing-slip number'),
  carrier: text(80).default(''),
  supplierLot: text(60)
    .min(1, "Give the supplier's lot number")
    .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, 'Letters, digits and . _ / - only'),
  quantity: z.coerce.number({ error: 'Give the quantity' }).int('A whole number').min(1, 'At least 1').max(10_000, 'At most 10000 pieces in one lot'),
  // Serials typed or pasted; may be left blank when a serial file is uploaded instead.
  serials: z.string().max(1_000_000).default(''),
  overReceiptReason: text(500).default(''),
  receivedAt: z.preprocess((v) => (v === '' ? undefined : v), z.iso.datetime({ offset: true }).optional()),
  // The NCR whose pieces, shipped back for a replacement, this shipment replaces.
  replacementForNcrId: z.preprocess((v) => (v === '' || v === null ? undefined : v), z.coerce.number().int().positive().max(2_147_483_647).optional()),
});
export type ShipmentReceiveInput = z.input<typeof shipmentReceiveSchema>;

export const shipmentListQuerySchema = listQuerySchema.extend({
  purchaseOrderId: z.preprocess((v) => (v === '' ? undefined : v), z.coerce.number().int().positive().optional()),
});

export type AttachmentView = { id: number; kind: AttachmentKind; name: string; mediaType: string; sizeBytes: number; sha256: string; uploadedAt: string };

export type ShipmentRow = {
  id: number;
  receivedAt: string;
  poNumber: string;
  supplierName: string;
  packingSlip: string;
  carrier: string;
  receivedBy: string | null;
  lots: number;
  pieces: number;
};

export type LotRow = PieceQuantities & {
  id: number;
  supplierLot: string;
  state: LotState;
  quantity: number;
  partNumber: string;
  partDescription: string;
  supplierName: string;
  poNumber: string;
  lineNumber: number;
  receivedAt: string;
  /** Received while acceptance of its part from its supplier is discontinued: waits without a plan. */
  acceptanceDiscontinued: boolean;
};

export type HistoryEntry = { at: string; what: string; who: string | null; detail?: string };

export type LotView = PieceQuantities & {
  id: number;
  supplierLot: string;
  state: LotState;
  quantity: number;
  overReceiptReason: string | null;
  /** Received while acceptance of its part from its supplier is discontinued: waits without a plan. */
  acceptanceDiscontinued: boolean;
  shipment: { id: number; packingSlip: string; carrier: string; receivedAt: string; receivedBy: string | null };
  purchaseOrder: { id: number; number: string; supplier: { id: number; name: string } };
  line: { id: number; lineNumber: number; quantity: number; inspectionLevel: string; aql: number; hundredPercent: boolean; spec: PartSpec };
  /** The sampling plan drawn at receipt (null while the lot waits without one): Table 1's code letter and the plan's letter. */
  plan: {
    severity: string;
    codeLetter: string;
    planLetter: string;
    sampleSize: number;
    accept: number;
    reject: number;
    hundredPercent: boolean;
    summary: string;
  } | null;
  part: { id: number; number: string; description: string };
  pieceStates: Partial<Record<PieceState, number>>;
  pieces: { id: number; serial: string; state: PieceState; location: string | null }[];
  attachments: AttachmentView[];
  history: HistoryEntry[];
};

export type PieceHistoryView = {
  id: number;
  serial: string;
  state: PieceState;
  location: { code: string; kind: LocationKind } | null;
  part: { id: number; number: string; description: string };
  supplier: { id: number; name: string };
  purchaseOrder: { id: number; number: string; lineNumber: number };
  lot: { id: number; supplierLot: string; state: LotState };
  moves: {
    id: number;
    at: string;
    reason: MoveReason;
    from: string | null;
    to: string | null;
    workOrder: string | null;
    note: string | null;
    who: string | null;
  }[];
  history: HistoryEntry[];
  /** What the bench measured on this piece (superseded results too) and the lot's documents. */
  readings: {
    wavelengthNm: number;
    verdict: 'pass' | 'fail' | 'incomplete';
    retardanceWaves: number | null;
    retardanceErrorWaves: number | null;
    axisErrorDeg: number | null;
    reasons: string[];
    file: string;
    instrument: string;
    measuredAt: string;
    current: boolean;
  }[];
  documents: { number: string; kind: 'certificate' | 'inspection-report'; issuedAt: string; revokedAt: string | null }[];
  /** Set when the piece failed inspection and is in use under its lot's signed use-as-is decision. */
  releasedAsIs: { deviationNumber: string; justification: string | null; signedBy: string | null; signedAt: string } | null;
};
