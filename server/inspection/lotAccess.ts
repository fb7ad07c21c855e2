// What inspection needs to know of a lot, read from the receiving tables in one place: its PO line
// (frozen specification, inspection level, AQL), supplier, part, buyer and pieces; and the lot
// state and stock moves that a decision causes.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import type { Disposition } from '../../shared/inspection/lotVerdict';
import type { PartSpec } from '../../shared/schemas/spec';
import type { LocationKind, LotState } from '../../shared/schemas/stock';
import type { AuditActor } from '../audit/record';
import { defaultLocation, movePieces } from '../stock/ledger';
import { AppError, notFound } from '../http/errors';

export type LotForInspection = {
  id: number;
  state: string;
  supplierLot: string;
  quantity: number;
  receivedAt: string;
  poNumber: string;
  lineNumber: number;
  spec: PartSpec;
  inspectionLevel: string;
  aql: number;
  hundredPercent: boolean;
  supplier: { id: number; name: string };
  part: { id: number; number: string; description: string };
  buyer: { email: string; name: string } | null;
  pieces: { id: number; serial: string; state: string }[];
};

type LotRow = {
  id: number; state: string; supplier_lot: string; quantity: number; received_at: Date; po_number: string; line_number: number; spec: PartSpec;
  inspection_level: string; aql: string; hundred_percent: boolean; supplier_id: number; supplier_name: string; part_id: number; part_number: string;
  part_description: string; buyer_email: string | null; buyer_name: string | null;
};

const LOT_SELECT = `
  SELECT l.id, l.state, l.supplier_lot, l.quantity, s.received_at, po.number AS po_number, pol.line_number, pol.spec,
         pol.inspection_level, pol.aql, pol.hundred_percent, sup.id AS supplier_id, sup.name AS supplier_name,
         p.id AS part_id, p.number AS part_number, p.description AS part_description,
         coalesce(b.email, o.email) AS buyer_email, coalesce(b.name, o.name) AS buyer_name
  FROM lots l
  JOIN shipments s ON s.id = l.shipment_id
  JOIN purchase_order_lines pol ON pol.id = l.po_line_id
  JOIN purchase_orders po ON po.id = pol.purchase_order_id
  JOIN suppliers sup ON sup.id = po.supplier_id
  JOIN parts p ON p.id = l.part_id
  LEFT JOIN users b ON b.id = po.buyer_id
  LEFT JOIN users o ON o.id = sup.owner_id`;

async function withPieces(rows: LotRow[], transaction?: Transaction): Promise<LotForInspection[]> {
  if (rows.length === 0) return [];
  const pieces = await sequelize.query<{ id: number; lot_id: number; serial: string; state: string }>(
    'SELECT id, lot_id, serial, state FROM pieces WHERE lot_id IN (:ids) ORDER BY serial',
    { type: QueryTypes.SELECT, transaction, replacements: { ids: rows.map((r) => r.id) } },
  );
  return rows.map((r) => ({
    id: r.id,
    state: r.state,
    supplierLot: r.supplier_lot,
    quantity: r.quantity,
    receivedAt: r.received_at.toISOString().slice(0, 10),
    poNumber: r.po_number,
    lineNumber: r.line_number,
    spec: r.spec,
    inspectionLevel: r.inspection_level,
    aql: Number(r.aql),
    hundredPercent: r.hundred_percent,
    supplier: { id: r.supplier_id, name: r.supplier_name },
    part: { id: r.part_id, number: r.part_number, description: r.part_description },
    buyer: r.buyer_email ? { email: r.buyer_email, name: r.buyer_name ?? r.buyer_email } : null,
    pieces: pieces.filter((p) => p.lot_id === r.id).map(({ id, serial, state }) => ({ id, serial, state })),
  }));
}

/** The lot, optionally locked for the rest of the transaction so two decisions queue behind each other. */
export async function lotForInspection(lotId: number, transaction?: Transaction, options: { lock?: boolean } = {}) {
  if (options.lock) await sequelize.query('SELECT id FROM lots WHERE id = :lotId FOR UPDATE', { transaction, replacements: { lotId } });
  const rows = await sequelize.query<LotRow>(`${LOT_SELECT} WHERE l.id = :lotId`, { type: QueryTypes.SELECT, transaction, replacements: { lotId } });
  if (rows.length === 0) throw notFound('Lot');
  return (await withPieces(rows, transaction))[0];
}

export async function lotsAwaitingInspection() {
  const rows = await sequelize.query<LotRow>(`${LOT_SELECT} WHERE l.state IN ('quarantine', 'inspection', 'awaiting-disposition') ORDER BY s.received_at, l.id`, { type: QueryTypes.SELECT });
  return withPieces(rows);
}

/** After an upload the lot is under inspection, or awaiting its disposition once the sample decides it. */
export async function markLotInspected(lot: LotForInspection, sampleDecides: boolean, transaction: Transaction) {
  if (!['quarantine', 'inspection', 'awaiting-disposition'].includes(lot.state)) return;
  await sequelize.query('UPDATE lots SET state = :state, updated_at = now() WHERE id = :id', {
    transaction,
    replacements: { id: lot.id, state: sampleDecides ? 'awaiting-disposition' : 'inspection' },
  });
}

const OUTCOME: Record<Disposition, { lotState: LotState; locationKind: LocationKind; reason: 'release' | 'return-to-vendor' }> = {
  accept: { lotState: 'accepted', locationKind: 'stock', reason: 'release' },
  'use-as-is': { lotState: 'use-as-is', locationKind: 'stock', reason: 'release' },
  reject: { lotState: 'rejected', locationKind: 'return-to-vendor', reason: 'return-to-vendor' },
};

/** Sets the lot's state and moves every piece still on site (not issued, not already there) to
 * where the decision sends it through the stock ledger: the default stock bin for accepted pieces,
 * return-to-vendor for a rejected lot. */
export async function applyDispositionToLot(lot: LotForInspection, decision: Disposition, actor: AuditActor, transaction: Transaction) {
  const outcome = OUTCOME[decision];
  await sequelize.query('UPDATE lots SET state = :state, updated_at = now() WHERE id = :lotId', { transaction, replacements: { state: outcome.lotState, lotId: lot.id } });
  const destination = await defaultLocation(outcome.locationKind, transaction).catch(() => {
    throw new AppError(409, 'no_location', `No active ${outcome.locationKind} location is set up to receive the lot`);
  });
  const onSite = await sequelize.query<{ id: number }>(
    `SELECT p.id FROM pieces p JOIN piece_locations pl ON pl.piece_id = p.id
     WHERE p.lot_id = :lotId AND pl.location_id IS NOT NULL AND pl.location_id <> :to ORDER BY p.id`,
    { type: QueryTypes.SELECT, transaction, replacements: { lotId: lot.id, to: destination.id } },
  );
  if (onSite.length) {
    await movePieces({ pieceIds: onSite.map((p) => p.id), toLocationId: destination.id, reason: outcome.reason, note: `lot L-${lot.id} disposition: ${decision}` }, actor, transaction);
  }
  return destination;
}
