// Using a deviation: a signed decision that releases pieces as is (a lot's use-as-is decision, or an
// NCR's per-piece disposition) takes its pieces out of a current deviation of that supplier's part.
// In the decision's transaction: `takeDeviation` locks the entry and checks it may cover the pieces
// (409 with the reason otherwise), the caller writes its decision, then `recordDeviationUse` books
// the pieces against it. A superseded decision gives its pieces back (`releaseDeviationUse`).
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { Deviation, DeviationApproval, DeviationUse } from '../../db/models';
import { todayUtc } from '../../shared/schemas/deviations';
import { AppError } from '../http/errors';
import { quantityUsed } from './deviations';
import { plural } from '../../shared/format';

export type DeviationRequest = {
  deviationId: number;
  supplierId: number;
  partId: number;
  quantity: number;
  /** The pieces released: when the deviation widens a tolerance, their failed results must lie inside it. */
  pieceIds?: number[];
};

const refused = (message: string, details?: unknown) => new AppError(409, 'deviation_not_usable', message, details);

/** The deviation, locked until the transaction ends, once it is known to cover `quantity` pieces of
 * this supplier's part today: approved twice, not withdrawn, not expired, enough quantity left, and
 * the pieces' failed measurements inside the tolerances it widens. */
export async function takeDeviation(request: DeviationRequest, transaction: Transaction): Promise<Deviation> {
  const deviation = await Deviation.findByPk(request.deviationId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!deviation) throw refused('The deviation chosen does not exist');
  const name = `Deviation ${deviation.number}`;
  if (deviation.supplierId !== request.supplierId || deviation.partId !== request.partId) throw refused(`${name} is for another supplier or part`);
  if (deviation.recordedBeforeRegister) throw refused(`${name} was recorded before the register from an earlier decision and covers no new one`);
  if (deviation.withdrawnAt) throw refused(`${name} was withdrawn: ${deviation.withdrawalReason}`);
  const approvals = await DeviationApproval.count({ where: { deviationId: deviation.id }, transaction });
  if (approvals < 2) throw refused(`${name} is not approved yet (${approvals} of 2 approvals signed)`);
  if (deviation.expiresOn! < todayUtc()) throw refused(`${name} expired on ${deviation.expiresOn}`);
  const used = await quantityUsed(deviation.id, transaction);
  const left = deviation.quantityLimit! - used;
  if (request.quantity > left) {
    throw refused(
      left === 0
        ? `${name} is used up: its ${deviation.quantityLimit} pieces are all taken`
        : `${name} covers ${plural(left, 'more piece')} of its ${deviation.quantityLimit}; this decision releases ${request.quantity}`,
      { quantityLimit: deviation.quantityLimit, quantityUsed: used, requested: request.quantity },
    );
  }
  const outside = await outsideWidenedTolerance(deviation, request.pieceIds ?? [], transaction);
  if (outside.length) {
    const limits = [
      deviation.retardanceTolWaves !== null && `retardance ±${deviation.retardanceTolWaves} λ`,
      deviation.axisTolDeg !== null && `fast-axis mark ±${deviation.axisTolDeg}°`,
    ].filter(Boolean);
    throw refused(
      `${name} widens the tolerance to ${limits.join(' and ')}; these pieces were measured outside it: ${outside.map((p) => p.serial).join(', ')}`,
      { pieces: outside },
    );
  }
  return deviation;
}

type Outside = { serial: string; wavelengthNm: number; retardanceErrorWaves: number | null; axisErrorDeg: number | null };

/** Failed results (judged at their wavelength) of the pieces whose retardance or axis error is beyond
 * what the deviation widens; none when it widens no measured tolerance. */
async function outsideWidenedTolerance(deviation: Deviation, pieceIds: number[], transaction: Transaction) {
  if (pieceIds.length === 0 || (deviation.retardanceTolWaves === null && deviation.axisTolDeg === null)) return [];
  return sequelize.query<Outside>(
    `SELECT p.serial, r.wavelength_nm::float8 AS "wavelengthNm", (r.result->>'retardanceErrorWaves')::float8 AS "retardanceErrorWaves",
            (r.result->>'axisErrorDeg')::float8 AS "axisErrorDeg"
       FROM piece_results r JOIN pieces p ON p.id = r.piece_id
      WHERE r.piece_id IN (:pieceIds) AND r.superseded_by_file_id IS NULL AND r.verdict = 'fail' AND coalesce((r.result->>'judged')::boolean, true)
        AND (abs((r.result->>'retardanceErrorWaves')::float8) > CAST(:retardance AS float8) OR abs((r.result->>'axisErrorDeg')::float8) > CAST(:axis AS float8))
      ORDER BY p.serial, r.wavelength_nm`,
    { type: QueryTypes.SELECT, transaction, replacements: { pieceIds, retardance: deviation.retardanceTolWaves, axis: deviation.axisTolDeg } },
  );
}

export type DeviationUseSource = { dispositionId: number } | { ncrDispositionId: number };

/** Books `quantity` pieces of the decision `source` against a deviation `takeDeviation` returned. */
export async function recordDeviationUse(deviation: Deviation, source: DeviationUseSource, quantity: number, lotId: number | null, transaction: Transaction) {
  return DeviationUse.create(
    {
      deviationId: deviation.id,
      quantity,
      lotId,
      dispositionId: 'dispositionId' in source ? source.dispositionId : null,
      ncrDispositionId: 'ncrDispositionId' in source ? source.ncrDispositionId : null,
    },
    { transaction },
  );
}

/** Gives back the pieces a superseded decision took from its deviation. */
export async function releaseDeviationUse(source: DeviationUseSource, transaction: Transaction) {
  const where = 'dispositionId' in source ? { dispositionId: source.dispositionId } : { ncrDispositionId: source.ncrDispositionId };
  await DeviationUse.update({ releasedAt: new Date() }, { where: { ...where, releasedAt: { [Op.is]: null } }, transaction });
}
