// Reminders of overdue corrective-action requests (a scheduled job, run by whichever server process
// takes it): a request still awaiting the supplier's answer after its due date is reminded once a
// week. With a live link the supplier's quality contact gets it again (the token is signed anew from
// its row) and the requester a copy; once the link has expired, the requester is asked to send a new
// one. Each reminder is claimed under the request's row lock (SKIP LOCKED) and stamped in the same
// transaction as its mail, so a job run twice sends it once.
import { Op, QueryTypes } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { CorrectiveAction, CorrectiveActionLink, User } from '../../db/models';
import { recordAudit, SYSTEM_ACTOR } from '../audit/record';
import { config } from '../config';
import { sweepRateLimits } from '../http/rateLimit';
import { QUEUES, type JobDefinition } from '../jobs/queue';
import { queueMail } from '../mail/outbox';
import { responseUrl, tokenOf } from './responseLinks';
import { plural } from '../../shared/format';

export const REMIND_EVERY_DAYS = 7;

/** Sends the reminders due now; answers the numbers of the requests reminded. */
export async function remindOverdueRequests(): Promise<string[]> {
  const due = await sequelize.query<{ id: number }>(
    `SELECT id FROM corrective_actions
      WHERE status = 'awaiting-response' AND response_due_on < (now() AT TIME ZONE 'UTC')::date
        AND (last_reminded_at IS NULL OR last_reminded_at < now() - make_interval(days => :every))
      ORDER BY response_due_on, id`,
    { type: QueryTypes.SELECT, replacements: { every: REMIND_EVERY_DAYS } },
  );
  const reminded: string[] = [];
  for (const { id } of due) {
    const number = await inTransaction(async (transaction) => {
      const request = await CorrectiveAction.findOne({
        where: {
          id,
          status: 'awaiting-response',
          [Op.or]: [{ lastRemindedAt: { [Op.is]: null } }, { lastRemindedAt: { [Op.lt]: new Date(Date.now() - REMIND_EVERY_DAYS * 86_400_000) } }],
        },
        lock: transaction.LOCK.UPDATE,
        skipLocked: true,
        transaction,
      });
      if (!request) return null;
      const requester = await User.findByPk(request.requestedBy, { transaction, rejectOnEmpty: true });
      const link = await CorrectiveActionLink.findOne({
        where: { correctiveActionId: id, revokedAt: { [Op.is]: null }, submittedAt: { [Op.is]: null }, expiresAt: { [Op.gt]: new Date() } },
        transaction,
      });
      const days = Math.floor((Date.now() - Date.parse(`${request.responseDueOn}T23:59:59Z`)) / 86_400_000) + 1;
      const late = `${plural(days, 'day')} past its due date (${request.responseDueOn})`;
      if (link) {
        await queueMail(
          {
            to: [request.sentTo],
            subject: `Reminder: your answer to ${request.number} is overdue`,
            text: [
              `Our corrective-action request ${request.number} is ${late} and we have no answer yet.`,
              '',
              request.problem,
              '',
              `Please answer through this link (valid until ${link.expiresAt.toISOString().slice(0, 10)}, one answer):`,
              responseUrl(tokenOf(link)),
            ].join('\n'),
            related: { type: 'corrective-action', id },
          },
          transaction,
        );
      }
      await queueMail(
        {
          to: [requester.email],
          subject: `${request.number} is overdue${link ? ': the supplier was reminded' : ': its link has expired'}`,
          text: link
            ? `Corrective-action request ${request.number} is ${late}. ${request.sentTo} was reminded with the same link.\n\n${config.PUBLIC_URL}/corrective-actions/${id}`
            : `Corrective-action request ${request.number} is ${late}, and no link to answer it is live any more. Send the supplier a new link from the request's page:\n\n${config.PUBLIC_URL}/corrective-actions/${id}`,
          related: { type: 'corrective-action', id },
        },
        transaction,
      );
      request.lastRemindedAt = new Date();
      await request.save({ transaction });
      await recordAudit(
        SYSTEM_ACTOR,
        { action: 'corrective-action.remind', entityType: 'corrective-action', entityId: id, after: { overdueDays: days, supplierReminded: Boolean(link) } },
        transaction,
      );
      return request.number;
    });
    if (number) reminded.push(number);
  }
  return reminded;
}

export const correctiveReminderJob: JobDefinition = {
  queue: QUEUES.correctiveReminders,
  // Every morning, 06:30 UTC.
  schedule: '30 6 * * *',
  async run() {
    await remindOverdueRequests();
    await sweepRateLimits();
  },
};
