// Server-side sessions: every token carries the id of a session row (its `jti`), and a request is
// signed in only while that row is open. Sign-out ends one session; a password change ends the
// others; a password reset and a deactivation end them all, at once.
import { randomBytes } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { sequelize } from '../../db';
import { Session, User, type SessionEndReason } from '../../db/models';
import { config } from '../config';
import { claimsOf, issueToken } from './tokens';

/** Opens a session for the user and answers its signed token. */
export async function startSession(user: User, transaction: Transaction): Promise<string> {
  const id = randomBytes(32).toString('base64url');
  const expiresAt = new Date(Date.now() + config.TOKEN_TTL_HOURS * 3600 * 1000);
  // The user's expired sessions are of no further use; the audit trail keeps the sign-ins.
  await Session.destroy({ where: { userId: user.id, expiresAt: { [Op.lt]: new Date() } }, transaction });
  await Session.create({ id, userId: user.id, expiresAt }, { transaction });
  return issueToken(user.id, id, expiresAt);
}

/**
 * The active user and open session a token belongs to, or null; with the database's snapshot as this
 * statement saw it, which answers kept while nothing changed are keyed by (http/unchangedAnswers),
 * read here so that a signed-in request needs no statement of its own for it.
 */
export async function sessionOfToken(token: string): Promise<{ user: User; sessionId: string; databaseSnapshot: string } | null> {
  const claims = claimsOf(token);
  if (!claims) return null;
  // One plain statement, run on every request: building it through the model's include cost more
  // than the database took to answer it.
  const [user] = await sequelize.query<User>(
    `SELECT u.*, pg_current_snapshot()::text AS "databaseSnapshot" FROM sessions s JOIN users u ON u.id = s.user_id
      WHERE s.id = :sessionId AND s.ended_at IS NULL AND s.expires_at > :now`,
    { model: User, mapToModel: true, replacements: { sessionId: claims.sessionId, now: new Date() } },
  );
  if (!user || user.id !== claims.userId || !user.active) return null;
  // Not an attribute of the user: taken out, so that nothing reading the user sees it.
  const values = user.dataValues as Record<string, unknown>;
  const databaseSnapshot = String(values.databaseSnapshot);
  delete values.databaseSnapshot;
  return { user, sessionId: claims.sessionId, databaseSnapshot };
}

/** Ends one session; answers whether it was open. */
export async function endSession(sessionId: string, reason: SessionEndReason, transaction?: Transaction): Promise<boolean> {
  const [ended] = await Session.update({ endedAt: new Date(), endReason: reason }, { where: { id: sessionId, endedAt: { [Op.is]: null } }, transaction });
  return ended > 0;
}

/** Ends every open session of a user (but `keep`, when given); answers how many it ended. */
export async function endSessionsOf(userId: number, reason: SessionEndReason, transaction: Transaction, keep?: string): Promise<number> {
  const [ended] = await Session.update(
    { endedAt: new Date(), endReason: reason },
    { where: { userId, endedAt: { [Op.is]: null }, ...(keep ? { id: { [Op.ne]: keep } } : {}) }, transaction },
  );
  return ended;
}
