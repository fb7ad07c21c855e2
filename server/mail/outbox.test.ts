import { describe, expect, it } from 'vitest';
import nodemailer from 'nodemailer';
import { mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inTransaction } from '../../db';
import { OutboxMail } from '../../db/models';
import { as } from '../../tests/helpers/api';
import { startMailCatcher } from './catcher';
import { readCaughtMail } from './caughtMail';
import { deliverDueMail, deliverOutboxMail, queueMail, retryDelayMs } from './outbox';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';

describe('mail outbox', () => {
  it('keeps a message while the relay is down and delivers it exactly once when it is back', async () => {
    // A port that was free a moment ago stands for the relay that is down.
    const dir = mkdtempSync(join(tmpdir(), 'phaselot-catcher-'));
    const probe = await startMailCatcher({ port: 0, dir });
    await probe.close();
    const PORT = probe.port;
    const relay = nodemailer.createTransport(`smtp://127.0.0.1:${PORT}`);
    const queued = await inTransaction((t) =>
      queueMail(
        {
          to: ['buyer@phaselot.test'],
          subject: 'Lot held back',
          text: 'Retardance error +0.0042 λ exceeds ±0.003 λ',
          attachments: [{ filename: 'report.pdf', contentType: 'application/pdf', content: Buffer.from('%PDF-1.4 test') }],
          related: { type: 'lot', id: 42 },
        },
        t,
      ),
    );

    // Nobody listens on the port yet: the try fails and is scheduled again.
    const down = await deliverDueMail(relay);
    expect(down.failed).toBeGreaterThanOrEqual(1);
    await queued.reload();
    expect(queued).toMatchObject({ status: 'queued', attempts: 1 });
    expect(queued.lastError).toMatch(/ECONNREFUSED/);
    expect(queued.nextAttemptAt.getTime()).toBeGreaterThan(Date.now());

    const catcher = await startMailCatcher({ port: PORT, dir });
    try {
      await deliverDueMail(relay); // not due yet: nothing sent
      expect(readdirSync(dir)).toHaveLength(0);
      await OutboxMail.update({ nextAttemptAt: new Date(Date.now() - 1000) }, { where: { id: queued.id } });
      await deliverDueMail(relay);
      await deliverDueMail(relay); // a second pass must not send it again
      const caught = await readCaughtMail(dir);
      const ours = caught.filter((m) => m.subject === 'Lot held back');
      expect(ours).toHaveLength(1);
      expect(ours[0].attachments).toEqual([{ filename: 'report.pdf', contentType: 'application/pdf', size: 13 }]);
      await queued.reload();
      expect(queued).toMatchObject({ status: 'sent', attempts: 2, lastError: null });
    } finally {
      await catcher.close();
    }

    const outbox = await (await as('admin')).get('/api/mail/outbox').expect(200);
    expect(outbox.body.data.find((m: { id: number }) => m.id === queued.id)).toMatchObject({ status: 'sent', attempts: 2, related: { type: 'lot', id: '42' } });
  });

  it('sends a message once when two workers take it at the same moment, and queues its delivery job with it', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'phaselot-catcher-'));
    const catcher = await startMailCatcher({ port: 0, dir });
    try {
      const relay = nodemailer.createTransport(`smtp://127.0.0.1:${catcher.port}`);
      const mail = await inTransaction((t) => queueMail({ to: ['buyer@phaselot.test'], subject: 'Raced for', text: 'Once only.' }, t));
      // The delivery job was queued in the same transaction, for the queue's workers.
      const jobs = await sequelize.query<{ state: string }>("SELECT state FROM pgboss.job WHERE name = 'mail-deliver' AND data->>'outboxId' = :id", {
        type: QueryTypes.SELECT,
        replacements: { id: String(mail.id) },
      });
      expect(jobs).toHaveLength(1);

      const outcomes = await Promise.all([deliverOutboxMail(mail.id, relay), deliverOutboxMail(mail.id, relay), deliverDueMail(relay)]);
      expect(outcomes.slice(0, 2).filter((o) => o === 'sent').length + outcomes[2].sent).toBe(1);
      expect((await readCaughtMail(dir)).filter((m) => m.subject === 'Raced for')).toHaveLength(1);
      await mail.reload();
      expect(mail).toMatchObject({ status: 'sent', attempts: 1 });
      // A later run of the job (a retry) finds it sent and sends nothing.
      expect(await deliverOutboxMail(mail.id, relay)).toBe('none');
    } finally {
      await catcher.close();
    }
  });

  it('queues no delivery job for a message whose transaction rolls back', async () => {
    const subject = `Never sent ${Math.random()}`;
    await expect(
      inTransaction(async (t) => {
        await queueMail({ to: ['buyer@phaselot.test'], subject, text: 'Rolled back.' }, t);
        throw new Error('the event failed');
      }),
    ).rejects.toThrow('the event failed');
    expect(await OutboxMail.count({ where: { subject } })).toBe(0);
    const [{ orphans }] = await sequelize.query<{ orphans: string }>(
      "SELECT count(*) AS orphans FROM pgboss.job j WHERE j.name = 'mail-deliver' AND NOT EXISTS (SELECT 1 FROM mail_outbox m WHERE m.id = (j.data->>'outboxId')::int)",
      { type: QueryTypes.SELECT },
    );
    expect(Number(orphans)).toBe(0);
  });

  it('backs off exponentially up to half an hour', () => {
    // Doubling from 5 s is the design choice of the worker (common practice for retry queues).
    expect([1, 2, 3, 4].map(retryDelayMs)).toEqual([5_000, 10_000, 20_000, 40_000]);
    expect(retryDelayMs(30)).toBe(30 * 60_000);
  });
});
