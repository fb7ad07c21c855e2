// Labels for lots and serials, and the scan look-up that reads them back.
import { z } from 'zod';

/** Label stock: a 4 × 6 in shipping label and a 57 × 32 mm small label, one label per page so
 * thermal label printers feed one label per page. */
export const LABEL_STOCKS = ['4x6in', '57x32mm'] as const;
export type LabelStock = (typeof LABEL_STOCKS)[number];
export const LABEL_STOCK_LABELS: Record<LabelStock, string> = {
  '4x6in': '4 × 6 in shipping label',
  '57x32mm': '57 × 32 mm small label',
};

/** What a lot's label says: the lot itself, one label per serial, or the lot's status. */
export const LOT_LABEL_KINDS = ['lot', 'serials', 'quarantine', 'accepted', 'material-review'] as const;
export type LotLabelKind = (typeof LOT_LABEL_KINDS)[number];
export const LOT_LABEL_KIND_LABELS: Record<LotLabelKind, string> = {
  lot: 'Lot label',
  serials: 'A label per serial',
  quarantine: 'Status: quarantine',
  accepted: 'Status: accepted',
  'material-review': 'Status: material review',
};

export const labelStockQuerySchema = z.object({ stock: z.enum(LABEL_STOCKS).default('57x32mm') });
export const lotLabelQuerySchema = labelStockQuerySchema.extend({ kind: z.enum(LOT_LABEL_KINDS).default('lot') });

/** A scanned or typed code: a serial, a lot name (L-8) or a PO number, as the 2-D codes on
 * Phaselot's labels hold them (the plain text, nothing around it). */
export const lookupQuerySchema = z.object({ code: z.string().trim().min(1, 'Scan or type a code').max(200) });

export type LookupMatch =
  | { kind: 'piece'; serial: string; partNumber: string; lotId: number; path: string }
  | { kind: 'lot'; lotId: number; name: string; partNumber: string; path: string }
  | { kind: 'purchase-order'; purchaseOrderId: number; number: string; supplierName: string; path: string };
export type LookupView = { code: string; matches: LookupMatch[] };
