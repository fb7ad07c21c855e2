// The receiving lists (shipments, lots): their SQL, the row each shows and their CSV.
import type { z } from 'zod';
import type { LotRow, ShipmentRow, shipmentListQuerySchema } from '../../shared/schemas/receiving';
import { lotName, type LotListQuery, type LotState } from '../../shared/schemas/stock';
import { filterWhen, type ListDefinition } from '../http/list';
import { pieceQuantities, pieceQuantitiesSql } from '../stock/standing';
import { AWAITING_RESUMPTION } from './lots';

export const shipmentList: ListDefinition<ShipmentRow & { lotIds: number[] }, z.infer<typeof shipmentListQuerySchema>> = {
  select: `sh.id, sh.received_at AS "receivedAt", po.number AS "poNumber", s.name AS "supplierName", sh.packing_slip AS "packingSlip",
    sh.carrier, u.name AS "receivedBy"`,
  from: `shipments sh
    JOIN purchase_orders po ON po.id = sh.purchase_order_id
    JOIN suppliers s ON s.id = po.supplier_id
    LEFT JOIN users u ON u.id = sh.received_by`,
  // The shipment's lots, gathered for the shipments a page shows.
  late: {
    select: 't.lots, t.pieces, t.lot_ids AS "lotIds"',
    from: `CROSS JOIN LATERAL (SELECT count(*) AS lots, coalesce(sum(l.quantity), 0) AS pieces, array_agg(l.id ORDER BY l.id) AS lot_ids
      FROM lots l WHERE l.shipment_id = page.id) AS t`,
    sortable: { pieces: 't.pieces' },
  },
  sortable: { receivedAt: 'sh.received_at', poNumber: 'po.number', supplierName: 's.name', packingSlip: 'sh.packing_slip', carrier: 'sh.carrier' },
  notNull: ['receivedAt'],
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

export const lotList: ListDefinition<LotRow, LotListQuery> = {
  select: `l.id, l.supplier_lot AS "supplierLot", l.state, l.quantity, p.number AS "partNumber", p.description AS "partDescription",
    s.name AS "supplierName", po.number AS "poNumber", pol.line_number AS "lineNumber", l.received_at AS "receivedAt",
    ${AWAITING_RESUMPTION} AS "acceptanceDiscontinued"`,
  // The lot keeps a copy of its shipment's receipt time, so the shipment is not joined: each table
  // joined here multiplies the join orders PostgreSQL weighs while planning every page.
  from: `lots l
    JOIN purchase_order_lines pol ON pol.id = l.po_line_id
    JOIN purchase_orders po ON po.id = pol.purchase_order_id
    JOIN suppliers s ON s.id = po.supplier_id
    JOIN parts p ON p.id = l.part_id`,
  // What became of the lot's pieces: counted for the lots a page shows.
  late: {
    select: 'q.accepted, q.nonconforming, q.returned',
    from: `CROSS JOIN LATERAL ${pieceQuantitiesSql('pc.lot_id = page.id')} AS q`,
    sortable: { accepted: 'q.accepted', nonconforming: 'q.nonconforming', returned: 'q.returned' },
  },
  sortable: {
    id: 'l.id',
    supplierLot: 'l.supplier_lot',
    state: 'l.state',
    quantity: 'l.quantity',
    partNumber: 'p.number',
    supplierName: 's.name',
    poNumber: 'po.number',
    // The lot's copy of its shipment's receipt time, which an index of the lots keeps in order.
    receivedAt: 'l.received_at',
  },
  notNull: ['id', 'receivedAt'],
  defaultSort: '-receivedAt',
  tieBreaker: 'l.id',
  // A lot is also found by any of its serials, or by its number as shown (L-12).
  search: [
    'l.supplier_lot',
    'p.number',
    's.name',
    'po.number',
    "'L-' || l.id",
    'EXISTS (SELECT 1 FROM shipments sh WHERE sh.id = l.shipment_id AND sh.packing_slip ILIKE :q)',
    'EXISTS (SELECT 1 FROM pieces pc WHERE pc.lot_id = l.id AND pc.serial ILIKE :q)',
  ],
  totals: { quantity: 'sum(quantity)', accepted: 'sum(accepted)', nonconforming: 'sum(nonconforming)', returned: 'sum(returned)' },
  filters: (query) => {
    const filters = filterWhen({ clauses: [], replacements: {} }, query.state, 'l.state = :state', 'state');
    filterWhen(filters, query.partId, 'l.part_id = :partId', 'partId');
    filterWhen(filters, query.supplierId, 'po.supplier_id = :supplierId', 'supplierId');
    return filterWhen(filters, query.purchaseOrderId, 'po.id = :purchaseOrderId', 'purchaseOrderId');
  },
  present: (r) => ({
    id: Number(r.id),
    supplierLot: String(r.supplierLot),
    state: r.state as LotState,
    quantity: Number(r.quantity),
    partNumber: String(r.partNumber),
    partDescription: String(r.partDescription),
    supplierName: String(r.supplierName),
    poNumber: String(r.poNumber),
    lineNumber: Number(r.lineNumber),
    receivedAt: (r.receivedAt as Date).toISOString(),
    acceptanceDiscontinued: Boolean(r.acceptanceDiscontinued),
    ...pieceQuantities(r),
  }),
  csv: {
    filename: 'lots',
    columns: [
      { header: 'lot', value: (r) => lotName(r.id) },
      { header: 'supplier_lot', value: (r) => r.supplierLot },
      { header: 'state', value: (r) => r.state },
      { header: 'quantity', value: (r) => r.quantity },
      { header: 'part_number', value: (r) => r.partNumber },
      { header: 'supplier', value: (r) => r.supplierName },
      { header: 'po_number', value: (r) => r.poNumber },
      { header: 'po_line', value: (r) => r.lineNumber },
      { header: 'received_at', value: (r) => r.receivedAt },
      { header: 'acceptance_discontinued', value: (r) => (r.acceptanceDiscontinued ? 'yes' : 'no') },
      { header: 'accepted', value: (r) => r.accepted },
      { header: 'nonconforming', value: (r) => r.nonconforming },
      { header: 'returned', value: (r) => r.returned },
    ],
  },
};
