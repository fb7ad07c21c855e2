// Sign-in, and the throttle that guards every password check against guessing. Refused tries are
// counted in PostgreSQL (so the limits hold across restarts and server processes) for the whole
// site, for the account and for the client's address; at a limit the answer is 429 at once, with
// no password hash compared. A try counts from the moment it starts, so a burst of parallel
// requests cannot slip past the count; a successful one is taken off again.
import bcrypt from 'bcryptjs';
import { ipKeyGenerator } from 'express-rate-limit';
import { QueryTypes } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { User } from '../../db/models';
import { actorFromUser, recordAudit, type AuditActor } from '../audit/record';
import { AppError, unauthorized } from '../http/errors';
import { endSession, startSession } from './sessions';
import { claimsOf } from './tokens';

type Scope = 'site' | 'account' | 'address';
type Limit = { scope: Scope; limit: number; windowSeconds: number; message: string };

/** At most this many refused sign-ins per window: the site-wide limit keeps a spread-out attack
 * (many addresses, many accounts) from costing a hash compare each; the address limit keeps one
 * client from using up the site's budget alone. */
export const SIGN_IN_LIMITS: readonly Limit[] = [
  { scope: 'site', limit: 30, windowSeconds: 60, message: 'Too many refused sign-ins on this site in the last minute.' },
  { scope: 'account', limit: 10, windowSeconds: 15 * 60, message: 'Too many refused sign-ins for this account.' },
  { scope: 'address', limit: 20, windowSeconds: 15 * 60, message: 'Too many refused sign-ins from your network address.' },
];
const LONGEST_WINDOW = Math.max(...SIGN_IN_LIMITS.map((l) => l.windowSeconds));

// Compared against when the e-mail is unknown, so that a wrong e-mail and a wrong password take
// the same time and get the same answer.
const DECOY_HASH = bcrypt.hashSync('decoy-password-never-used', 10);

const scopeKey = (scope: Scope, email: string, address: string) =>
  scope === 'site' ? 'site' : scope === 'account' ? `account:${email}` : `address:${address}`;

function waitText(seconds: number) {
  return seconds < 90 ? `${seconds} seconds` : `${Math.ceil(seconds / 60)} minutes`;
}

/** Counts the try in, or refuses it with 429 when a limit is reached. Answers the id of the try's
 * row, which stays as a refusal unless the password proves right. */
async function reserveTry(email: string, actor: AuditActor): Promise<string> {
  const address = ipKeyGenerator(actor.address ?? 'unknown');
  // The refusal is thrown after the commit, so that its audit entry stays.
  const outcome = await inTransaction(async (transaction): Promise<{ tryId: string } | { refusal: AppError }> => {
    // One try at a time counts and records, so the counts are exact; the lock is held for two
    // short statements, never across a hash compare.
    await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext('phaselot:sign-in-throttle'))`, { transaction });
    await sequelize.query(`DELETE FROM refused_sign_ins WHERE created_at < now() - make_interval(secs => :longest)`, {
      transaction,
      replacements: { longest: LONGEST_WINDOW },
    });
    for (const { scope, limit, windowSeconds, message } of SIGN_IN_LIMITS) {
      const condition = scope === 'site' ? 'true' : scope === 'account' ? 'email = :email' : 'address = :address';
      // The limit-th newest refusal in the window: once it leaves the window, a try is possible again.
      const [blocking] = await sequelize.query<{ waitSeconds: string }>(
        `SELECT ceil(extract(epoch FROM created_at + make_interval(secs => :windowSeconds) - now()))::int AS "waitSeconds"
         FROM refused_sign_ins WHERE ${condition} AND created_at > now() - make_interval(secs => :windowSeconds)
         ORDER BY created_at DESC, id DESC OFFSET :offset LIMIT 1`,
        { type: QueryTypes.SELECT, transaction, replacements: { email, address, windowSeconds, offset: limit - 1 } },
      );
      if (!blocking) continue;
      const waitSeconds = Math.max(1, Number(blocking.waitSeconds));
      const key = scopeKey(scope, email, address);
      // Recorded once per window and scope, not once per refused request: the trail must not
      // become the cost an attack imposes.
      const [noted] = await sequelize.query(
        `SELECT 1 FROM audit_events WHERE entity_type = 'sign-in-throttle' AND entity_id = :key AND occurred_at > now() - make_interval(secs => :windowSeconds) LIMIT 1`,
        { type: QueryTypes.SELECT, transaction, replacements: { key, windowSeconds } },
      );
      if (!noted) {
        await recordAudit(
          { ...actor, email },
          { action: 'auth.sign-in-throttled', entityType: 'sign-in-throttle', entityId: key, after: { scope, limit, windowSeconds, waitSeconds } },
          transaction,
        );
      }
      return {
        refusal: new AppError(429, 'too_many_attempts', `${message} Try again in ${waitText(waitSeconds)}.`, { scope, retryAfterSeconds: waitSeconds }),
      };
    }
    const [row] = await sequelize.query<{ id: string }>(`INSERT INTO refused_sign_ins (email, address) VALUES (:email, :address) RETURNING id`, {
      type: QueryTypes.SELECT,
      transaction,
      replacements: { email, address },
    });
    return { tryId: row.id };
  });
  if ('refusal' in outcome) throw outcome.refusal;
  return outcome.tryId;
}

/** The active user whose e-mail and password these are, or null; throttled as above. */
export async function checkPassword(email: string, password: string, actor: AuditActor): Promise<User | null> {
  const tryId = await reserveTry(email, actor);
  const user = await User.findOne({ where: { email } });
  const matches = await bcrypt.compare(password, user?.passwordHash ?? DECOY_HASH);
  if (!user || !matches || !user.active) return null;
  await sequelize.query('DELETE FROM refused_sign_ins WHERE id = :tryId', { replacements: { tryId } });
  return user;
}

/** Signs a user in: a new server-side session and its token, or 401 (429 when throttled). */
export async function signIn(email: string, password: string, caller: Pick<AuditActor, 'requestId' | 'address'>) {
  // Only where the request came from: a caller may pass a whole (anonymous) actor, whose empty
  // e-mail must not overwrite the user's own in the audit entry.
  const request = { requestId: caller.requestId, address: caller.address };
  const user = await checkPassword(email, password, { id: null, email, roles: [], ...request });
  if (!user) {
    await recordAudit({ id: null, email, roles: [], ...request }, { action: 'auth.sign-in-refused', entityType: 'session' });
    throw unauthorized('Wrong e-mail or password');
  }
  return inTransaction(async (transaction) => {
    user.lastSignInAt = new Date();
    await user.save({ transaction });
    const token = await startSession(user, transaction);
    await recordAudit({ ...actorFromUser(user), ...request }, { action: 'auth.sign-in', entityType: 'session', entityId: user.id }, transaction);
    return { user, token };
  });
}

/** Ends the session a token belongs to, if it is still open. */
export async function signOut(token: string, request: Pick<AuditActor, 'requestId' | 'address'>) {
  const claims = claimsOf(token);
  if (!claims) return;
  await inTransaction(async (transaction) => {
    const user = await User.findByPk(claims.userId, { transaction });
    if (!user || !(await endSession(claims.sessionId, 'sign-out', transaction))) return;
    await recordAudit({ ...actorFromUser(user), ...request }, { action: 'auth.sign-out', entityType: 'session', entityId: user.id }, transaction);
  });
}
