// The supplier-quality part of the demo: deviations of the register (one current and used by a lot
// taken as is, one awaiting its second approval), written and approved through the real operations.
import { User } from '../models';
import { actorFromUser } from '../../server/audit/record';
import { approveDeviation, createDeviation } from '../../server/supplierquality/deviations';

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

async function demoUsers() {
  const [buyer, quality, admin] = await Promise.all(['buyer', 'quality', 'admin'].map((role) => User.findOne({ where: { email: `${role}@phaselot.test` }, rejectOnEmpty: true })));
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
