// Telling the buyer and quality that an NCR was opened (by a lot decision or by hand), in its transaction.
import type { Transaction } from 'sequelize';
import type { AuditActor } from '../audit/record';
import { notify, type NotificationDraft } from '../notifications/notify';

export async function notifyNcrOpened(
  ncr: { id: number; number: string },
  subject: string,
  buyers: Pick<NotificationDraft, 'users' | 'roles'>,
  actor: AuditActor,
  transaction: Transaction,
) {
  await notify(
    {
      kind: 'ncr-opened',
      permission: 'nonconformance.read',
      title: `${ncr.number} opened: ${subject}`,
      link: `/nonconformances/${ncr.id}`,
      entity: { type: 'nonconformance', id: ncr.id },
      users: buyers.users,
      roles: ['quality', ...(buyers.roles ?? [])],
      actorId: actor.id,
    },
    transaction,
  );
}
