// Queueing and delivering mail. queueMail runs inside the caller's transaction: the outbox row, its
// attachments in the file store and a delivery job land together or not at all. The job (any
// server process) sends the message under the row's lock; SKIP LOCKED and the row's status make
// the row the idempotency key, so two processes never send it twice. The queue retries a failed
// send quickly; past that, a scheduled sweep sends whatever is due, backing off to half an hour.
import { Op, type Transaction, type WhereOptions } from 'sequelize';
import type { Transporter } from 'nodemailer';
import { sequelize } from '../../db';
import { OutboxMail, type OutboxAttachment } from '../../db/models';
import { config } from '../config';
import { enqueue, QUEUES, type JobDefinition } from '../jobs/queue';
import { logger } from '../logger';
import { readBlob, storeBlob } from '../storage/blobs';
import { mailTransport } from './transport';

export type MailDraft = {
  to: string[];
  subject: string;
  text: string;
  attachments?: { filename: string; contentType: string; content: Buffer }[];
  related?: { type: string; id: string | number };
};

type MailJobData = { outboxId: number };

export async function queueMail(draft: MailDraft, transaction: Transaction) {
  const attachments: OutboxAttachment[] = [];
  for (const a of draft.attachments ?? []) {
    attachments.push({ filename: a.filename, contentType: a.contentType, storageKey: await storeBlob(a.content, transaction) });
  }
  const mail = await OutboxMail.create(
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
  const data: MailJobData = { outboxId: mail.id };
  await enqueue(QUEUES.mailDeliver, data, transaction);
  return mail;
}

const BASE_DELAY_MS = 5_000;
const MAX_DELAY_MS = 30 * 60_000;

/** Delay before the next try after `attempts` failures: 5 s, 10 s, 20 s … capped at 30 min. */
export const retryDelayMs = (attempts: number) => Math.min(MAX_DELAY_MS, BASE_DELAY_MS * 2 ** Math.max(0, attempts - 1));

type Outcome = 'sent' | 'failed' | 'none';

/** Sends the first queued message matching `where` that no other process holds, and records the try. */
async function deliverOne(transport: Transporter, where: WhereOptions<OutboxMail>): Promise<Outcome> {
  return sequelize.transaction(async (transaction) => {
    const mail = await OutboxMail.findOne({
      where: { ...where, status: 'queued' },
      order: [
        ['nextAttemptAt', 'ASC'],
        ['id', 'ASC'],
      ],
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
        attachments: await Promise.all(
          mail.attachments.map(async (a) => ({ filename: a.filename, contentType: a.contentType, content: await readBlob(a.storageKey) })),
        ),
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

/** Sends one message now unless it is sent already or another process is sending it. */
export const deliverOutboxMail = (id: number, transport: Transporter = mailTransport) => deliverOne(transport, { id });

/** Sends every message that is due now; returns how many were sent and how many failed. */
export async function deliverDueMail(transport: Transporter = mailTransport) {
  const tally = { sent: 0, failed: 0 };
  for (;;) {
    const outcome = await deliverOne(transport, { nextAttemptAt: { [Op.lte]: new Date() } });
    if (outcome === 'none') return tally;
    tally[outcome] += 1;
  }
}

const deliverJob: JobDefinition<MailJobData> = {
  queue: QUEUES.mailDeliver,
  batchSize: 25,
  async run({ outboxId }) {
    if ((await deliverOutboxMail(outboxId)) === 'failed') throw new Error(`Mail ${outboxId} was not accepted by the relay`);
  },
};

const sweepJob: JobDefinition = {
  queue: QUEUES.mailSweep,
  schedule: '*/5 * * * *',
  async run() {
    await deliverDueMail();
  },
};

export const mailJobs = [deliverJob, sweepJob];

/** The latest 200 queued messages, newest first, without their bodies and attachments. */
export const recentOutboxMail = () => OutboxMail.findAll({ order: [['id', 'DESC']], limit: 200, attributes: { exclude: ['attachments', 'bodyText'] } });
export type OutboxMailRecord = Awaited<ReturnType<typeof recentOutboxMail>>[number];
