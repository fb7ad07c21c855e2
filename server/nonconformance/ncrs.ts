// What people do with NCRs: open one by hand for pieces found nonconforming later (they go to material
// review through the ledger), keep its description, containment, owner and defect codes, sign the
// disposition of some or all of its pieces (return to vendor, scrap, rework, use as is under a current
// deviation) and the release of reworked pieces, and close it once everything ordered is done. Each is
// one transaction; stock moves go through the ledger; signatures are checked before anything is locked.
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { DefectCode, Location, NcrDisposition, NcrDispositionPiece, Nonconformance, NonconformanceDefect, NonconformancePiece, User } from '../../db/models';
import { pieceAwaitsDisposition, ncrOpenItems, ncrStatusOf, type PieceProgress } from '../../shared/nonconformance/progress';
import {
  NCR_DECISION_LABELS,
  NCR_SIGNATURE_MEANINGS,
  ncrCloseSchema,
  ncrDispositionSchema,
  ncrOpenSchema,
  ncrUpdateSchema,
  reworkReleaseSchema,
  type NcrCloseInput,
  type NcrDecision,
  type NcrDispositionInput,
  type NcrOpenInput,
  type NcrUpdateInput,
  type ReworkReleaseInput,
} from '../../shared/schemas/nonconformance';
import { LOCATION_KIND_LABELS, PIECE_STATE_LABELS, lotName, type LocationKind, type MoveReason, type PieceState } from '../../shared/schemas/stock';
import { parseSerialText } from '../../shared/serials';
import { actorFromUser, recordAudit, type AuditActor } from '../audit/record';
import { verifySignature } from '../auth/signature';
import { AppError, badRequest, conflict, notFound } from '../http/errors';
import { buyersOfLot, buyersOfSupplier } from '../notifications/notify';
import { defaultLocation, movePieces } from '../stock/ledger';
import { nextYearlyNumber } from '../supplierquality/numbers';
import { recordDeviationUse, takeDeviation } from '../supplierquality/deviationUse';
import { notifyNcrOpened } from './ncrNotice';

type Request = Pick<AuditActor, 'requestId' | 'address'>;

/** A piece of an NCR with where it is and what has been signed for it. */
export type NcrPieceState = PieceProgress & {
  pieceId: number;
  lotId: number;
  state: PieceState;
  locationId: number | null;
  locationKind: LocationKind | null;
  dispositionId: number | null;
};

export async function ncrPieceStates(ncrId: number, transaction?: Transaction): Promise<NcrPieceState[]> {
  const rows = await sequelize.query<Omit<NcrPieceState, 'shipped' | 'reworkReleased'> & { returnId: number | null; reworkReleaseId: number | null }>(
    `SELECT np.piece_id AS "pieceId", p.serial, p.lot_id AS "lotId", p.state, pl.location_id AS "locationId", loc.kind AS "locationKind",
            np.disposition_id AS "dispositionId", d.decision, np.return_id AS "returnId", np.rework_release_id AS "reworkReleaseId"
       FROM nonconformance_pieces np
       JOIN pieces p ON p.id = np.piece_id
       LEFT JOIN piece_locations pl ON pl.piece_id = p.id
       LEFT JOIN locations loc ON loc.id = pl.location_id
       LEFT JOIN ncr_dispositions d ON d.id = np.disposition_id
      WHERE np.nonconformance_id = :ncrId
      ORDER BY p.serial`,
    { type: QueryTypes.SELECT, transaction, replacements: { ncrId } },
  );
  return rows.map(({ returnId, reworkReleaseId, ...r }) => ({ ...r, shipped: returnId !== null, reworkReleased: reworkReleaseId !== null }));
}

/** The NCR, locked for the rest of the transaction; 409 once it is closed. */
export async function lockOpenNcr(ncrId: number, transaction: Transaction) {
  const ncr = await Nonconformance.findByPk(ncrId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!ncr) throw notFound('NCR');
  if (ncr.status === 'closed') throw conflict(`${ncr.number} is closed`);
  return ncr;
}

const listSerials = (serials: string[], most = 12) =>
  serials.length <= most ? serials.join(', ') : `${serials.slice(0, most).join(', ')} and ${serials.length - most} more`;

async function checkDefectCodes(ids: number[], transaction: Transaction) {
  const unique = [...new Set(ids)];
  const found = await DefectCode.findAll({ where: { id: unique, active: true }, transaction });
  if (found.length !== unique.length)
    throw badRequest('Some defect codes are unknown or no longer in use', [{ path: 'defectCodeIds', message: 'Choose codes of the catalogue' }]);
  return found;
}

async function checkOwner(ownerId: number | null | undefined, transaction: Transaction) {
  if (ownerId === null || ownerId === undefined) return;
  const owner = await User.findByPk(ownerId, { transaction });
  if (!owner || !owner.active) throw badRequest('The owner is not an active user', [{ path: 'ownerId', message: 'Choose an active user' }]);
}

type FoundPiece = {
  id: number;
  serial: string;
  lotId: number;
  state: PieceState;
  supplierId: number;
  locationKind: LocationKind | null;
  openNcr: string | null;
};

/** The pieces of a part with these serials, with their supplier, where they are and any NCR still open
 * for them; every serial must have been received. */
async function piecesFoundLater(partId: number, text: string, transaction: Transaction) {
  const list = parseSerialText(text);
  if (list.errors.length) throw new AppError(400, 'serials', 'Some serial numbers are not valid', list.errors);
  const pieces = await sequelize.query<FoundPiece>(
    `SELECT p.id, p.serial, p.lot_id AS "lotId", p.state, po.supplier_id AS "supplierId", loc.kind AS "locationKind",
            (SELECT n.number FROM nonconformance_pieces np JOIN nonconformances n ON n.id = np.nonconformance_id
              WHERE np.piece_id = p.id AND n.status <> 'closed' ORDER BY n.id DESC LIMIT 1) AS "openNcr"
       FROM pieces p
       JOIN lots l ON l.id = p.lot_id
       JOIN purchase_order_lines pol ON pol.id = l.po_line_id
       JOIN purchase_orders po ON po.id = pol.purchase_order_id
       LEFT JOIN piece_locations pl ON pl.piece_id = p.id
       LEFT JOIN locations loc ON loc.id = pl.location_id
      WHERE p.part_id = :partId AND p.serial IN (:serials)
      ORDER BY p.serial`,
    { type: QueryTypes.SELECT, transaction, replacements: { partId, serials: list.serials } },
  );
  const found = new Set(pieces.map((p) => p.serial));
  const missing = list.serials.filter((s) => !found.has(s));
  if (missing.length) throw badRequest(`Never received for this part: ${listSerials(missing)}`, { serials: missing });
  return pieces;
}

/** Opens an NCR for pieces found nonconforming after receipt (at assembly, in stores): they go to
 * material review, out of a work order or a bin, in the same transaction. */
export function openNcrByHand(actor: AuditActor, rawInput: NcrOpenInput) {
  const input = ncrOpenSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const pieces = await piecesFoundLater(input.partId, input.serials, transaction);
    const onNcr = pieces.filter((p) => p.openNcr);
    if (onNcr.length)
      throw conflict(`Already on an open NCR: ${listSerials(onNcr.map((p) => `${p.serial} (${p.openNcr})`))}`, { serials: onNcr.map((p) => p.serial) });
    const gone = pieces.filter((p) => p.state === 'scrapped' || p.state === 'shipped-back' || p.locationKind === 'return-to-vendor');
    if (gone.length) throw conflict(`Not on site to hold: ${listSerials(gone.map((p) => `${p.serial} (${PIECE_STATE_LABELS[p.state].toLowerCase()})`))}`);
    const suppliers = new Set(pieces.map((p) => p.supplierId));
    if (suppliers.size > 1)
      throw badRequest('These pieces come from several suppliers: open one NCR per supplier', [{ path: 'serials', message: 'Give serials of one supplier' }]);
    const codes = await checkDefectCodes(input.defectCodeIds, transaction);
    await checkOwner(input.ownerId, transaction);
    const lots = new Set(pieces.map((p) => p.lotId));

    const ncr = await Nonconformance.create(
      {
        number: await nextYearlyNumber('NCR', transaction),
        origin: 'found-later',
        supplierId: pieces[0].supplierId,
        partId: input.partId,
        lotId: lots.size === 1 ? pieces[0].lotId : null,
        lotDispositionId: null,
        description: input.description,
        containment: input.containment,
        ownerId: input.ownerId ?? actor.id,
        openedBy: actor.id,
      },
      { transaction },
    );
    await NonconformancePiece.bulkCreate(
      pieces.map((p) => ({ nonconformanceId: ncr.id, pieceId: p.id, reasons: [input.description] })),
      { transaction },
    );
    await NonconformanceDefect.bulkCreate(
      codes.map((c) => ({ nonconformanceId: ncr.id, defectCodeId: c.id })),
      { transaction },
    );

    // Issued pieces come back from their work order; the others leave their bin or hold.
    const review = await locationFor('material-review', transaction);
    const note = `${ncr.number}: found nonconforming, held for review`;
    const issued = pieces.filter((p) => p.state === 'issued').map((p) => p.id);
    const onSite = pieces.filter((p) => p.state !== 'issued' && p.locationKind !== 'material-review').map((p) => p.id);
    if (issued.length) await movePieces({ pieceIds: issued, toLocationId: review.id, reason: 'return', note }, actor, transaction);
    if (onSite.length) await movePieces({ pieceIds: onSite, toLocationId: review.id, reason: 'hold', note }, actor, transaction);
    const buyers = ncr.lotId ? await buyersOfLot(ncr.lotId, transaction) : await buyersOfSupplier(ncr.supplierId, transaction);
    const found = `${pieces.length} ${pieces.length === 1 ? 'piece' : 'pieces'} found nonconforming: ${listSerials(
      pieces.map((p) => p.serial),
      3,
    )}`;
    await notifyNcrOpened(ncr, found, buyers, actor, transaction);
    await recordAudit(
      actor,
      {
        action: 'ncr.opened',
        entityType: 'nonconformance',
        entityId: ncr.id,
        after: {
          number: ncr.number,
          origin: 'found-later',
          serials: pieces.map((p) => p.serial),
          defects: codes.map((c) => c.code),
          description: input.description,
        },
      },
      transaction,
    );
    return ncr;
  });
}

export function updateNcr(actor: AuditActor, ncrId: number, rawInput: NcrUpdateInput) {
  const input = ncrUpdateSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const ncr = await lockOpenNcr(ncrId, transaction);
    const codes = await checkDefectCodes(input.defectCodeIds, transaction);
    await checkOwner(input.ownerId, transaction);
    const before = {
      description: ncr.description,
      containment: ncr.containment,
      ownerId: ncr.ownerId,
      defects: (await NonconformanceDefect.findAll({ where: { nonconformanceId: ncrId }, transaction })).map((d) => d.defectCodeId),
    };
    Object.assign(ncr, { description: input.description, containment: input.containment, ownerId: input.ownerId, updatedAt: new Date() });
    await ncr.save({ transaction });
    await NonconformanceDefect.destroy({ where: { nonconformanceId: ncrId, defectCodeId: { [Op.notIn]: codes.map((c) => c.id) } }, transaction });
    await NonconformanceDefect.bulkCreate(
      codes.map((c) => ({ nonconformanceId: ncrId, defectCodeId: c.id })),
      { transaction, ignoreDuplicates: true },
    );
    await recordAudit(
      actor,
      { action: 'ncr.updated', entityType: 'nonconformance', entityId: ncrId, before, after: { ...input, defects: codes.map((c) => c.id) } },
      transaction,
    );
    return ncr;
  });
}

async function locationFor(kind: LocationKind, transaction: Transaction) {
  return defaultLocation(kind, transaction).catch(() => {
    throw new AppError(409, 'no_location', `No active ${LOCATION_KIND_LABELS[kind].toLowerCase()} location is set up`);
  });
}

async function stockBin(locationId: number, transaction: Transaction) {
  const location = await Location.findByPk(locationId, { transaction });
  if (!location || location.kind !== 'stock' || !location.active)
    throw badRequest('Choose an active stock bin', [{ path: 'toLocationId', message: 'Not an active stock bin' }]);
  return location;
}

/** The pieces an act covers: those named, or every piece `eligible` admits; each named one must be eligible. */
export function piecesCovered(all: NcrPieceState[], named: number[], eligible: (p: NcrPieceState) => boolean, what: string) {
  if (named.length === 0) {
    const chosen = all.filter(eligible);
    if (chosen.length === 0) throw conflict(`No piece of this NCR ${what}`);
    return chosen;
  }
  const byId = new Map(all.map((p) => [p.pieceId, p]));
  const strangers = named.filter((id) => !byId.has(id));
  if (strangers.length) throw badRequest('Some pieces are not on this NCR', { pieceIds: strangers });
  const chosen = [...new Set(named)].map((id) => byId.get(id)!);
  const refused = chosen.filter((p) => !eligible(p));
  if (refused.length) throw conflict(`Not every piece named ${what}: ${listSerials(refused.map((p) => p.serial))}`, { serials: refused.map((p) => p.serial) });
  return chosen;
}

/** Moves the pieces that are not in a location of `kind` to that kind's location. */
async function moveUnlessIn(
  pieces: NcrPieceState[],
  kind: LocationKind,
  reason: Exclude<MoveReason, 'receipt'>,
  note: string,
  signedDispositionId: number,
  actor: AuditActor,
  transaction: Transaction,
) {
  const toMove = pieces.filter((p) => p.locationKind !== kind).map((p) => p.pieceId);
  if (toMove.length === 0) return;
  const location = await locationFor(kind, transaction);
  await movePieces({ pieceIds: toMove, toLocationId: location.id, reason, note, signedDispositionId }, actor, transaction);
}

async function settleStatus(ncr: Nonconformance, transaction: Transaction) {
  const status = ncrStatusOf(await ncrPieceStates(ncr.id, transaction));
  if (status !== ncr.status) {
    ncr.status = status;
    ncr.updatedAt = new Date();
    await ncr.save({ transaction });
  }
}

/** The quality manager's signed disposition of some (or all awaiting) pieces of an NCR, with the stock
 * moves it orders: return to vendor (to the return-to-vendor cage, shipped later on a return), scrap
 * (out of stores for good), rework (held for rework), use as is (to a stock bin, under a current
 * deviation whose quantity it takes). */
export async function signNcrDisposition(signer: User, ncrId: number, rawInput: NcrDispositionInput, request: Request = {}) {
  const input = ncrDispositionSchema.parse(rawInput);
  const actor = { ...actorFromUser(signer), ...request };
  await verifySignature(signer, input.password, actor, undefined, { entityType: 'nonconformance', entityId: ncrId });
  return inTransaction(async (transaction) => {
    const ncr = await lockOpenNcr(ncrId, transaction);
    const all = await ncrPieceStates(ncrId, transaction);
    const decision: NcrDecision = input.decision;
    const pieces = piecesCovered(
      all,
      input.pieceIds,
      (p) => pieceAwaitsDisposition(p, decision),
      `awaits a disposition${decision === 'rework' ? '' : ' (or waits in rework)'}`,
    );
    const offSite = pieces.filter((p) => p.locationId === null);
    if (offSite.length) throw conflict(`Not on site: ${listSerials(offSite.map((p) => `${p.serial} (${PIECE_STATE_LABELS[p.state].toLowerCase()})`))}`);
    const bin = decision === 'use-as-is' ? await stockBin(input.toLocationId!, transaction) : null;
    const deviation =
      decision === 'use-as-is'
        ? await takeDeviation({ deviationId: input.deviationId!, supplierId: ncr.supplierId, partId: ncr.partId, quantity: pieces.length }, transaction)
        : null;

    const disposition = await NcrDisposition.create(
      {
        nonconformanceId: ncrId,
        decision,
        meaning: NCR_SIGNATURE_MEANINGS[decision],
        deviationNumber: deviation?.number ?? null,
        justification: input.justification || null,
        note: input.note || null,
        signerId: signer.id,
      },
      { transaction },
    );
    const pieceIds = pieces.map((p) => p.pieceId);
    await NcrDispositionPiece.bulkCreate(
      pieceIds.map((pieceId) => ({ dispositionId: disposition.id, pieceId })),
      { transaction },
    );
    await NonconformancePiece.update({ dispositionId: disposition.id }, { where: { nonconformanceId: ncrId, pieceId: pieceIds }, transaction });
    if (deviation) await recordDeviationUse(deviation, { ncrDispositionId: disposition.id }, pieces.length, ncr.lotId, transaction);

    const note = `${ncr.number}: ${NCR_DECISION_LABELS[decision].toLowerCase()}${input.note ? ` (${input.note})` : ''}`;
    switch (decision) {
      case 'return-to-vendor':
        await moveUnlessIn(pieces, 'return-to-vendor', 'return-to-vendor', note, disposition.id, actor, transaction);
        break;
      case 'rework':
        await moveUnlessIn(pieces, 'inspection-hold', 'hold', note, disposition.id, actor, transaction);
        break;
      case 'scrap':
        await movePieces({ pieceIds, toLocationId: null, reason: 'scrap', note, signedDispositionId: disposition.id }, actor, transaction);
        break;
      case 'use-as-is':
        await movePieces(
          { pieceIds, toLocationId: bin!.id, reason: 'release', note: `${note} under deviation ${deviation!.number}`, signedDispositionId: disposition.id },
          actor,
          transaction,
        );
        break;
    }
    await settleStatus(ncr, transaction);
    await recordAudit(
      actor,
      {
        action: `ncr.disposition.${decision}`,
        entityType: 'nonconformance',
        entityId: ncrId,
        after: {
          number: ncr.number,
          dispositionId: disposition.id,
          decision,
          meaning: disposition.meaning,
          deviation: deviation?.number ?? null,
          justification: disposition.justification,
          note: disposition.note,
          serials: pieces.map((p) => p.serial),
          to: bin?.code ?? null,
        },
      },
      transaction,
    );
    return disposition;
  });
}

/** The quality manager's signed release of reworked pieces (re-inspected conforming) to a stock bin. */
export async function releaseReworked(signer: User, ncrId: number, rawInput: ReworkReleaseInput, request: Request = {}) {
  const input = reworkReleaseSchema.parse(rawInput);
  const actor = { ...actorFromUser(signer), ...request };
  await verifySignature(signer, input.password, actor, undefined, { entityType: 'nonconformance', entityId: ncrId });
  return inTransaction(async (transaction) => {
    const ncr = await lockOpenNcr(ncrId, transaction);
    const all = await ncrPieceStates(ncrId, transaction);
    const pieces = piecesCovered(all, input.pieceIds, (p) => p.decision === 'rework' && !p.reworkReleased && p.locationId !== null, 'waits in rework');
    const bin = await stockBin(input.toLocationId, transaction);
    const release = await NcrDisposition.create(
      {
        nonconformanceId: ncrId,
        decision: 'rework-release',
        meaning: NCR_SIGNATURE_MEANINGS['rework-release'],
        deviationNumber: null,
        justification: null,
        note: input.reference,
        signerId: signer.id,
      },
      { transaction },
    );
    const pieceIds = pieces.map((p) => p.pieceId);
    await NcrDispositionPiece.bulkCreate(
      pieceIds.map((pieceId) => ({ dispositionId: release.id, pieceId })),
      { transaction },
    );
    await NonconformancePiece.update({ reworkReleaseId: release.id }, { where: { nonconformanceId: ncrId, pieceId: pieceIds }, transaction });
    await movePieces(
      {
        pieceIds,
        toLocationId: bin.id,
        reason: 'release',
        note: `${ncr.number}: reworked and re-inspected (${input.reference})`,
        signedDispositionId: release.id,
      },
      actor,
      transaction,
    );
    await recordAudit(
      actor,
      {
        action: 'ncr.rework-released',
        entityType: 'nonconformance',
        entityId: ncrId,
        after: {
          number: ncr.number,
          dispositionId: release.id,
          meaning: release.meaning,
          reference: input.reference,
          serials: pieces.map((p) => p.serial),
          to: bin.code,
        },
      },
      transaction,
    );
    return release;
  });
}

/** Closes the NCR once every piece's disposition has been carried out. */
export function closeNcr(actor: AuditActor, ncrId: number, rawInput: NcrCloseInput) {
  const input = ncrCloseSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const ncr = await lockOpenNcr(ncrId, transaction);
    const openItems = ncrOpenItems(await ncrPieceStates(ncrId, transaction));
    if (openItems.length) throw new AppError(409, 'ncr_not_done', `${ncr.number} cannot be closed yet: ${openItems.join('; ')}`, { openItems });
    const before = { status: ncr.status };
    Object.assign(ncr, { status: 'closed', closedAt: new Date(), closedBy: actor.id, closingNote: input.note || null, updatedAt: new Date() });
    await ncr.save({ transaction });
    await recordAudit(
      actor,
      {
        action: 'ncr.closed',
        entityType: 'nonconformance',
        entityId: ncrId,
        before,
        after: { status: 'closed', number: ncr.number, note: ncr.closingNote, lot: ncr.lotId ? lotName(ncr.lotId) : null },
      },
      transaction,
    );
    return ncr;
  });
}
