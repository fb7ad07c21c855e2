// The stock lists: on-hand per part and location, and the moves of the ledger.
import { lotName, type LocationKind, type MoveListQuery, type MoveReason, type MoveView, type StockQuery, type StockRow } from '../../shared/schemas/stock';
import { filterWhen, type ListDefinition } from '../http/list';

/** On-hand: pieces where their latest move put them, per part and location, as the ledger counts them. */
export const stockList: ListDefinition<StockRow, StockQuery> = {
  select: `pt.id AS "partId", pt.number AS "partNumber", pt.description AS "partDescription",
    loc.id AS "locationId", loc.code AS "locationCode", loc.kind AS "locationKind", oh.pieces AS "onHand"`,
  from: `on_hand oh JOIN parts pt ON pt.id = oh.part_id JOIN locations loc ON loc.id = oh.location_id`,
  sortable: { partNumber: 'pt.number', locationCode: 'loc.code', locationKind: 'loc.kind', onHand: 'oh.pieces' },
  defaultSort: 'partNumber',
  tieBreaker: 'loc.code',
  search: ['pt.number', 'pt.description', 'loc.code', 'loc.name'],
  totals: { onHand: 'sum("onHand")' },
  filters: (query) => {
    const filters = filterWhen({ clauses: [], replacements: {} }, query.partId, 'pt.id = :partId', 'partId');
    filterWhen(filters, query.locationId, 'loc.id = :locationId', 'locationId');
    return filterWhen(filters, query.kind, 'loc.kind = :kind', 'kind');
  },
  present: (r) => ({
    partId: Number(r.partId),
    partNumber: String(r.partNumber),
    partDescription: String(r.partDescription),
    locationId: Number(r.locationId),
    locationCode: String(r.locationCode),
    locationKind: r.locationKind as LocationKind,
    onHand: Number(r.onHand),
  }),
  csv: {
    filename: 'stock-on-hand',
    columns: [
      { header: 'part_number', value: (r) => r.partNumber },
      { header: 'description', value: (r) => r.partDescription },
      { header: 'location', value: (r) => r.locationCode },
      { header: 'location_kind', value: (r) => r.locationKind },
      { header: 'on_hand', value: (r) => r.onHand },
    ],
  },
};

export const moveList: ListDefinition<MoveView, MoveListQuery> = {
  select: `m.id, m.moved_at AS "movedAt", p.serial, p.id AS "pieceId", p.lot_id AS "lotId", pt.number AS "partNumber",
    f.code AS "from", t.code AS "to", m.reason, m.work_order AS "workOrder", m.note, u.name AS actor`,
  from: `stock_moves m JOIN pieces p ON p.id = m.piece_id JOIN parts pt ON pt.id = p.part_id
    LEFT JOIN locations f ON f.id = m.from_location_id LEFT JOIN locations t ON t.id = m.to_location_id LEFT JOIN users u ON u.id = m.actor_id`,
  sortable: { movedAt: 'm.moved_at', serial: 'p.serial', partNumber: 'pt.number', reason: 'm.reason', workOrder: 'm.work_order', from: 'f.code', to: 't.code' },
  notNull: ['movedAt'],
  defaultSort: '-movedAt',
  tieBreaker: 'm.id',
  search: ['p.serial', 'm.work_order', 'f.code', 't.code', 'pt.number'],
  filters: (query) => {
    const filters = filterWhen({ clauses: [], replacements: {} }, query.partId, 'pt.id = :partId', 'partId');
    filterWhen(filters, query.locationId, '(m.from_location_id = :locationId OR m.to_location_id = :locationId)', 'locationId');
    filterWhen(filters, query.lotId, 'p.lot_id = :lotId', 'lotId');
    filterWhen(filters, query.reason, 'm.reason = :reason', 'reason');
    return filterWhen(filters, query.workOrder, 'm.work_order = :workOrder', 'workOrder');
  },
  present: (r) => ({
    id: Number(r.id),
    movedAt: (r.movedAt as Date).toISOString(),
    serial: String(r.serial),
    pieceId: Number(r.pieceId),
    lotId: Number(r.lotId),
    partNumber: String(r.partNumber),
    from: (r.from as string | null) ?? null,
    to: (r.to as string | null) ?? null,
    reason: r.reason as MoveReason,
    workOrder: (r.workOrder as string | null) ?? null,
    note: (r.note as string | null) ?? null,
    actor: (r.actor as string | null) ?? null,
  }),
  csv: {
    filename: 'stock-moves',
    columns: [
      { header: 'moved_at', value: (r) => r.movedAt },
      { header: 'serial', value: (r) => r.serial },
      { header: 'part_number', value: (r) => r.partNumber },
      { header: 'lot', value: (r) => lotName(r.lotId) },
      { header: 'from', value: (r) => r.from },
      { header: 'to', value: (r) => r.to },
      { header: 'reason', value: (r) => r.reason },
      { header: 'work_order', value: (r) => r.workOrder },
      { header: 'note', value: (r) => r.note },
      { header: 'by', value: (r) => r.actor },
    ],
  },
};
