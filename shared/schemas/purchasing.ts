// Suppliers, parts and purchase orders: what the buyer enters, and what the lists answer with.
import { z } from 'zod';
import { listQuerySchema } from './paging';
import { partSpecSchema, type PartSpec } from './spec';
import type { PieceQuantities } from './stock';
import { AQL_VALUES, INSPECTION_LEVELS } from '../sampling/tables';

// A PO line offers the levels and AQLs the sampling tables have.
export { AQL_VALUES, INSPECTION_LEVELS };
export const PO_STATUSES = ['open', 'closed'] as const;
export type PoStatus = (typeof PO_STATUSES)[number];

const code = (label: string, max: number) =>
  z
    .string()
    .trim()
    .min(1, `Give the ${label}`)
    .max(max)
    .regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, 'Letters, digits and . _ / - only, starting with a letter or digit');

export const supplierInputSchema = z.object({
  name: z.string().trim().min(1, 'Give the supplier a name').max(120),
  contactEmail: z.string().trim().toLowerCase().email('Enter a valid e-mail address'),
  // Where corrective-action requests go; blank until the supplier names one.
  qualityContactEmail: z.union([z.literal(''), z.string().trim().toLowerCase().email('Enter a valid e-mail address')]).default(''),
  // The buyer who owns the supplier; blank means the buyer saving the form.
  ownerId: z.preprocess((v) => (v === '' || v === null ? undefined : v), z.coerce.number().int().positive().optional()),
  notes: z.string().trim().max(1000).default(''),
  active: z.boolean().default(true),
});
export type SupplierInput = z.input<typeof supplierInputSchema>;

export const partInputSchema = z.object({
  number: code('part number', 40),
  description: z.string().trim().min(1, 'Describe the part').max(200),
  spec: partSpecSchema,
  active: z.boolean().default(true),
});
export type PartInput = z.input<typeof partInputSchema>;

export const poLineInputSchema = z.object({
  // Present when an existing line is edited; absent for a new line.
  id: z.preprocess((v) => (v === '' || v === null ? undefined : v), z.coerce.number().int().positive().optional()),
  partId: z.coerce.number({ error: 'Choose a part' }).int().positive('Choose a part'),
  quantity: z.coerce.number({ error: 'Give the quantity' }).int('A whole number').min(1, 'At least 1').max(100_000),
  unitPrice: z.coerce.number({ error: 'Give the unit price' }).min(0, 'Not negative').max(1_000_000),
  inspectionLevel: z.enum(INSPECTION_LEVELS),
  aql: z.coerce.number().refine((v) => (AQL_VALUES as readonly number[]).includes(v), { message: `One of ${AQL_VALUES.join(', ')}` }),
  hundredPercent: z.boolean().default(false),
  // The date the supplier promised; on-time delivery counts lots received on or before it.
  dueOn: z.preprocess((v) => (v === '' || v === null ? undefined : v), z.iso.date('Give the due date as a date').optional()),
});
export type PoLineInput = z.input<typeof poLineInputSchema>;

export const purchaseOrderInputSchema = z
  .object({
    number: code('PO number', 30),
    supplierId: z.coerce.number({ error: 'Choose a supplier' }).int().positive('Choose a supplier'),
    orderedOn: z.iso.date('Give the order date'),
    currency: z
      .string()
      .trim()
      .toUpperCase()
      .regex(/^[A-Z]{3}$/, 'A three-letter currency code'),
    status: z.enum(PO_STATUSES).default('open'),
    notes: z.string().trim().max(2000).default(''),
    lines: z.array(poLineInputSchema).min(1, 'A PO needs at least one line').max(200),
  })
  .superRefine((order, context) => {
    order.lines.forEach((line, index) => {
      if (line.dueOn && order.orderedOn && line.dueOn < order.orderedOn)
        context.addIssue({ code: 'custom', path: ['lines', index, 'dueOn'], message: 'Due on or after the order date' });
    });
  });
export type PurchaseOrderInput = z.input<typeof purchaseOrderInputSchema>;

const optionalId = z.preprocess((v) => (v === '' ? undefined : v), z.coerce.number().int().positive().optional());
export const supplierListQuerySchema = listQuerySchema.extend({ active: z.enum(['true', 'false']).optional() });
export const partListQuerySchema = listQuerySchema.extend({ active: z.enum(['true', 'false']).optional() });
export const poListQuerySchema = listQuerySchema.extend({ status: z.enum(PO_STATUSES).optional(), supplierId: optionalId });
export const openLinesQuerySchema = z.object({ q: z.string().trim().max(100).optional() });

export type SupplierView = {
  id: number;
  name: string;
  contactEmail: string;
  qualityContactEmail: string | null;
  owner: { id: number; name: string } | null;
  notes: string;
  active: boolean;
  openOrders: number;
};

export type PartView = {
  id: number;
  number: string;
  description: string;
  spec: PartSpec;
  active: boolean;
  onHand: number;
};

/** A PO line's piece outcomes, and the pieces received on it to replace pieces an NCR returned. */
export type PoLineQuantities = PieceQuantities & { replaced: number };

export type PoLineView = PoLineQuantities & {
  id: number;
  lineNumber: number;
  part: { id: number; number: string; description: string };
  quantity: number;
  unitPrice: number;
  inspectionLevel: (typeof INSPECTION_LEVELS)[number];
  aql: number;
  hundredPercent: boolean;
  dueOn: string | null;
  spec: PartSpec;
  received: number;
  outstanding: number;
};

export type PurchaseOrderView = {
  id: number;
  number: string;
  supplier: { id: number; name: string };
  buyer: { id: number; name: string } | null;
  orderedOn: string;
  currency: string;
  status: PoStatus;
  notes: string;
  lines: PoLineView[];
};

export type PurchaseOrderRow = PieceQuantities & {
  id: number;
  number: string;
  supplierName: string;
  orderedOn: string;
  status: PoStatus;
  currency: string;
  lineCount: number;
  ordered: number;
  received: number;
  value: number;
};

/** An open PO line the clerk can receive against. */
export type OpenLineView = {
  id: number;
  poNumber: string;
  lineNumber: number;
  supplierName: string;
  partNumber: string;
  partDescription: string;
  quantity: number;
  received: number;
  outstanding: number;
};
