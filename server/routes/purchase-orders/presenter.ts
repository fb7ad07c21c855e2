import type { OpenLineView, PoLineQuantities, PurchaseOrderView } from '../../../shared/schemas/purchasing';
import type { PurchaseOrderRecord } from '../../purchasing/purchaseOrders';

const NONE: PoLineQuantities = { accepted: 0, nonconforming: 0, returned: 0, replaced: 0 };

export function presentPurchaseOrder({ order, received, outcomes }: PurchaseOrderRecord): PurchaseOrderView {
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
        dueOn: line.dueOn,
        spec: line.spec,
        received: got,
        outstanding: Math.max(0, line.quantity - got),
        ...(outcomes.get(line.id) ?? NONE),
      };
    }),
  };
}

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
