import { Router } from 'express';
import { loginSchema, passwordChangeSchema, passwordResetRequestSchema, passwordResetSchema } from '../../../shared/schemas/auth';
import { allow, authenticate, tokenOf } from '../../auth/authenticate';
import { changePassword, requestPasswordReset, resetPassword } from '../../auth/passwords';
import { signIn, signOut } from '../../auth/signIn';
import { SESSION_COOKIE, sessionCookieOptions } from '../../auth/tokens';
import { validated } from '../../http/validate';
import { actorOf } from '../../audit/record';
import { presentSessionUser } from '../../users/views';

export const authRouter = Router();

authRouter.post(
  '/login',
  validated({ body: loginSchema }, async ({ body }, req, res) => {
    const { user, token } = await signIn(body.email, body.password, actorOf(req));
    res.cookie(SESSION_COOKIE, token, sessionCookieOptions);
    res.json({ token, user: presentSessionUser(user) });
  }),
);

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

authRouter.post(
  '/password',
  authenticate,
  allow('account.password'),
  validated({ body: passwordChangeSchema }, async ({ body }, req, res) => {
    await changePassword(req.user!, req.sessionId!, body, actorOf(req));
    res.status(204).end();
  }),
);

/** Always the same answer, whether or not the address has an account. */
authRouter.post(
  '/password-reset/request',
  validated({ body: passwordResetRequestSchema }, async ({ body }, req, res) => {
    await requestPasswordReset(body.email, actorOf(req));
    res.status(202).json({ message: 'If the address belongs to an active account, a link to choose a new password is on its way. It is valid for one hour.' });
  }),
);

authRouter.post(
  '/password-reset',
  validated({ body: passwordResetSchema }, async ({ body }, req, res) => {
    await resetPassword(body.token, body.newPassword, actorOf(req));
    res.status(204).end();
  }),
);
