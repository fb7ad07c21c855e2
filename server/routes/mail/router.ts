import { Router } from 'express';
import { config } from '../../config';
import { allow, authenticate } from '../../auth/authenticate';
import { readCaughtMail } from '../../mail/caughtMail';
import { recentOutboxMail } from '../../mail/outbox';
import { presentOutboxMail } from './presenter';

export const mailRouter = Router();

/** What the local mail catcher received (empty when mail goes to a real relay). */
mailRouter.get('/caught', authenticate, allow('mail.read'), async (_req, res) => {
  const messages = config.MAIL_CATCHER_DIR ? await readCaughtMail(config.MAIL_CATCHER_DIR) : [];
  res.json({ data: messages, total: messages.length, catcherEnabled: Boolean(config.MAIL_CATCHER_DIR) });
});

/** Phaselot's own record of the mail it queued: delivered, or waiting for its next try. */
mailRouter.get('/outbox', authenticate, allow('mail.read'), async (_req, res) => {
  const rows = await recentOutboxMail();
  res.json({ data: rows.map(presentOutboxMail), total: rows.length });
});
