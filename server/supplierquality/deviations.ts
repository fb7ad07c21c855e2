// The deviation register: entries written by buyers and quality managers, approved by a quality
// manager and then by another user (quality or admin), each with a re-entered password. Once an
// approval is signed, what it approved is frozen; a deviation can still be withdrawn with a reason.
import { QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { Deviation, DeviationApproval, Part, Supplier, type ApprovalSlot, type User } from '../../db/models';
import { DEVIATION_APPROVAL_MEANINGS, deviationInputSchema, type DeviationApprovalInput, type DeviationInput } from '../../shared/schemas/deviations';
import { actorFromUser, recordAudit, type AuditActor } from '../audit/record';
import { verifySignature } from '../auth/signature';
import { badRequest, conflict, notFound } from '../http/errors';
import { nextYearlyNumber } from './numbers';

const snapshot = (d: Deviation) => ({
  number: d.number,
  supplierId: d.supplierId,
  partId: d.partId,
  allowed: d.allowed,
  retardanceTolWaves: d.retardanceTolWaves,
  axisTolDeg: d.axisTolDeg,
  quantityLimit: d.quantityLimit,
  expiresOn: d.expiresOn,
});

async function checkSupplierAndPart(supplierId: number, partId: number, transaction: Transaction) {
  const [supplier, part] = await Promise.all([Supplier.findByPk(supplierId, { transaction }), Part.findByPk(partId, { transaction })]);
  const problems = [...(supplier ? [] : [{ path: 'supplierId', message: 'No such supplier' }]), ...(part ? [] : [{ path: 'partId', message: 'No such part' }])];
  if (problems.length) throw badRequest('Some fields are not valid', problems);
}

/** A fresh number; one that an entry recorded before the register already carries is skipped. */
async function freshNumber(transaction: Transaction) {
  for (;;) {
    const number = await nextYearlyNumber('DEV', transaction);
    if (!(await Deviation.count({ where: { number }, transaction }))) return number;
  }
}

async function lockedDeviation(id: number, transaction: Transaction) {
  const deviation = await Deviation.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!deviation) throw notFound('Deviation');
  return deviation;
}

function refuseChangeTo(deviation: Deviation, what: string) {
  if (deviation.recordedBeforeRegister)
    throw conflict(`Deviation ${deviation.number} was recorded before the register from an earlier decision: it cannot be ${what}`);
  if (deviation.withdrawnAt) throw conflict(`Deviation ${deviation.number} was withdrawn: it cannot be ${what}`);
}

export function createDeviation(actor: AuditActor, rawInput: DeviationInput) {
  const input = deviationInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    await checkSupplierAndPart(input.supplierId, input.partId, transaction);
    const deviation = await Deviation.create(
      {
        ...input,
        number: await freshNumber(transaction),
        retardanceTolWaves: input.retardanceTolWaves ?? null,
        axisTolDeg: input.axisTolDeg ?? null,
        createdBy: actor.id,
      },
      { transaction },
    );
    await recordAudit(actor, { action: 'deviation.create', entityType: 'deviation', entityId: deviation.id, after: snapshot(deviation) }, transaction);
    return deviation;
  });
}

/** Edits an entry no one has approved yet. */
export function updateDeviation(actor: AuditActor, id: number, rawInput: DeviationInput) {
  const input = deviationInputSchema.parse(rawInput);
  return inTransaction(async (transaction) => {
    const deviation = await lockedDeviation(id, transaction);
    refuseChangeTo(deviation, 'edited');
    if (await DeviationApproval.count({ where: { deviationId: id }, transaction })) {
      throw conflict(`Deviation ${deviation.number} has an approval signed: what was approved cannot change. Withdraw it and write a new one.`);
    }
    await checkSupplierAndPart(input.supplierId, input.partId, transaction);
    const before = snapshot(deviation);
    deviation.set({ ...input, retardanceTolWaves: input.retardanceTolWaves ?? null, axisTolDeg: input.axisTolDeg ?? null });
    await deviation.save({ transaction });
    await recordAudit(actor, { action: 'deviation.update', entityType: 'deviation', entityId: id, before, after: snapshot(deviation) }, transaction);
    return deviation;
  });
}

/** Signs an approval: the first is a quality manager's, the second another user's (quality or admin). */
export async function approveDeviation(signer: User, id: number, input: DeviationApprovalInput, request: Pick<AuditActor, 'requestId' | 'address'> = {}) {
  const actor = { ...actorFromUser(signer), ...request };
  // The password is checked before anything is locked.
  await verifySignature(signer, input.password, actor, undefined, { entityType: 'deviation', entityId: id });
  return inTransaction(async (transaction) => {
    const deviation = await lockedDeviation(id, transaction);
    refuseChangeTo(deviation, 'approved');
    const approvals = await DeviationApproval.findAll({ where: { deviationId: id }, transaction });
    if (approvals.length >= 2) throw conflict(`Deviation ${deviation.number} is already approved by two people`);
    if (approvals.some((a) => a.approverId === signer.id)) {
      throw conflict(
        `You approved deviation ${deviation.number} already: the second approval must come from another user (a quality manager or an administrator)`,
      );
    }
    const slot: ApprovalSlot = approvals.length === 0 ? 'quality' : 'second';
    if (slot === 'quality' && !signer.hasRole('quality')) throw conflict(`The first approval of deviation ${deviation.number} is a quality manager's`);
    const approval = await DeviationApproval.create(
      { deviationId: id, slot, approverId: signer.id, meaning: DEVIATION_APPROVAL_MEANINGS[slot] },
      { transaction },
    );
    await recordAudit(
      actor,
      { action: 'deviation.approve', entityType: 'deviation', entityId: id, after: { slot, meaning: approval.meaning, approved: snapshot(deviation) } },
      transaction,
    );
    return approval;
  });
}

export function withdrawDeviation(actor: AuditActor, id: number, reason: string) {
  return inTransaction(async (transaction) => {
    const deviation = await lockedDeviation(id, transaction);
    refuseChangeTo(deviation, 'withdrawn again');
    deviation.set({ withdrawnAt: new Date(), withdrawnBy: actor.id, withdrawalReason: reason });
    await deviation.save({ transaction });
    await recordAudit(actor, { action: 'deviation.withdraw', entityType: 'deviation', entityId: id, after: { number: deviation.number, reason } }, transaction);
    return deviation;
  });
}

/** The pieces a deviation's standing uses cover (uses given back by a superseded decision excluded). */
export async function quantityUsed(deviationId: number, transaction?: Transaction) {
  const [{ used }] = await sequelize.query<{ used: number }>(
    'SELECT coalesce(sum(quantity), 0)::int AS used FROM deviation_uses WHERE deviation_id = :deviationId AND released_at IS NULL',
    { type: QueryTypes.SELECT, transaction, replacements: { deviationId } },
  );
  return used;
}
