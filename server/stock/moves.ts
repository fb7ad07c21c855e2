// What the clerk does with stock: issue serials to a work order, transfer them between bins, and
// put the pieces of an accepted lot away. Each is one transaction around the ledger's operations.
import { QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { Location, Lot, Part, Piece } from '../../db/models';
import {
  issueInputSchema,
  lotName,
  releaseInputSchema,
  transferInputSchema,
  type IssueInput,
  type ReleaseInput,
  type TransferInput,
} from '../../shared/schemas/stock';
import { parseSerialText } from '../../shared/serials';
import type { AuditActor } from '../audit/record';
import { AppError, badRequest, notFound } from '../http/errors';
import { movePieces, releasePiecesToLocation } from './ledger';

/** The ledger rows one of these operations wrote. */
export type StockMoves = Awaited<ReturnType<typeof movePieces>>;

function serialsFrom(text: string) {
  const list = parseSerialText(text);
  if (list.errors.length) throw new AppError(400, 'serials', 'Some serial numbers are not valid', list.errors);
  return list.serials;
}

/** The pieces of a part with these serials; every serial must have been received. */
async function piecesOfPart(partId: number, serials: string[], transaction: Transaction) {
  const part = await Part.findByPk(partId, { transaction });
  if (!part) throw notFound('Part');
  const pieces = await Piece.findAll({ where: { partId, serial: serials }, transaction });
  const found = new Set(pieces.map((p) => p.serial));
  const missing = serials.filter((s) => !found.has(s));
  if (missing.length)
    throw badRequest(
      `Never received for part ${part.number}: ${missing.slice(0, 12).join(', ')}${missing.length > 12 ? ` and ${missing.length - 12} more` : ''}`,
      { serials: missing },
    );
  return pieces;
}

export function issueToWorkOrder(actor: AuditActor, rawInput: IssueInput) {
  const input = issueInputSchema.parse(rawInput);
  const serials = serialsFrom(input.serials);
  return inTransaction(async (transaction) => {
    const pieces = await piecesOfPart(input.partId, serials, transaction);
    return movePieces(
      { pieceIds: pieces.map((p) => p.id), toLocationId: null, reason: 'issue', workOrder: input.workOrder, fromStates: ['in-stock'] },
      actor,
      transaction,
    );
  });
}

export function transferBetweenBins(actor: AuditActor, rawInput: TransferInput) {
  const input = transferInputSchema.parse(rawInput);
  const serials = serialsFrom(input.serials);
  return inTransaction(async (transaction) => {
    const destination = await Location.findByPk(input.toLocationId, { transaction });
    if (!destination) throw notFound('Location');
    if (destination.kind !== 'stock') throw badRequest(`Transfers go between stock bins; ${destination.code} is not one`);
    const pieces = await piecesOfPart(input.partId, serials, transaction);
    return movePieces({ pieceIds: pieces.map((p) => p.id), toLocationId: destination.id, reason: 'transfer', fromStates: ['in-stock'] }, actor, transaction);
  });
}

/** Pieces of a lot waiting to be put away: in quarantine or on the inspection hold rack (not those set
 * aside in material review or return-to-vendor). */
async function waitingPieces(lotId: number, transaction: Transaction) {
  const rows = await sequelize.query<{ id: number }>(
    `SELECT p.id FROM pieces p JOIN piece_locations pl ON pl.piece_id = p.id JOIN locations loc ON loc.id = pl.location_id
      WHERE p.lot_id = :lotId AND loc.kind IN ('quarantine', 'inspection-hold')`,
    { type: QueryTypes.SELECT, replacements: { lotId }, transaction },
  );
  return Piece.findAll({ where: { id: rows.map((r) => r.id) }, transaction });
}

/** Puts away the pieces of an accepted lot: the serials given, or all of its pieces still waiting. */
export function putAwayLot(actor: AuditActor, rawInput: ReleaseInput) {
  const input = releaseInputSchema.parse(rawInput);
  const serials = input.serials ? serialsFrom(input.serials) : null;
  return inTransaction(async (transaction) => {
    const lot = await Lot.findByPk(input.lotId, { transaction });
    if (!lot) throw notFound('Lot');
    const pieces = serials ? await piecesOfPart(lot.partId, serials, transaction) : await waitingPieces(lot.id, transaction);
    const strangers = pieces.filter((p) => p.lotId !== lot.id);
    if (strangers.length) throw badRequest(`Not pieces of lot ${lotName(lot.id)}: ${strangers.map((p) => p.serial).join(', ')}`);
    if (pieces.length === 0) throw badRequest(`Lot ${lotName(lot.id)} has no pieces waiting to be put away`);
    return releasePiecesToLocation(
      pieces.map((p) => p.id),
      input.toLocationId,
      actor,
      transaction,
    );
  });
}
