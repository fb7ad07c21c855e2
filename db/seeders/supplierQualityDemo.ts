// The supplier-quality part of the demo, through the real operations: deviations of the register (one
// current and used by a lot taken as is, one awaiting its second approval) and corrective-action
// requests raised from the demo's NCRs (one awaiting the supplier, one answered through its link).
import { Op } from 'sequelize';
import { CorrectiveActionLink, Nonconformance, Supplier, User } from '../models';
import { actorFromUser } from '../../server/audit/record';
import { raiseCorrectiveAction } from '../../server/supplierquality/correctiveActions';
import { approveDeviation, createDeviation } from '../../server/supplierquality/deviations';
import { tokenOf } from '../../server/supplierquality/responseLinks';
import { submitSupplierResponse } from '../../server/supplierquality/supplierResponse';

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

async function demoUsers() {
  const [buyer, quality, admin] = await Promise.all(
    ['buyer', 'quality', 'admin'].map((role) => User.findOne({ where: { email: `${role}@phaselot.test` }, rejectOnEmpty: true })),
  );
  return { buyer, quality, admin };
}

/** A deviation approved by the quality manager and the administrator, for a lot about to be used as is. */
export async function seedApprovedDeviation(supplierId: number, partId: number, quantityLimit: number, password: string) {
  const { buyer, quality, admin } = await demoUsers();
  const deviation = await createDeviation(actorFromUser(buyer), {
    supplierId,
    partId,
    allowed: 'Retardance tolerance widened to ±0.01 λ for plates going into the alignment fixture, which tolerates it. Agreed with engineering.',
    retardanceTolWaves: 0.01,
    quantityLimit,
    expiresOn: inDays(60),
  });
  for (const approver of [quality, admin]) await approveDeviation(approver, deviation.id, { password, meaningAcknowledged: true });
  return deviation;
}

/** A second deviation of the same part, written and approved once, waiting for its second approver. */
export async function seedPendingDeviation(supplierId: number, partId: number, password: string) {
  const { quality } = await demoUsers();
  const deviation = await createDeviation(actorFromUser(quality), {
    supplierId,
    partId,
    allowed: 'Fast-axis mark tolerance widened to ±1° for the test-bench build only: the mark is re-measured at assembly.',
    axisTolDeg: 1,
    quantityLimit: 20,
    expiresOn: inDays(30),
  });
  await approveDeviation(quality, deviation.id, { password, meaningAcknowledged: true });
  return deviation;
}

/** Requests raised from the first NCRs of two suppliers (once their quality contacts are known); the
 * second is answered by the supplier through its link. */
export async function seedCorrectiveActionDemo() {
  const { buyer } = await demoUsers();
  const ncrs = await Nonconformance.findAll({ order: [['id', 'ASC']] });
  const bySupplier = [...new Map(ncrs.map((n) => [n.supplierId, n])).values()].slice(0, 2);
  for (const [index, ncr] of bySupplier.entries()) {
    const supplier = await Supplier.findByPk(ncr.supplierId, { rejectOnEmpty: true });
    const domain = supplier.contactEmail.split('@')[1];
    await supplier.update({ qualityContactEmail: `quality@${domain}` });
    const request = await raiseCorrectiveAction(actorFromUser(buyer), {
      nonconformanceIds: [ncr.id],
      problem: `${ncr.number}: ${ncr.description.replace(/\.?$/, '.')} Find the root cause, contain what is in your stock and in transit, and tell us what stops it from happening again.`,
      responseDueOn: new Date(Date.now() + (index === 0 ? 21 : 14) * 86_400_000).toISOString().slice(0, 10),
    });
    if (index === 0) continue;
    const link = await CorrectiveActionLink.findOne({ where: { correctiveActionId: request.id, submittedAt: { [Op.is]: null } }, rejectOnEmpty: true });
    await submitSupplierResponse(
      tokenOf(link),
      {
        responderName: 'Maren Odegaard',
        rootCause: 'The marking jig of our line 3 had shifted by about 0.8° after a fixture change; the post-change check was skipped.',
        containment: 'All plates marked on line 3 since the fixture change re-measured; 14 re-marked, none shipped since.',
        correctiveActions: 'Jig pinned and re-qualified; a first-piece axis check after every fixture change added to the line procedure.',
        preventiveActions: 'Fixture changes now need a signed first-piece record before production resumes.',
        containmentOn: new Date(Date.now() - 2 * 86_400_000).toISOString().slice(0, 10),
        correctiveDueOn: new Date(Date.now() + 10 * 86_400_000).toISOString().slice(0, 10),
      },
      [],
      { address: '203.0.113.24', userAgent: 'demo' },
    );
  }
}
