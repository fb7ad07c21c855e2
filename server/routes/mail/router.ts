import { Router } from 'express';
import { config } from '../../config';
import { allow, authenticate } from '../../auth/authenticate';
import { readCaughtMail } from '../../mail/caughtMail';

export const mailRouter = Router();

/** What the local mail catcher received (empty when mail goes to a real relay). */
mailRouter.get('/caught', authenticate, allow('mail.read'), async (_req, res) => {
  const messages = config.MAIL_CATCHER_DIR ? await readCaughtMail(config.MAIL_CATCHER_DIR) : [];
  res.json({ data: messages, total: messages.length, catcherEnabled: Boolean(config.MAIL_CATCHER_DIR) });
});
