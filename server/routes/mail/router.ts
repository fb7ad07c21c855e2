import { Router } from 'express';
import { OutboxMail } from '../../../db/models';
import { config } from '../../config';
import { allow, authenticate } from '../../auth/authenticate';
import { readCaughtMail } from '../../mail/caughtMail';

export const mailRouter = Router();

/** What the local mail catcher received (empty when mail goes to a real relay). */
mailRouter.get('/caught', authenticate, allow('mail.read'), async (_req, res) => {
  const messages = config.MAIL_CATCHER_DIR ? await readCaughtMail(config.MAIL_CATCHER_DIR) : [];
  res.json({ data: messages, total: messages.length, catcherEnabled: Boolean(config.MAIL_CATCHER_DIR) });
});

/** Phaselot's own record of the mail it queued: delivered, or waiting for its next try. */
mailRouter.get('/outbox', authenticate, allow('mail.read'), async (_req, res) => {
  const rows = await OutboxMail.findAll({ order: [['id', 'DESC']], limit: 200, attributes: { exclude: ['attachments', 'bodyText'] } });
  res.json({
    data: rows.map((m) => ({
      id: m.id,
      recipients: m.recipients,
      subject: m.subject,
      status: m.status,
      attempts: m.attempts,
      nextAttemptAt: m.status === 'queued' ? m.nextAttemptAt.toISOString() : null,
      lastError: m.lastError,
      sentAt: m.sentAt?.toISOString() ?? null,
      createdAt: m.createdAt.toISOString(),
      related: m.relatedType ? { type: m.relatedType, id: m.relatedId } : null,
    })),
    total: rows.length,
  });
});
