// Helpers for receiving and stock tests: an ordered PO line made through the buyer's API, and a
// receipt against it through the clerk's.
import { faker } from '@faker-js/faker';
import { expect } from 'vitest';
import type { PartSpecInput } from '../../shared/schemas/spec';
import { as } from './api';
import { QUARTER_WAVE_633 } from './receivedLot';

/** The smallest content a PDF reader (and the type sniffer) recognises. */
export const TINY_PDF = Buffer.from('%PDF-1.4\n1 0 obj<</Type/Catalog>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n');

export const uniqueTag = () => faker.string.alphanumeric(8).toUpperCase();

/** A supplier, a part and an open PO with one line of `quantity`, created by the demo buyer. */
export async function orderedLine(quantity: number, spec: PartSpecInput = QUARTER_WAVE_633) {
  const buyer = await as('buyer');
  const tag = uniqueTag();
  const supplier = await buyer
    .post('/api/suppliers')
    .send({ name: `Test supplier ${tag}`, contactEmail: `orders-${tag.toLowerCase()}@example.test` })
    .expect(201);
  const part = await buyer
    .post('/api/parts')
    .send({ number: `T-${tag}`, description: 'Test quarter-wave plate', spec })
    .expect(201);
  const order = await buyer
    .post('/api/purchase-orders')
    .send({
      number: `PO-${tag}`,
      supplierId: supplier.body.id,
      orderedOn: '2026-11-02',
      currency: 'EUR',
      lines: [{ partId: part.body.id, quantity, unitPrice: 90, inspectionLevel: 'II', aql: 1 }],
    })
    .expect(201);
  return { tag, supplierId: supplier.body.id as number, partId: part.body.id as number, order: order.body, lineId: order.body.lines[0].id as number };
}

type ReceiptFields = {
  quantity: number;
  serials?: string;
  supplierLot?: string;
  overReceiptReason?: string;
  packingSlipNumber?: string;
  replacementForNcrId?: number;
};

/** Posts a receipt as the demo clerk; files are [field, content, name]. */
export async function postReceipt(lineId: number, fields: ReceiptFields, files: [string, Buffer, string][] = [['packingSlip', TINY_PDF, 'slip.pdf']]) {
  const clerk = await as('clerk');
  let request = clerk
    .post('/api/shipments')
    .field('poLineId', String(lineId))
    .field('packingSlipNumber', fields.packingSlipNumber ?? `PS-${uniqueTag()}`)
    .field('carrier', 'Test carrier')
    .field('supplierLot', fields.supplierLot ?? `SL-${uniqueTag()}`)
    .field('quantity', String(fields.quantity));
  if (fields.serials !== undefined) request = request.field('serials', fields.serials);
  if (fields.overReceiptReason) request = request.field('overReceiptReason', fields.overReceiptReason);
  if (fields.replacementForNcrId) request = request.field('replacementForNcrId', String(fields.replacementForNcrId));
  for (const [field, content, name] of files) request = request.attach(field, content, name);
  return request;
}

/** Posts a receipt that must succeed, and answers its body. */
export async function receiveOk(lineId: number, fields: ReceiptFields, files?: [string, Buffer, string][]) {
  const response = await postReceipt(lineId, fields, files);
  expect(response.status, JSON.stringify(response.body)).toBe(201);
  return response.body as { lotId: number; shipmentId: number; quantity: number; state: string; attachments: { id: number; kind: string }[] };
}

/** Receives `count` serials `prefix0001…` against a fresh line and returns the lot. */
export async function receiveThroughApi(count: number, prefix = `${uniqueTag()}-`) {
  const line = await orderedLine(count);
  const { lotId } = await receiveOk(line.lineId, { quantity: count, serials: `${prefix}0001..${prefix}${String(count).padStart(4, '0')}` });
  const serials = Array.from({ length: count }, (_, i) => `${prefix}${String(i + 1).padStart(4, '0')}`);
  return { ...line, lotId, serials };
}
