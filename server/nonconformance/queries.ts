// What the NCR and return screens read: the lists (with their CSV) and one NCR or return in full.
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { ncrOpenItems } from '../../shared/nonconformance/progress';
import type {
  NcrDecision,
  NcrDispositionView,
  NcrListQuery,
  NcrOrigin,
  NcrRow,
  NcrStatus,
  NcrView,
  Remedy,
  ReplacementView,
  ReturnListQuery,
  ReturnRow,
  ReturnView,
} from '../../shared/schemas/nonconformance';
import { lotName, type LocationKind, type PieceState } from '../../shared/schemas/stock';
import { notFound } from '../http/errors';
import { filterWhen, type ListDefinition } from '../http/list';
import { ncrPieceStates } from './ncrs';
import { replacementOwedSql } from './returns';

const iso = (value: unknown) => (value ? (value as Date).toISOString() : null);

const PIECES = '(SELECT count(*) FROM nonconformance_pieces np WHERE np.nonconformance_id = n.id)';
const AWAITING = '(SELECT count(*) FROM nonconformance_pieces np WHERE np.nonconformance_id = n.id AND np.disposition_id IS NULL)';

export const ncrList: ListDefinition<NcrRow, NcrListQuery> = {
  select: `n.id, n.number, n.status, n.origin, n.supplier_id AS "supplierId", s.name AS "supplierName", n.part_id AS "partId", p.number AS "partNumber",
    n.lot_id AS "lotId", ${PIECES} AS pieces, ${AWAITING} AS awaiting, ${replacementOwedSql('n.id')} AS "replacementOwed", u.name AS owner, n.opened_at AS "openedAt", n.closed_at AS "closedAt",
    (SELECT coalesce(array_agg(c.code ORDER BY c.id), '{}') FROM nonconformance_defects d JOIN defect_codes c ON c.id = d.defect_code_id WHERE d.nonconformance_id = n.id) AS defects`,
  from: `nonconformances n JOIN suppliers s ON s.id = n.supplier_id JOIN parts p ON p.id = n.part_id LEFT JOIN users u ON u.id = n.owner_id`,
  sortable: {
    number: 'n.number',
    status: 'n.status',
    supplierName: 's.name',
    partNumber: 'p.number',
    openedAt: 'n.opened_at',
    pieces: PIECES,
    awaiting: AWAITING,
  },
  defaultSort: '-openedAt',
  tieBreaker: 'n.id',
  // An NCR is also found by the serial of any of its pieces, or by its lot as shown (L-12).
  search: [
    'n.number',
    's.name',
    'p.number',
    "'L-' || n.lot_id",
    'n.description',
    'EXISTS (SELECT 1 FROM nonconformance_pieces np JOIN pieces pc ON pc.id = np.piece_id WHERE np.nonconformance_id = n.id AND pc.serial ILIKE :q)',
  ],
  totals: { pieces: 'sum(pieces)', awaiting: 'sum(awaiting)' },
  filters: (query) => {
    const filters = filterWhen({ clauses: [], replacements: {} }, query.status, 'n.status = :status', 'status');
    filterWhen(filters, query.origin, 'n.origin = :origin', 'origin');
    filterWhen(filters, query.supplierId, 'n.supplier_id = :supplierId', 'supplierId');
    filterWhen(filters, query.partId, 'n.part_id = :partId', 'partId');
    filterWhen(filters, query.lotId, 'n.lot_id = :lotId', 'lotId');
    if (query.awaitingReplacement) filters.clauses.push(`${replacementOwedSql('n.id')} > 0`);
    return filters;
  },
  present: (r) => ({
    id: Number(r.id),
    number: String(r.number),
    status: r.status as NcrStatus,
    origin: r.origin as NcrOrigin,
    supplierId: Number(r.supplierId),
    supplierName: String(r.supplierName),
    partId: Number(r.partId),
    partNumber: String(r.partNumber),
    lotId: r.lotId === null ? null : Number(r.lotId),
    pieces: Number(r.pieces),
    awaiting: Number(r.awaiting),
    replacementOwed: Number(r.replacementOwed),
    defects: r.defects as string[],
    owner: (r.owner as string | null) ?? null,
    openedAt: iso(r.openedAt)!,
    closedAt: iso(r.closedAt),
  }),
  csv: {
    filename: 'nonconformances',
    columns: [
      { header: 'ncr', value: (r) => r.number },
      { header: 'status', value: (r) => r.status },
      { header: 'origin', value: (r) => r.origin },
      { header: 'supplier', value: (r) => r.supplierName },
      { header: 'part_number', value: (r) => r.partNumber },
      { header: 'lot', value: (r) => (r.lotId ? lotName(r.lotId) : '') },
      { header: 'pieces', value: (r) => r.pieces },
      { header: 'awaiting_disposition', value: (r) => r.awaiting },
      { header: 'defect_codes', value: (r) => r.defects.join(' ') },
      { header: 'owner', value: (r) => r.owner ?? '' },
      { header: 'opened_at', value: (r) => r.openedAt },
      { header: 'closed_at', value: (r) => r.closedAt ?? '' },
    ],
  },
};

const RETURN_SELECT = `v.id, v.nonconformance_id AS "nonconformanceId", n.number AS "ncrNumber", s.name AS "supplierName", v.rma_number AS "rmaNumber",
  v.ship_date AS "shipDate", v.carrier, v.tracking, v.remedy, v.credit_amount AS "creditAmount", v.note, v.created_at AS "createdAt", u.name AS "createdBy",
  (SELECT po.currency FROM lots l JOIN purchase_order_lines pol ON pol.id = l.po_line_id JOIN purchase_orders po ON po.id = pol.purchase_order_id WHERE l.id = n.lot_id) AS currency`;
const RETURN_FROM =
  'vendor_returns v JOIN nonconformances n ON n.id = v.nonconformance_id JOIN suppliers s ON s.id = n.supplier_id JOIN users u ON u.id = v.created_by';
const RETURNED = '(SELECT count(*) FROM nonconformance_pieces np WHERE np.return_id = v.id)';
// Replacements are received against the NCR, not one return: each replacement return is credited with them.
const REPLACED = `(CASE WHEN v.remedy = 'replacement' THEN (SELECT count(*) FROM pieces rp JOIN lots rl ON rl.id = rp.lot_id JOIN shipments rs ON rs.id = rl.shipment_id WHERE rs.replacement_for_ncr_id = v.nonconformance_id) ELSE 0 END)`;

function presentReturnBase(r: Record<string, unknown>) {
  return {
    id: Number(r.id),
    nonconformanceId: Number(r.nonconformanceId),
    ncrNumber: String(r.ncrNumber),
    supplierName: String(r.supplierName),
    rmaNumber: String(r.rmaNumber),
    shipDate: String(r.shipDate),
    carrier: String(r.carrier),
    tracking: String(r.tracking),
    remedy: r.remedy as Remedy,
    creditAmount: r.creditAmount === null ? null : Number(r.creditAmount),
    currency: (r.currency as string | null) ?? null,
    createdAt: iso(r.createdAt)!,
  };
}

export const returnList: ListDefinition<ReturnRow, ReturnListQuery> = {
  select: `${RETURN_SELECT}, ${RETURNED} AS pieces, ${REPLACED} AS replaced`,
  from: RETURN_FROM,
  sortable: { rmaNumber: 'v.rma_number', ncrNumber: 'n.number', supplierName: 's.name', shipDate: 'v.ship_date', remedy: 'v.remedy', pieces: RETURNED },
  defaultSort: '-shipDate',
  tieBreaker: 'v.id',
  search: ['v.rma_number', 'n.number', 's.name', 'v.carrier', 'v.tracking'],
  totals: { pieces: 'sum(pieces)', replaced: 'sum(replaced)' },
  filters: (query) => {
    const filters = filterWhen({ clauses: [], replacements: {} }, query.supplierId, 'n.supplier_id = :supplierId', 'supplierId');
    filterWhen(filters, query.nonconformanceId, 'v.nonconformance_id = :nonconformanceId', 'nonconformanceId');
    return filterWhen(filters, query.remedy, 'v.remedy = :remedy', 'remedy');
  },
  present: (r) => ({ ...presentReturnBase(r), pieces: Number(r.pieces), replaced: Number(r.replaced) }),
  csv: {
    filename: 'returns-to-vendor',
    columns: [
      { header: 'rma', value: (r) => r.rmaNumber },
      { header: 'ncr', value: (r) => r.ncrNumber },
      { header: 'supplier', value: (r) => r.supplierName },
      { header: 'ship_date', value: (r) => r.shipDate },
      { header: 'carrier', value: (r) => r.carrier },
      { header: 'tracking', value: (r) => r.tracking },
      { header: 'remedy', value: (r) => r.remedy },
      { header: 'credit_amount', value: (r) => (r.creditAmount === null ? '' : r.creditAmount.toFixed(2)) },
      { header: 'currency', value: (r) => r.currency ?? '' },
      { header: 'pieces', value: (r) => r.pieces },
      { header: 'replaced', value: (r) => r.replaced },
    ],
  },
};

async function returnsWhere(where: string, replacements: Record<string, unknown>): Promise<ReturnView[]> {
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT ${RETURN_SELECT}, (SELECT coalesce(array_agg(pc.serial ORDER BY pc.serial), '{}') FROM nonconformance_pieces np JOIN pieces pc ON pc.id = np.piece_id WHERE np.return_id = v.id) AS serials
       FROM ${RETURN_FROM} WHERE ${where} ORDER BY v.ship_date, v.id`,
    { type: QueryTypes.SELECT, replacements },
  );
  return rows.map((r) => ({ ...presentReturnBase(r), note: String(r.note), createdBy: String(r.createdBy), serials: r.serials as string[] }));
}

export async function returnView(id: number): Promise<ReturnView> {
  const [found] = await returnsWhere('v.id = :id', { id });
  if (!found) throw notFound('Return');
  return found;
}

export async function ncrView(id: number): Promise<NcrView> {
  const [row] = await sequelize.query<Record<string, unknown>>(
    `SELECT n.*, s.name AS supplier_name, p.number AS part_number, p.description AS part_description, l.supplier_lot, po.id AS po_id, po.number AS po_number,
            d.decision AS lot_decision, d.signed_at AS lot_decided_at, o.name AS owner_name, ob.name AS opened_by_name, cb.name AS closed_by_name
       FROM nonconformances n
       JOIN suppliers s ON s.id = n.supplier_id
       JOIN parts p ON p.id = n.part_id
       LEFT JOIN lots l ON l.id = n.lot_id
       LEFT JOIN purchase_order_lines pol ON pol.id = l.po_line_id
       LEFT JOIN purchase_orders po ON po.id = pol.purchase_order_id
       LEFT JOIN dispositions d ON d.id = n.lot_disposition_id
       LEFT JOIN users o ON o.id = n.owner_id
       LEFT JOIN users ob ON ob.id = n.opened_by
       LEFT JOIN users cb ON cb.id = n.closed_by
      WHERE n.id = :id`,
    { type: QueryTypes.SELECT, replacements: { id } },
  );
  if (!row) throw notFound('NCR');
  const [defects, pieces, reasons, dispositions, returns, replacements] = await Promise.all([
    sequelize.query<{ id: number; code: string; label: string }>(
      'SELECT c.id, c.code, c.label FROM nonconformance_defects d JOIN defect_codes c ON c.id = d.defect_code_id WHERE d.nonconformance_id = :id ORDER BY c.id',
      { type: QueryTypes.SELECT, replacements: { id } },
    ),
    ncrPieceStates(id),
    sequelize.query<{ pieceId: number; reasons: string[]; locationCode: string | null; returnId: number | null; rmaNumber: string | null }>(
      `SELECT np.piece_id AS "pieceId", np.reasons, loc.code AS "locationCode", np.return_id AS "returnId", v.rma_number AS "rmaNumber"
         FROM nonconformance_pieces np LEFT JOIN piece_locations pl ON pl.piece_id = np.piece_id LEFT JOIN locations loc ON loc.id = pl.location_id
         LEFT JOIN vendor_returns v ON v.id = np.return_id
        WHERE np.nonconformance_id = :id`,
      { type: QueryTypes.SELECT, replacements: { id } },
    ),
    sequelize.query<Record<string, unknown>>(
      `SELECT d.id, d.decision, d.meaning, d.deviation_number AS "deviationNumber", d.justification, d.note, u.name AS signer, d.signed_at AS "signedAt",
              (SELECT du.deviation_id FROM deviation_uses du WHERE du.ncr_disposition_id = d.id LIMIT 1) AS "deviationId",
              (SELECT coalesce(array_agg(pc.serial ORDER BY pc.serial), '{}') FROM ncr_disposition_pieces dp JOIN pieces pc ON pc.id = dp.piece_id WHERE dp.disposition_id = d.id) AS serials
         FROM ncr_dispositions d JOIN users u ON u.id = d.signer_id WHERE d.nonconformance_id = :id ORDER BY d.signed_at, d.id`,
      { type: QueryTypes.SELECT, replacements: { id } },
    ),
    returnsWhere('v.nonconformance_id = :id', { id }),
    replacementsOf(id),
  ]);
  const extra = new Map(reasons.map((r) => [r.pieceId, r]));
  return {
    id,
    number: String(row.number),
    status: row.status as NcrStatus,
    origin: row.origin as NcrOrigin,
    supplier: { id: Number(row.supplier_id), name: String(row.supplier_name) },
    part: { id: Number(row.part_id), number: String(row.part_number), description: String(row.part_description) },
    lot:
      row.lot_id === null ? null : { id: Number(row.lot_id), supplierLot: String(row.supplier_lot), poId: Number(row.po_id), poNumber: String(row.po_number) },
    lotDecision:
      row.lot_disposition_id === null ? null : { id: Number(row.lot_disposition_id), decision: String(row.lot_decision), signedAt: iso(row.lot_decided_at)! },
    description: String(row.description),
    containment: String(row.containment),
    owner: row.owner_id === null ? null : { id: Number(row.owner_id), name: String(row.owner_name) },
    openedBy: (row.opened_by_name as string | null) ?? null,
    openedAt: iso(row.opened_at)!,
    closedBy: (row.closed_by_name as string | null) ?? null,
    closedAt: iso(row.closed_at),
    closingNote: (row.closing_note as string | null) ?? null,
    defects,
    pieces: pieces.map((p) => {
      const more = extra.get(p.pieceId)!;
      return {
        pieceId: p.pieceId,
        serial: p.serial,
        state: p.state as PieceState,
        location: more.locationCode ? { code: more.locationCode, kind: p.locationKind as LocationKind } : null,
        lotId: p.lotId,
        reasons: more.reasons,
        disposition: p.dispositionId === null ? null : { id: p.dispositionId, decision: p.decision as NcrDecision },
        reworkReleased: p.reworkReleased,
        returnId: more.returnId,
        rmaNumber: more.rmaNumber,
      };
    }),
    dispositions: dispositions.map((d): NcrDispositionView => ({
      id: Number(d.id),
      decision: d.decision as NcrDispositionView['decision'],
      meaning: String(d.meaning),
      deviation: d.deviationNumber ? { id: d.deviationId === null ? null : Number(d.deviationId), number: String(d.deviationNumber) } : null,
      justification: (d.justification as string | null) ?? null,
      note: (d.note as string | null) ?? null,
      signer: String(d.signer),
      signedAt: iso(d.signedAt)!,
      serials: d.serials as string[],
    })),
    returns,
    replacements,
    openItems: row.status === 'closed' ? [] : ncrOpenItems(pieces),
  };
}

async function replacementsOf(ncrId: number): Promise<ReplacementView[]> {
  const rows = await sequelize.query<Record<string, unknown>>(
    `SELECT sh.id AS "shipmentId", sh.packing_slip AS "packingSlip", po.number AS "poNumber", sh.received_at AS "receivedAt",
            (SELECT coalesce(jsonb_agg(jsonb_build_object('id', l.id, 'quantity', l.quantity) ORDER BY l.id), '[]') FROM lots l WHERE l.shipment_id = sh.id) AS lots
       FROM shipments sh JOIN purchase_orders po ON po.id = sh.purchase_order_id
      WHERE sh.replacement_for_ncr_id = :ncrId ORDER BY sh.received_at, sh.id`,
    { type: QueryTypes.SELECT, replacements: { ncrId } },
  );
  return rows.map((r) => ({
    shipmentId: Number(r.shipmentId),
    packingSlip: String(r.packingSlip),
    poNumber: String(r.poNumber),
    receivedAt: iso(r.receivedAt)!,
    lots: r.lots as { id: number; quantity: number }[],
  }));
}
