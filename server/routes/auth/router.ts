import { Router } from 'express';
import bcrypt from 'bcryptjs';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { User } from '../../../db/models';
import { loginSchema, type LoginInput } from '../../../shared/schemas/auth';
import { authenticate } from '../../auth/authenticate';
import { issueToken, SESSION_COOKIE, sessionCookieOptions } from '../../auth/tokens';
import { AppError, unauthorized } from '../../http/errors';
import { validate } from '../../http/validate';
import { actorOf, recordAudit } from '../../audit/record';
import { presentSessionUser } from '../users/presenter';

// A hash of a random password, compared against when the e-mail is unknown, so that a wrong
// e-mail and a wrong password take the same time and get the same answer.
const DECOY_HASH = bcrypt.hashSync('decoy-password-never-used', 10);

/** Ten failed sign-ins for one address from one client within 15 minutes lock it out for the rest
 * of the window; successful sign-ins do not count. */
const loginLimiter = rateLimit({
  windowMs: 15 * 60 * 1000,
  limit: 10,
  skipSuccessfulRequests: true,
  standardHeaders: 'draft-8',
  legacyHeaders: false,
  keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '').trim().toLowerCase()}`,
  handler: (_req, _res, next) => next(new AppError(429, 'too_many_attempts', 'Too many failed sign-ins. Wait 15 minutes and try again.')),
});

export const authRouter = Router();

authRouter.post('/login', loginLimiter, validate({ body: loginSchema }), async (req, res) => {
  const { email, password } = req.valid.body as LoginInput;
  const user = await User.findOne({ where: { email } });
  const passwordMatches = await bcrypt.compare(password, user?.passwordHash ?? DECOY_HASH);
  if (!user || !passwordMatches || !user.active) {
    await recordAudit({ ...actorOf(req), email }, { action: 'auth.sign-in-refused', entityType: 'session', entityId: user?.id });
    throw unauthorized('Wrong e-mail or password');
  }
  user.lastSignInAt = new Date();
  await user.save();
  await recordAudit(actorOf(req, user), { action: 'auth.sign-in', entityType: 'session', entityId: user.id });
  const token = issueToken(user.id);
  res.cookie(SESSION_COOKIE, token, sessionCookieOptions);
  res.json({ token, user: presentSessionUser(user) });
});

authRouter.post('/logout', (_req, res) => {
  res.clearCookie(SESSION_COOKIE, { ...sessionCookieOptions, maxAge: undefined });
  res.status(204).end();
});

authRouter.get('/me', authenticate, (req, res) => {
  res.json({ user: presentSessionUser(req.user!) });
});
