import { QueryTypes } from 'sequelize';
import { sequelize } from '../../../db';
import { Attachment, Lot, Part, PurchaseOrder, PurchaseOrderLine, Shipment, Supplier, User } from '../../../db/models';
import type { AttachmentView, HistoryEntry, LotRow, LotView } from '../../../shared/schemas/receiving';
import { MOVE_REASON_LABELS, lotName, type LotListQuery, type LotState, type MoveReason, type PieceState } from '../../../shared/schemas/stock';
import { notFound } from '../../http/errors';
import { filterWhen, type ListDefinition } from '../../http/list';
import { describePlan, inspectionPlanOf } from '../../inspection/sampling';
import { pieceQuantities, pieceQuantitiesSql } from '../../stock/standing';

/** A lot in quarantine without a plan was received while acceptance was discontinued. */
const AWAITING_RESUMPTION = `(l.state = 'quarantine' AND NOT EXISTS (SELECT 1 FROM lot_inspections li WHERE li.lot_id = l.id))`;

export const lotList: ListDefinition<LotRow, LotListQuery> = {
  select: `l.id, l.supplier_lot AS "supplierLot", l.state, l.quantity, p.number AS "partNumber", p.description AS "partDescription",
    s.name AS "supplierName", po.number AS "poNumber", pol.line_number AS "lineNumber", sh.received_at AS "receivedAt",
    ${AWAITING_RESUMPTION} AS "acceptanceDiscontinued", q.accepted, q.nonconforming, q.returned`,
  from: `lots l
    JOIN shipments sh ON sh.id = l.shipment_id
    JOIN purchase_order_lines pol ON pol.id = l.po_line_id
    JOIN purchase_orders po ON po.id = pol.purchase_order_id
    JOIN suppliers s ON s.id = po.supplier_id
    JOIN parts p ON p.id = l.part_id
    CROSS JOIN LATERAL ${pieceQuantitiesSql('pc.lot_id = l.id')} AS q`,
  sortable: {
    id: 'l.id',
    supplierLot: 'l.supplier_lot',
    state: 'l.state',
    quantity: 'l.quantity',
    partNumber: 'p.number',
    supplierName: 's.name',
    poNumber: 'po.number',
    receivedAt: 'sh.received_at',
    accepted: 'q.accepted',
    nonconforming: 'q.nonconforming',
    returned: 'q.returned',
  },
  defaultSort: '-receivedAt',
  tieBreaker: 'l.id',
  // A lot is also found by any of its serials, or by its number as shown (L-12).
  search: ['l.supplier_lot', 'p.number', 's.name', 'po.number', "'L-' || l.id", 'sh.packing_slip', 'EXISTS (SELECT 1 FROM pieces pc WHERE pc.lot_id = l.id AND pc.serial ILIKE :q)'],
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

export const presentAttachment = (a: Attachment): AttachmentView => ({
  id: a.id,
  kind: a.kind,
  name: a.originalName,
  mediaType: a.mediaType,
  sizeBytes: a.sizeBytes,
  sha256: a.sha256,
  uploadedAt: a.uploadedAt.toISOString(),
});

/** Audit entries about a lot (its receipt aside, which the shipment tells), as history lines. */
export async function lotAuditHistory(lotIds: number[]): Promise<HistoryEntry[]> {
  const rows = await sequelize.query<{ occurred_at: Date; action: string; actor_email: string | null; name: string | null }>(
    `SELECT a.occurred_at, a.action, a.actor_email, u.name FROM audit_events a LEFT JOIN users u ON u.id = a.actor_id
      WHERE a.entity_type = 'lot' AND a.entity_id IN (:ids) AND a.action <> 'lot.receive' ORDER BY a.id`,
    { type: QueryTypes.SELECT, replacements: { ids: lotIds.map(String) } },
  );
  return rows.map((r) => ({ at: r.occurred_at.toISOString(), what: humanAction(r.action), who: r.name ?? r.actor_email }));
}

const humanAction = (action: string) => {
  const words = action.replace(/^lot\./, '').replace(/[.-]/g, ' ');
  return words.charAt(0).toUpperCase() + words.slice(1);
};

/** The lot's moves, one line per batch of pieces moved together. */
async function moveHistory(lotId: number): Promise<HistoryEntry[]> {
  const rows = await sequelize.query<{ moved_at: Date; reason: MoveReason; from_code: string | null; to_code: string | null; work_order: string | null; who: string | null; pieces: string }>(
    `SELECT m.moved_at, m.reason, f.code AS from_code, t.code AS to_code, m.work_order, u.name AS who, count(*) AS pieces
       FROM stock_moves m
       JOIN pieces p ON p.id = m.piece_id
       LEFT JOIN locations f ON f.id = m.from_location_id
       LEFT JOIN locations t ON t.id = m.to_location_id
       LEFT JOIN users u ON u.id = m.actor_id
      WHERE p.lot_id = :lotId
      GROUP BY m.moved_at, m.reason, f.code, t.code, m.work_order, u.name
      ORDER BY m.moved_at`,
    { type: QueryTypes.SELECT, replacements: { lotId } },
  );
  return rows.map((r) => ({
    at: r.moved_at.toISOString(),
    what: MOVE_REASON_LABELS[r.reason],
    who: r.who,
    detail: `${r.pieces} piece${r.pieces === '1' ? '' : 's'}${r.from_code ? ` from ${r.from_code}` : ''}${r.to_code ? ` to ${r.to_code}` : ''}${r.work_order ? ` for work order ${r.work_order}` : ''}`,
  }));
}

export async function lotView(id: number): Promise<LotView> {
  const lot = await Lot.findByPk(id, {
    include: [
      { model: Shipment, as: 'shipment', include: [{ model: User, as: 'receiver' }] },
      { model: PurchaseOrderLine, as: 'line', include: [{ model: PurchaseOrder, as: 'purchaseOrder', include: [{ model: Supplier, as: 'supplier' }] }] },
      { model: Part, as: 'part' },
    ],
  });
  if (!lot) throw notFound('Lot');
  const shipment = lot.shipment!;
  const line = lot.line!;
  const order = line.purchaseOrder!;
  const pieces = await sequelize.query<{ id: number; serial: string; state: PieceState; location: string | null }>(
    `SELECT p.id, p.serial, p.state, loc.code AS location FROM pieces p
       LEFT JOIN piece_locations pl ON pl.piece_id = p.id LEFT JOIN locations loc ON loc.id = pl.location_id
      WHERE p.lot_id = :id ORDER BY p.serial`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  const pieceStates: Partial<Record<PieceState, number>> = {};
  for (const piece of pieces) pieceStates[piece.state] = (pieceStates[piece.state] ?? 0) + 1;
  const attachments = await Attachment.findAll({ where: { lotId: id }, order: [['id', 'ASC']] });
  const inspection = await inspectionPlanOf(id);
  const [quantities] = await sequelize.query<Record<string, unknown>>(`SELECT * FROM ${pieceQuantitiesSql('pc.lot_id = :id')} AS q`, { type: QueryTypes.SELECT, replacements: { id } });
  const [{ waiting }] = await sequelize.query<{ waiting: boolean }>(`SELECT ${AWAITING_RESUMPTION} AS waiting FROM lots l WHERE l.id = :id`, { type: QueryTypes.SELECT, replacements: { id } });
  const receivedBy = shipment.receiver?.name ?? null;
  const history = [
    {
      at: shipment.receivedAt.toISOString(),
      what: 'Received into quarantine',
      who: receivedBy,
      detail: `${lot.quantity} pieces on packing slip ${shipment.packingSlip}${shipment.carrier ? `, carrier ${shipment.carrier}` : ''}${lot.overReceiptReason ? `; more than the line expected: ${lot.overReceiptReason}` : ''}`,
    },
    ...(await lotAuditHistory([id])),
    ...(await moveHistory(id)).filter((entry) => entry.what !== MOVE_REASON_LABELS.receipt),
  ].sort((a, b) => a.at.localeCompare(b.at));
  return {
    id: lot.id,
    supplierLot: lot.supplierLot,
    state: lot.state,
    quantity: lot.quantity,
    overReceiptReason: lot.overReceiptReason,
    acceptanceDiscontinued: waiting,
    ...pieceQuantities(quantities),
    shipment: { id: shipment.id, packingSlip: shipment.packingSlip, carrier: shipment.carrier, receivedAt: shipment.receivedAt.toISOString(), receivedBy },
    purchaseOrder: { id: order.id, number: order.number, supplier: { id: order.supplier!.id, name: order.supplier!.name } },
    line: { id: line.id, lineNumber: line.lineNumber, quantity: line.quantity, inspectionLevel: line.inspectionLevel, aql: line.aql, hundredPercent: line.hundredPercent, spec: line.spec },
    plan: inspection && {
      severity: inspection.severity, codeLetter: inspection.codeLetter, planLetter: inspection.planLetter, sampleSize: inspection.sampleSize,
      accept: inspection.acceptNumber, reject: inspection.rejectNumber, hundredPercent: inspection.hundredPercent, summary: describePlan(inspection),
    },
    part: { id: lot.part!.id, number: lot.part!.number, description: lot.part!.description },
    pieceStates,
    pieces,
    attachments: attachments.map(presentAttachment),
    history,
  };
}
