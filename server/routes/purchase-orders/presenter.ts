import type { z } from 'zod';
import type { PurchaseOrder } from '../../../db/models';
import type { OpenLineView, PoLineQuantities, PoStatus, PurchaseOrderRow, PurchaseOrderView, poListQuerySchema } from '../../../shared/schemas/purchasing';
import { filterWhen, type ListDefinition } from '../../http/list';
import { pieceQuantities, pieceQuantitiesSql } from '../../stock/standing';

const NONE: PoLineQuantities = { accepted: 0, nonconforming: 0, returned: 0, replaced: 0 };

export function presentPurchaseOrder(order: PurchaseOrder, received: Map<number, number>, outcomes: Map<number, PoLineQuantities>): PurchaseOrderView {
  return {
    id: order.id,
    number: order.number,
    supplier: { id: order.supplier!.id, name: order.supplier!.name },
    buyer: order.buyer ? { id: order.buyer.id, name: order.buyer.name } : null,
    orderedOn: order.orderedOn,
    currency: order.currency,
    status: order.status,
    notes: order.notes,
    lines: (order.lines ?? []).map((line) => {
      const got = received.get(line.id) ?? 0;
      return {
        id: line.id,
        lineNumber: line.lineNumber,
        part: { id: line.part!.id, number: line.part!.number, description: line.part!.description },
        quantity: line.quantity,
        unitPrice: line.unitPrice,
        inspectionLevel: line.inspectionLevel,
        aql: line.aql,
        hundredPercent: line.hundredPercent,
        spec: line.spec,
        received: got,
        outstanding: Math.max(0, line.quantity - got),
        ...(outcomes.get(line.id) ?? NONE),
      };
    }),
  };
}

const lineTotals = `(SELECT count(*) AS lines, sum(pol.quantity) AS ordered, sum(pol.quantity * pol.unit_price) AS value,
    (SELECT coalesce(sum(l.quantity), 0) FROM lots l JOIN purchase_order_lines x ON x.id = l.po_line_id WHERE x.purchase_order_id = po.id) AS received
  FROM purchase_order_lines pol WHERE pol.purchase_order_id = po.id)`;
const outcomes = pieceQuantitiesSql('ql.po_line_id IN (SELECT x.id FROM purchase_order_lines x WHERE x.purchase_order_id = po.id)');

export const purchaseOrderList: ListDefinition<PurchaseOrderRow, z.infer<typeof poListQuerySchema>> = {
  select: `po.id, po.number, s.name AS "supplierName", po.ordered_on AS "orderedOn", po.status, po.currency,
    t.lines AS "lineCount", t.ordered, t.received, t.value, q.accepted, q.nonconforming, q.returned`,
  from: `purchase_orders po JOIN suppliers s ON s.id = po.supplier_id CROSS JOIN LATERAL ${lineTotals} AS t CROSS JOIN LATERAL ${outcomes} AS q`,
  sortable: {
    number: 'po.number', supplierName: 's.name', orderedOn: 'po.ordered_on', status: 'po.status', ordered: 't.ordered', received: 't.received', value: 't.value',
    accepted: 'q.accepted', nonconforming: 'q.nonconforming', returned: 'q.returned',
  },
  defaultSort: '-orderedOn',
  tieBreaker: 'po.id',
  search: ['po.number', 's.name', 'po.notes'],
  totals: { ordered: 'sum(ordered)', received: 'sum(received)', accepted: 'sum(accepted)', nonconforming: 'sum(nonconforming)', returned: 'sum(returned)' },
  filters: (query) => {
    const filters = filterWhen({ clauses: [], replacements: {} }, query.status, 'po.status = :status', 'status');
    return filterWhen(filters, query.supplierId, 'po.supplier_id = :supplierId', 'supplierId');
  },
  present: (r) => ({
    id: Number(r.id),
    number: String(r.number),
    supplierName: String(r.supplierName),
    orderedOn: String(r.orderedOn),
    status: r.status as PoStatus,
    currency: String(r.currency),
    lineCount: Number(r.lineCount),
    ordered: Number(r.ordered ?? 0),
    received: Number(r.received ?? 0),
    value: Number(r.value ?? 0),
    ...pieceQuantities(r),
  }),
  csv: {
    filename: 'purchase-orders',
    columns: [
      { header: 'po_number', value: (r) => r.number },
      { header: 'supplier', value: (r) => r.supplierName },
      { header: 'ordered_on', value: (r) => r.orderedOn },
      { header: 'status', value: (r) => r.status },
      { header: 'lines', value: (r) => r.lineCount },
      { header: 'ordered', value: (r) => r.ordered },
      { header: 'received', value: (r) => r.received },
      { header: 'accepted', value: (r) => r.accepted },
      { header: 'nonconforming', value: (r) => r.nonconforming },
      { header: 'returned', value: (r) => r.returned },
      { header: 'value', value: (r) => r.value.toFixed(2) },
      { header: 'currency', value: (r) => r.currency },
    ],
  },
};

export type OpenLineRow = Record<string, unknown>;
export const presentOpenLine = (r: OpenLineRow): OpenLineView => ({
  id: Number(r.id),
  poNumber: String(r.poNumber),
  lineNumber: Number(r.lineNumber),
  supplierName: String(r.supplierName),
  partNumber: String(r.partNumber),
  partDescription: String(r.partDescription),
  quantity: Number(r.quantity),
  received: Number(r.received),
  outstanding: Math.max(0, Number(r.quantity) - Number(r.received)),
});
