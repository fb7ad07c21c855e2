// What inspection needs to know of a lot, read from the receiving tables in one place: its PO line
// (frozen specification, inspection level, AQL), supplier, part, buyer and pieces; and the lot
// state and stock moves that a decision causes.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import type { Disposition, PieceVerdict } from '../../shared/inspection/lotVerdict';
import type { PartSpec } from '../../shared/schemas/spec';
import { LOCATION_KIND_LABELS, lotName, type LocationKind, type LotState, type MoveReason } from '../../shared/schemas/stock';
import type { AuditActor } from '../audit/record';
import { defaultLocation, movePieces } from '../stock/ledger';
import { AppError, notFound } from '../http/errors';
import { notify } from '../notifications/notify';

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
  id: number;
  state: string;
  supplier_lot: string;
  quantity: number;
  received_at: Date;
  po_number: string;
  line_number: number;
  spec: PartSpec;
  inspection_level: string;
  aql: string;
  hundred_percent: boolean;
  supplier_id: number;
  supplier_name: string;
  part_id: number;
  part_number: string;
  part_description: string;
  buyer_email: string | null;
  buyer_name: string | null;
};

/** A lot `l` with its receipt `s`, PO line `pol`, order `po`, supplier `sup` and part `p`. */
const LOT_JOINS = `lots l
  JOIN shipments s ON s.id = l.shipment_id
  JOIN purchase_order_lines pol ON pol.id = l.po_line_id
  JOIN purchase_orders po ON po.id = pol.purchase_order_id
  JOIN suppliers sup ON sup.id = po.supplier_id
  JOIN parts p ON p.id = l.part_id`;

const LOT_SELECT = `
  SELECT l.id, l.state, l.supplier_lot, l.quantity, s.received_at, po.number AS po_number, pol.line_number, pol.spec,
         pol.inspection_level, pol.aql, pol.hundred_percent, sup.id AS supplier_id, sup.name AS supplier_name,
         p.id AS part_id, p.number AS part_number, p.description AS part_description,
         coalesce(b.email, o.email) AS buyer_email, coalesce(b.name, o.name) AS buyer_name
  FROM ${LOT_JOINS}
  LEFT JOIN users b ON b.id = po.buyer_id
  LEFT JOIN users o ON o.id = sup.owner_id`;

/** The lots waiting for inspection (open for measurement or a decision), as SQL for the queue's list:
 * the joins of LOT_JOINS and the condition. */
export const LOTS_AWAITING_INSPECTION = { from: LOT_JOINS, where: `l.state IN ('quarantine', 'inspection', 'awaiting-disposition', 'sorting')` };

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
  const rows = await sequelize.query<LotRow>(`${LOT_SELECT} WHERE ${LOTS_AWAITING_INSPECTION.where} ORDER BY s.received_at, l.id`, { type: QueryTypes.SELECT });
  return withPieces(rows);
}

/** After an upload the lot is under inspection, or awaiting its disposition once the sample decides it. */
export async function markLotInspected(lot: LotForInspection, sampleDecides: boolean, transaction: Transaction) {
  if (!['quarantine', 'inspection', 'awaiting-disposition'].includes(lot.state)) return;
  await sequelize.query('UPDATE lots SET state = :state, updated_at = now() WHERE id = :id', {
    transaction,
    replacements: { id: lot.id, state: sampleDecides ? 'awaiting-disposition' : 'inspection' },
  });
  if (sampleDecides && lot.state !== 'awaiting-disposition') {
    await notify(
      {
        kind: 'awaiting-signature',
        permission: 'disposition.sign',
        title: `Lot ${lotName(lot.id)} awaits a signed decision: ${lot.part.number} from ${lot.supplier.name}`,
        link: `/inspection/lots/${lot.id}`,
        entity: { type: 'lot', id: lot.id },
        roles: ['quality'],
      },
      transaction,
    );
  }
}

/** What moves a lot's pieces: a signed decision, or the end of the 100 % sort a 'sort' decision ordered. */
export type Routing = Disposition | 'sorted';
type Destination = 'stock' | 'material-review' | 'return-to-vendor' | 'quarantine';

const LOT_STATE_UNDER: Record<Routing, LotState> = { accept: 'accepted', reject: 'rejected', sort: 'sorting', sorted: 'sorted', 'use-as-is': 'use-as-is' };
const REASON_TO: Record<Destination, Exclude<MoveReason, 'receipt'>> = {
  stock: 'release',
  'material-review': 'hold',
  'return-to-vendor': 'return-to-vendor',
  quarantine: 'inspection',
};

/** Where a decision sends one piece, by the piece's own current verdict. */
function destinationOf(routing: Routing, verdict: PieceVerdict | 'unmeasured'): Destination {
  switch (routing) {
    case 'accept':
      // Conforming and unmeasured pieces are released under the sampling plan; failed ones never.
      return verdict === 'fail' ? 'material-review' : 'stock';
    case 'use-as-is':
      return 'stock';
    case 'reject':
      return 'return-to-vendor';
    case 'sort':
      // Every remaining piece waits in quarantine to be measured.
      return 'quarantine';
    case 'sorted':
      return verdict === 'pass' ? 'stock' : 'return-to-vendor';
  }
}

export type DecisionContext = { dispositionId: number; deviationNumber: string | null };

function moveNote(lot: LotForInspection, routing: Routing, destination: Destination, failing: boolean, context: DecisionContext) {
  const name = `lot ${lotName(lot.id)}`;
  switch (routing) {
    case 'accept':
      return destination === 'stock' ? `${name} accepted` : `${name} accepted; this piece failed inspection, so to material review`;
    case 'use-as-is':
      return failing
        ? `Released as is under deviation ${context.deviationNumber} (${name}): this piece failed inspection`
        : `${name} used as is under deviation ${context.deviationNumber}`;
    case 'reject':
      return `${name} rejected to vendor`;
    case 'sort':
      return `${name} to be sorted 100 %`;
    case 'sorted':
      return destination === 'stock' ? `${name} sorted: conforming` : `${name} sorted: nonconforming, back to the vendor`;
  }
}

/** Sets the lot's state and moves every piece still on site (issued ones stay issued) to where the
 * decision sends it, by its own verdict, through the stock ledger. A piece already in a location of
 * the right kind stays where it is. Answers the pieces by destination, those that stayed included. */
export async function routeLotPieces(
  lot: LotForInspection,
  routing: Routing,
  verdicts: Map<number, PieceVerdict | 'unmeasured'>,
  context: DecisionContext,
  actor: AuditActor,
  transaction: Transaction,
) {
  await sequelize.query('UPDATE lots SET state = :state, updated_at = now() WHERE id = :lotId', {
    transaction,
    replacements: { state: LOT_STATE_UNDER[routing], lotId: lot.id },
  });
  const onSite = await sequelize.query<{ id: number; kind: LocationKind }>(
    `SELECT p.id, loc.kind FROM pieces p JOIN piece_locations pl ON pl.piece_id = p.id JOIN locations loc ON loc.id = pl.location_id
      WHERE p.lot_id = :lotId ORDER BY p.id`,
    { type: QueryTypes.SELECT, transaction, replacements: { lotId: lot.id } },
  );
  const routed: Record<Destination, number[]> = { stock: [], 'material-review': [], 'return-to-vendor': [], quarantine: [] };
  // One ledger move per destination and note, so the history reads as a few events.
  const batches = new Map<string, { destination: Destination; note: string; pieceIds: number[] }>();
  for (const piece of onSite) {
    const verdict = verdicts.get(piece.id) ?? 'unmeasured';
    const destination = destinationOf(routing, verdict);
    routed[destination].push(piece.id);
    if (piece.kind === destination) continue;
    const note = moveNote(lot, routing, destination, verdict === 'fail', context);
    const batch = batches.get(note) ?? { destination, note, pieceIds: [] };
    batch.pieceIds.push(piece.id);
    batches.set(note, batch);
  }
  for (const { destination, note, pieceIds } of batches.values()) {
    const location = await defaultLocation(destination, transaction).catch(() => {
      throw new AppError(
        409,
        'no_location',
        `No active ${LOCATION_KIND_LABELS[destination].toLowerCase()} location is set up to receive pieces of lot ${lotName(lot.id)}`,
      );
    });
    await movePieces(
      { pieceIds, toLocationId: location.id, reason: REASON_TO[destination], note, signedDispositionId: context.dispositionId },
      actor,
      transaction,
    );
  }
  return routed;
}

const count = (n: number, what: string) => `${n} piece${n === 1 ? '' : 's'} ${what}`;

/** Where a routing sent the lot's pieces, in words, for its documents. */
export function routingOutcome(routing: Routing, routed: Awaited<ReturnType<typeof routeLotPieces>>, verdicts: Map<number, PieceVerdict | 'unmeasured'>) {
  const failed = routed.stock.filter((id) => verdicts.get(id) === 'fail').length;
  switch (routing) {
    case 'accept':
      return [
        count(routed.stock.length, 'released to stock (measured conforming, or released under the sampling plan)'),
        routed['material-review'].length && count(routed['material-review'].length, 'failed inspection: to material review'),
      ]
        .filter(Boolean)
        .join('; ');
    case 'use-as-is':
      return `${count(routed.stock.length, 'released to stock under the deviation')}${failed ? `, ${failed} of them failed inspection and released as is` : ''}`;
    case 'reject':
      return count(routed['return-to-vendor'].length, 'to return-to-vendor');
    case 'sort':
      return count(routed.quarantine.length, 'held in quarantine to be measured one by one (100 % sort)');
    case 'sorted':
      return `100 % sort: ${count(routed.stock.length, 'conforming released to stock')}; ${count(routed['return-to-vendor'].length, 'nonconforming to return-to-vendor')}`;
  }
}
