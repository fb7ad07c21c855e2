// The NCR a signed lot decision opens, in the decision's transaction: for a rejected lot (its pieces
// set aside for the vendor), for a completed 100 % sort (the nonconforming pieces) and for an accepted
// lot whose failed pieces went to material review. A decision that supersedes another closes the NCR
// the earlier one opened, unless work has been signed on it: then the lot is decided piece by piece
// there, and the new lot decision is refused.
import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { DefectCode, Nonconformance, NonconformanceDefect, NonconformancePiece } from '../../db/models';
import { describeLotNcr, failingReasons } from '../../shared/nonconformance/automatic';
import { defectCodesFor } from '../../shared/nonconformance/defectCodes';
import type { NcrOrigin } from '../../shared/schemas/nonconformance';
import { lotName } from '../../shared/schemas/stock';
import { recordAudit, type AuditActor } from '../audit/record';
import { AppError } from '../http/errors';
import { buyersOfLot } from '../notifications/notify';
import { notifyNcrOpened } from './ncrNotice';
import { nextYearlyNumber } from '../supplierquality/numbers';

/** A signed lot decision, and the pieces its routing set aside (in material review or return-to-vendor). */
export type LotDecisionForNcr = {
  lot: { id: number; supplierLot: string; poNumber: string; supplier: { id: number; name: string }; part: { id: number; number: string } };
  routing: 'accept' | 'reject' | 'sort' | 'sorted' | 'use-as-is';
  dispositionId: number;
  signerId: number;
  explanation: string;
  setAside: number[];
  /** The decision this one supersedes, if any. */
  supersededId: number | null;
};

const ORIGIN: Partial<Record<LotDecisionForNcr['routing'], Exclude<NcrOrigin, 'found-later'>>> = {
  reject: 'rejection',
  sorted: 'sort',
  accept: 'accepted-lot',
};

/** The failing reasons of each piece's current judged results. */
export async function currentFailingReasons(pieceIds: number[], transaction: Transaction) {
  if (pieceIds.length === 0) return new Map<number, string[]>();
  const rows = await sequelize.query<{ pieceId: number; wavelengthNm: string; verdict: string; reasons: string[] }>(
    `SELECT piece_id AS "pieceId", wavelength_nm AS "wavelengthNm", verdict, result->'reasons' AS reasons
       FROM piece_results WHERE piece_id IN (:pieceIds) AND superseded_by_file_id IS NULL AND coalesce((result->>'judged')::boolean, true)
      ORDER BY wavelength_nm`,
    { type: QueryTypes.SELECT, transaction, replacements: { pieceIds } },
  );
  return new Map(pieceIds.map((id) => [id, failingReasons(rows.filter((r) => r.pieceId === id).map((r) => ({ ...r, wavelengthNm: Number(r.wavelengthNm) })))]));
}

/** Closes the NCR a superseded decision opened, or refuses the new decision if that NCR has work signed on it. */
async function settleSupersededNcr(decision: LotDecisionForNcr, actor: AuditActor, transaction: Transaction) {
  if (decision.supersededId === null) return;
  const earlier = await Nonconformance.findOne({ where: { lotDispositionId: decision.supersededId }, transaction, lock: transaction.LOCK.UPDATE });
  if (!earlier || earlier.status === 'closed') return;
  const [{ worked }] = await sequelize.query<{ worked: boolean }>(
    `SELECT EXISTS (SELECT 1 FROM ncr_dispositions WHERE nonconformance_id = :id) OR EXISTS (SELECT 1 FROM vendor_returns WHERE nonconformance_id = :id) AS worked`,
    { type: QueryTypes.SELECT, transaction, replacements: { id: earlier.id } },
  );
  if (worked) {
    throw new AppError(
      409,
      'ncr_in_progress',
      `${earlier.number} of lot ${lotName(decision.lot.id)} already has signed dispositions or returns: decide its pieces there rather than by a new lot decision`,
      { ncr: earlier.number },
    );
  }
  const before = { status: earlier.status };
  Object.assign(earlier, {
    status: 'closed',
    closedAt: new Date(),
    closedBy: decision.signerId,
    closingNote: 'The lot decision that opened it was superseded by a new decision',
  });
  await earlier.save({ transaction });
  await recordAudit(
    actor,
    {
      action: 'ncr.closed',
      entityType: 'nonconformance',
      entityId: earlier.id,
      before,
      after: { status: 'closed', number: earlier.number, reason: 'lot decision superseded', dispositionId: decision.dispositionId },
    },
    transaction,
  );
}

/** Opens the decision's NCR when it set pieces aside; answers it, or null. */
export async function openLotNcr(decision: LotDecisionForNcr, actor: AuditActor, transaction: Transaction) {
  await settleSupersededNcr(decision, actor, transaction);
  const origin = ORIGIN[decision.routing];
  if (!origin || decision.setAside.length === 0) return null;
  const pieceIds = [...decision.setAside].sort((a, b) => a - b);
  const reasons = await currentFailingReasons(pieceIds, transaction);
  const held = await sequelize.query<{ code: string }>(
    'SELECT DISTINCT loc.code FROM piece_locations pl JOIN locations loc ON loc.id = pl.location_id WHERE pl.piece_id IN (:pieceIds) ORDER BY loc.code',
    { type: QueryTypes.SELECT, transaction, replacements: { pieceIds } },
  );
  const { lot } = decision;
  const { description, containment } = describeLotNcr({
    origin,
    lotName: lotName(lot.id),
    partNumber: lot.part.number,
    supplierName: lot.supplier.name,
    supplierLot: lot.supplierLot,
    poNumber: lot.poNumber,
    explanation: decision.explanation,
    pieces: pieceIds.length,
    failing: pieceIds.filter((id) => reasons.get(id)!.length > 0).length,
    heldAt: held.map((h) => h.code).join(', '),
  });
  const ncr = await Nonconformance.create(
    {
      number: await nextYearlyNumber('NCR', transaction),
      origin,
      supplierId: lot.supplier.id,
      partId: lot.part.id,
      lotId: lot.id,
      lotDispositionId: decision.dispositionId,
      description,
      containment,
      ownerId: decision.signerId,
      openedBy: decision.signerId,
    },
    { transaction },
  );
  await NonconformancePiece.bulkCreate(
    pieceIds.map((pieceId) => ({ nonconformanceId: ncr.id, pieceId, reasons: reasons.get(pieceId)! })),
    { transaction },
  );
  const codes = defectCodesFor([...reasons.values()].flat());
  const catalogue = codes.length ? await DefectCode.findAll({ where: { code: codes, active: true }, transaction }) : [];
  await NonconformanceDefect.bulkCreate(
    catalogue.map((c) => ({ nonconformanceId: ncr.id, defectCodeId: c.id })),
    { transaction },
  );
  await notifyNcrOpened(
    ncr,
    `${lot.part.number} from ${lot.supplier.name}, lot ${lotName(lot.id)}`,
    await buyersOfLot(lot.id, transaction),
    actor,
    transaction,
  );
  await recordAudit(
    actor,
    {
      action: 'ncr.opened',
      entityType: 'nonconformance',
      entityId: ncr.id,
      after: {
        number: ncr.number,
        origin,
        lot: lotName(lot.id),
        dispositionId: decision.dispositionId,
        pieces: pieceIds.length,
        defects: catalogue.map((c) => c.code),
      },
    },
    transaction,
  );
  return ncr;
}
