// Using a deviation: a signed decision that releases pieces as is (a lot's use-as-is decision, or an
// NCR's per-piece disposition) takes its pieces out of a current deviation of that supplier's part.
// In the decision's transaction: `takeDeviation` locks the entry and checks it may cover the pieces
// (409 with the reason otherwise), the caller writes its decision, then `recordDeviationUse` books
// the pieces against it. A superseded decision gives its pieces back (`releaseDeviationUse`).
import { Op, type Transaction } from 'sequelize';
import { Deviation, DeviationApproval, DeviationUse } from '../../db/models';
import { todayUtc } from '../../shared/schemas/deviations';
import { AppError } from '../http/errors';
import { quantityUsed } from './deviations';

export type DeviationRequest = { deviationId: number; supplierId: number; partId: number; quantity: number };

const refused = (message: string, details?: unknown) => new AppError(409, 'deviation_not_usable', message, details);

/** The deviation, locked until the transaction ends, once it is known to cover `quantity` pieces of
 * this supplier's part today: approved twice, not withdrawn, not expired, enough quantity left. */
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
        : `${name} covers ${left} more piece${left === 1 ? '' : 's'} of its ${deviation.quantityLimit}; this decision releases ${request.quantity}`,
      { quantityLimit: deviation.quantityLimit, quantityUsed: used, requested: request.quantity },
    );
  }
  return deviation;
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
