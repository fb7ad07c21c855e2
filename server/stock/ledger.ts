// The stock ledger's business operations. Every move of a piece goes through here, inside the
// caller's transaction: the pieces are locked, checked against where they are now (the destination
// of their latest move) and what state they must be in, then one ledger row per piece is appended
// and the pieces take the state of where they land. On-hand is a count of where pieces are, so it
// cannot go negative, and two clerks moving the same serial queue on its row lock: the second one
// finds it gone and gets 409.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { Location, Piece, StockMove } from '../../db/models';
import {
  LOCATION_KIND_LABELS,
  LOT_STATE_LABELS,
  OUT_OF_STORES_REASONS,
  PIECE_STATE_LABELS,
  RELEASABLE_LOT_STATES,
  lotName,
  pieceStateAt,
  type LocationKind,
  type LotState,
  type MoveReason,
  type PieceState,
} from '../../shared/schemas/stock';
import { recordAudit, type AuditActor } from '../audit/record';
import { badRequest, conflict, notFound } from '../http/errors';
import { failingNowSql, releasedByNcrSql, usedAsIsSql } from './standing';

export type MoveRequest = {
  pieceIds: number[];
  /** Where the pieces go; `null` takes them out of stores: an issue (with a work order), a scrap or a
   * shipment back to the vendor. */
  toLocationId: number | null;
  reason: Exclude<MoveReason, 'receipt'>;
  workOrder?: string | null;
  note?: string | null;
  /** The states the pieces must be in; if any piece is in another, nothing moves (409). */
  fromStates?: readonly PieceState[];
  /** The signed decision that orders this move (a lot's, or an NCR's for its pieces): it may take
   * pieces out of material review or return-to-vendor. */
  signedDispositionId?: number;
};

type LockedPiece = {
  id: number;
  serial: string;
  state: PieceState;
  lotId: number;
  lotState: LotState;
  locationId: number | null;
  locationCode: string | null;
  locationKind: LocationKind | null;
  failing: boolean;
  usedAsIs: boolean;
};

const listSerials = (pieces: { serial: string }[], most = 12) =>
  pieces.length <= most
    ? pieces.map((p) => p.serial).join(', ')
    : `${pieces
        .slice(0, most)
        .map((p) => p.serial)
        .join(', ')} and ${pieces.length - most} more`;

/** Locks the pieces (in id order, so concurrent movers cannot deadlock) and reads where each is. */
async function lockPieces(pieceIds: number[], transaction: Transaction): Promise<LockedPiece[]> {
  const locked = await Piece.findAll({ where: { id: pieceIds }, order: [['id', 'ASC']], lock: transaction.LOCK.UPDATE, transaction });
  if (locked.length !== pieceIds.length) throw notFound('Piece');
  return sequelize.query<LockedPiece>(
    `SELECT p.id, p.serial, p.state, p.lot_id AS "lotId", l.state AS "lotState", pl.location_id AS "locationId", loc.code AS "locationCode",
            loc.kind AS "locationKind", ${failingNowSql('p.id')} AS failing, (${usedAsIsSql('l.id')} OR ${releasedByNcrSql('p.id')}) AS "usedAsIs"
       FROM pieces p
       JOIN lots l ON l.id = p.lot_id
       JOIN piece_locations pl ON pl.piece_id = p.id
       LEFT JOIN locations loc ON loc.id = pl.location_id
      WHERE p.id IN (:pieceIds)
      ORDER BY p.id`,
    { type: QueryTypes.SELECT, replacements: { pieceIds }, transaction },
  );
}

async function destinationOf(request: MoveRequest, transaction: Transaction) {
  const outOfStores = OUT_OF_STORES_REASONS.includes(request.reason);
  if (request.toLocationId === null) {
    if (!outOfStores) throw badRequest('Only an issue to a work order, a scrap or a shipment back to the vendor takes pieces out of every location');
    if (request.reason === 'issue' && !request.workOrder) throw badRequest('An issue needs its work order');
    return null;
  }
  if (outOfStores) throw badRequest('An issue, a scrap or a shipment back to the vendor takes pieces out of stores; it has no destination location');
  const location = await Location.findByPk(request.toLocationId, { transaction });
  if (!location) throw notFound('Location');
  if (!location.active) throw conflict(`Location ${location.code} is no longer in use`);
  return location;
}

function refuseUnless(pieces: LockedPiece[], bad: (piece: LockedPiece) => boolean, message: (pieces: LockedPiece[]) => string) {
  const offending = pieces.filter(bad);
  if (offending.length) throw conflict(message(offending), { serials: offending.map((p) => p.serial) });
}

/** Why a piece may not go to stock or a work order, or null. Pieces of a lot used as is under a signed
 * deviation are the one exception, and so are pieces an NCR released (used as is, or reworked): that
 * decision released them, failed ones included. */
function unfitForUse(piece: LockedPiece, request: MoveRequest): string | null {
  if (piece.usedAsIs) return null;
  if (piece.failing) return 'failed inspection';
  const setAside = piece.locationKind === 'material-review' || piece.locationKind === 'return-to-vendor';
  if (setAside && request.signedDispositionId === undefined) return `in ${LOCATION_KIND_LABELS[piece.locationKind!].toLowerCase()} at ${piece.locationCode}`;
  return null;
}

/** Moves pieces in the caller's transaction and records one ledger row per piece. */
export async function movePieces(request: MoveRequest, actor: AuditActor, transaction: Transaction): Promise<StockMove[]> {
  const pieceIds = [...new Set(request.pieceIds)];
  if (pieceIds.length === 0) throw badRequest('No pieces to move');
  const destination = await destinationOf(request, transaction);
  const pieces = await lockPieces(pieceIds, transaction);

  // Nothing reaches a stock bin before its lot has been accepted (or sorted, or taken as is).
  if (destination?.kind === 'stock') {
    refuseUnless(
      pieces,
      (p) => !RELEASABLE_LOT_STATES.includes(p.lotState) && !p.usedAsIs,
      (bad) =>
        `Only pieces of accepted lots go to stock; lot ${lotName(bad[0].lotId)} is ${LOT_STATE_LABELS[bad[0].lotState].toLowerCase()}: ${listSerials(bad)}`,
    );
  }
  // Nonconforming material never reaches a stock bin or a work order.
  if (destination?.kind === 'stock' || request.reason === 'issue') {
    refuseUnless(
      pieces,
      (p) => unfitForUse(p, request) !== null,
      (bad) =>
        `Nonconforming pieces cannot ${request.reason === 'issue' ? 'be issued' : 'go to stock'}: ${listSerials(bad.map((p) => ({ serial: `${p.serial} (${unfitForUse(p, request)})` })))}`,
    );
  }

  if (request.fromStates) {
    const allowed = request.fromStates;
    refuseUnless(
      pieces,
      (p) => !allowed.includes(p.state),
      (bad) =>
        `Not available: ${bad
          .map((p) => `${p.serial} (${PIECE_STATE_LABELS[p.state].toLowerCase()})`)
          .slice(0, 12)
          .join(', ')}${bad.length > 12 ? ` and ${bad.length - 12} more` : ''}`,
    );
  }
  if (request.reason === 'return')
    refuseUnless(
      pieces,
      (p) => p.state !== 'issued',
      (bad) => `Not issued, so nothing to return: ${listSerials(bad)}`,
    );
  else
    refuseUnless(
      pieces,
      (p) => p.locationId === null,
      (bad) => `Already out of stores: ${listSerials(bad.map((p) => ({ serial: `${p.serial} (${PIECE_STATE_LABELS[p.state].toLowerCase()})` })))}`,
    );
  if (destination)
    refuseUnless(
      pieces,
      (p) => p.locationId === destination.id,
      (bad) => `Already in ${destination.code}: ${listSerials(bad)}`,
    );

  // One time for the whole move, so the pieces moved together read as one event.
  const movedAt = new Date();
  const moves = await StockMove.bulkCreate(
    pieces.map((p) => ({
      movedAt,
      pieceId: p.id,
      fromLocationId: p.locationId,
      toLocationId: destination?.id ?? null,
      reason: request.reason,
      workOrder: request.workOrder ?? null,
      note: request.note ?? null,
      actorId: actor.id,
    })),
    { transaction },
  );
  const state = pieceStateAt(destination?.kind ?? null, request.reason);
  await Piece.update({ state }, { where: { id: pieceIds }, transaction });
  await recordAudit(
    actor,
    {
      action: `stock.${request.reason}`,
      entityType: 'stock',
      after: {
        to: destination?.code ?? null,
        workOrder: request.workOrder ?? null,
        note: request.note ?? null,
        pieces: pieces.map((p) => ({ serial: p.serial, lot: p.lotId, from: p.locationCode })),
      },
    },
    transaction,
  );
  return moves;
}

/** Puts accepted pieces (still in quarantine or held) into a stock bin. */
export async function releasePiecesToLocation(pieceIds: number[], locationId: number, actor: AuditActor, transaction: Transaction) {
  const location = await Location.findByPk(locationId, { transaction });
  if (!location) throw notFound('Location');
  if (location.kind !== 'stock') throw badRequest(`${location.code} is a ${LOCATION_KIND_LABELS[location.kind].toLowerCase()} location, not a stock bin`);
  return movePieces({ pieceIds, toLocationId: locationId, reason: 'release', fromStates: ['quarantine', 'held'] }, actor, transaction);
}

/** First ledger rows of newly received pieces: they arrive in `locationId` (normally quarantine) at `movedAt`. */
export async function recordReceipt(pieceIds: number[], locationId: number, movedAt: Date, actor: AuditActor, transaction: Transaction) {
  return StockMove.bulkCreate(
    pieceIds.map((pieceId) => ({
      pieceId,
      fromLocationId: null,
      toLocationId: locationId,
      reason: 'receipt' as const,
      workOrder: null,
      note: null,
      actorId: actor.id,
      movedAt,
    })),
    { transaction },
  );
}

/** The active location of a kind with the lowest id: where receipts land, where rejects wait. */
export async function defaultLocation(kind: LocationKind, transaction?: Transaction) {
  const location = await Location.findOne({ where: { kind, active: true }, order: [['id', 'ASC']], transaction });
  if (!location) throw new Error(`No active ${kind} location is set up`);
  return location;
}
