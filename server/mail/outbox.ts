// Queueing and delivering mail. queueMail runs inside the caller's transaction; the worker sends
// due messages one at a time under a row lock (SKIP LOCKED lets two workers share the queue without
// sending a message twice) and backs off exponentially when the relay fails.
import { Op, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { OutboxMail, type OutboxAttachment } from '../../db/models';
import { config } from '../config';
import { logger } from '../logger';
import type { Transporter } from 'nodemailer';
import { mailTransport } from './transport';

export type MailDraft = {
  to: string[];
  subject: string;
  text: string;
  attachments?: { filename: string; contentType: string; content: Buffer }[];
  related?: { type: string; id: string | number };
};

export function queueMail(draft: MailDraft, transaction: Transaction) {
  const attachments: OutboxAttachment[] = (draft.attachments ?? []).map((a) => ({
    filename: a.filename,
    contentType: a.contentType,
    contentBase64: a.content.toString('base64'),
  }));
  return OutboxMail.create(
    {
      recipients: draft.to,
      subject: draft.subject,
      bodyText: draft.text,
      attachments,
      relatedType: draft.related?.type ?? null,
      relatedId: draft.related ? String(draft.related.id) : null,
    },
    { transaction },
  );
}

const BASE_DELAY_MS = 5_000;
const MAX_DELAY_MS = 30 * 60_000;

/** Delay before the next try after `attempts` failures: 5 s, 10 s, 20 s … capped at 30 min. */
export const retryDelayMs = (attempts: number) => Math.min(MAX_DELAY_MS, BASE_DELAY_MS * 2 ** Math.max(0, attempts - 1));

async function deliverOne(transport: Transporter): Promise<'sent' | 'failed' | 'none'> {
  return sequelize.transaction(async (transaction) => {
    const mail = await OutboxMail.findOne({
      where: { status: 'queued', nextAttemptAt: { [Op.lte]: new Date() } },
      order: [['nextAttemptAt', 'ASC'], ['id', 'ASC']],
      lock: transaction.LOCK.UPDATE,
      skipLocked: true,
      transaction,
    });
    if (!mail) return 'none';
    try {
      await transport.sendMail({
        from: config.MAIL_FROM,
        to: mail.recipients,
        subject: mail.subject,
        text: mail.bodyText,
        // A stable Message-ID lets a receiving server drop a duplicate should a crash land between
        // the relay's acceptance and our commit.
        messageId: `<outbox-${mail.id}@phaselot.local>`,
        attachments: mail.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.contentBase64, 'base64') })),
      });
      mail.status = 'sent';
      mail.sentAt = new Date();
      mail.attempts += 1;
      mail.lastError = null;
      await mail.save({ transaction });
      return 'sent';
    } catch (error) {
      mail.attempts += 1;
      mail.lastError = error instanceof Error ? error.message : String(error);
      mail.nextAttemptAt = new Date(Date.now() + retryDelayMs(mail.attempts));
      await mail.save({ transaction });
      logger.warn({ mailId: mail.id, attempts: mail.attempts, error: mail.lastError }, 'mail delivery failed; will retry');
      return 'failed';
    }
  });
}

/** Sends every message that is due now; returns how many were sent and how many failed. */
export async function deliverDueMail(transport: Transporter = mailTransport) {
  const tally = { sent: 0, failed: 0 };
  for (;;) {
    const outcome = await deliverOne(transport);
    if (outcome === 'none') return tally;
    tally[outcome] += 1;
  }
}

export function startOutboxWorker(intervalMs = 3_000) {
  let running = false;
  const timer = setInterval(async () => {
    if (running) return;
    running = true;
    try {
      await deliverDueMail();
    } catch (error) {
      logger.error({ err: error }, 'outbox worker pass failed');
    } finally {
      running = false;
    }
  }, intervalMs);
  return { stop: () => clearInterval(timer) };
}
