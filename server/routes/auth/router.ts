import { Router } from 'express';
import {
  loginSchema,
  passwordChangeSchema,
  passwordResetRequestSchema,
  passwordResetSchema,
  type LoginInput,
  type PasswordChangeInput,
  type PasswordResetInput,
  type PasswordResetRequestInput,
} from '../../../shared/schemas/auth';
import { allow, authenticate, tokenOf } from '../../auth/authenticate';
import { changePassword, requestPasswordReset, resetPassword } from '../../auth/passwords';
import { signIn, signOut } from '../../auth/signIn';
import { SESSION_COOKIE, sessionCookieOptions } from '../../auth/tokens';
import { validate } from '../../http/validate';
import { actorOf } from '../../audit/record';
import { presentSessionUser } from '../users/presenter';

export const authRouter = Router();

authRouter.post('/login', validate({ body: loginSchema }), async (req, res) => {
  const { email, password } = req.valid.body as LoginInput;
  const { user, token } = await signIn(email, password, actorOf(req));
  res.cookie(SESSION_COOKIE, token, sessionCookieOptions);
  res.json({ token, user: presentSessionUser(user) });
});

/** Ends the session of the token or cookie sent (if it is still open) and clears the cookie. */
authRouter.post('/logout', async (req, res) => {
  const token = tokenOf(req);
  if (token) await signOut(token, actorOf(req));
  res.clearCookie(SESSION_COOKIE, { ...sessionCookieOptions, maxAge: undefined });
  res.status(204).end();
});

authRouter.get('/me', authenticate, (req, res) => {
  res.json({ user: presentSessionUser(req.user!) });
});

authRouter.post('/password', authenticate, allow('account.password'), validate({ body: passwordChangeSchema }), async (req, res) => {
  await changePassword(req.user!, req.sessionId!, req.valid.body as PasswordChangeInput, actorOf(req));
  res.status(204).end();
});

/** Always the same answer, whether or not the address has an account. */
authRouter.post('/password-reset/request', validate({ body: passwordResetRequestSchema }), async (req, res) => {
  await requestPasswordReset((req.valid.body as PasswordResetRequestInput).email, actorOf(req));
  res.status(202).json({ message: 'If the address belongs to an active account, a link to choose a new password is on its way. It is valid for one hour.' });
});

authRouter.post('/password-reset', validate({ body: passwordResetSchema }), async (req, res) => {
  const { token, newPassword } = req.valid.body as PasswordResetInput;
  await resetPassword(token, newPassword, actorOf(req));
  res.status(204).end();
});
