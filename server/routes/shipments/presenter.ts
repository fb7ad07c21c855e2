import type { z } from 'zod';
import type { ShipmentRow, shipmentListQuerySchema } from '../../../shared/schemas/receiving';
import { lotName } from '../../../shared/schemas/stock';
import { filterWhen, type ListDefinition } from '../../http/list';

export const shipmentList: ListDefinition<ShipmentRow & { lotIds: number[] }, z.infer<typeof shipmentListQuerySchema>> = {
  select: `sh.id, sh.received_at AS "receivedAt", po.number AS "poNumber", s.name AS "supplierName", sh.packing_slip AS "packingSlip",
    sh.carrier, u.name AS "receivedBy", t.lots, t.pieces, t.lot_ids AS "lotIds"`,
  from: `shipments sh
    JOIN purchase_orders po ON po.id = sh.purchase_order_id
    JOIN suppliers s ON s.id = po.supplier_id
    LEFT JOIN users u ON u.id = sh.received_by
    CROSS JOIN LATERAL (SELECT count(*) AS lots, coalesce(sum(l.quantity), 0) AS pieces, array_agg(l.id ORDER BY l.id) AS lot_ids
      FROM lots l WHERE l.shipment_id = sh.id) AS t`,
  sortable: { receivedAt: 'sh.received_at', poNumber: 'po.number', supplierName: 's.name', packingSlip: 'sh.packing_slip', carrier: 'sh.carrier', pieces: 't.pieces' },
  defaultSort: '-receivedAt',
  tieBreaker: 'sh.id',
  search: ['po.number', 's.name', 'sh.packing_slip', 'sh.carrier', 'u.name'],
  totals: { pieces: 'sum(pieces)' },
  filters: (query) => filterWhen({ clauses: [], replacements: {} }, query.purchaseOrderId, 'sh.purchase_order_id = :purchaseOrderId', 'purchaseOrderId'),
  present: (r) => ({
    id: Number(r.id),
    receivedAt: (r.receivedAt as Date).toISOString(),
    poNumber: String(r.poNumber),
    supplierName: String(r.supplierName),
    packingSlip: String(r.packingSlip),
    carrier: String(r.carrier),
    receivedBy: (r.receivedBy as string | null) ?? null,
    lots: Number(r.lots),
    pieces: Number(r.pieces),
    lotIds: ((r.lotIds as number[] | null) ?? []).filter((id) => id !== null).map(Number),
  }),
  csv: {
    filename: 'shipments',
    columns: [
      { header: 'received_at', value: (r) => r.receivedAt },
      { header: 'po_number', value: (r) => r.poNumber },
      { header: 'supplier', value: (r) => r.supplierName },
      { header: 'packing_slip', value: (r) => r.packingSlip },
      { header: 'carrier', value: (r) => r.carrier },
      { header: 'received_by', value: (r) => r.receivedBy },
      { header: 'lots', value: (r) => r.lotIds.map(lotName).join(' ') },
      { header: 'pieces', value: (r) => r.pieces },
    ],
  },
};
