// Server-side sessions: every token carries the id of a session row (its `jti`), and a request is
// signed in only while that row is open. Sign-out ends one session; a password change ends the
// others; a password reset and a deactivation end them all, at once.
import { randomBytes } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { asSequelizeError, sequelize } from '../../db';
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

/** The user's columns under their attribute names, so that a row builds the model as it is. */
const USER_COLUMNS = Object.entries(User.getAttributes())
  .map(([attribute, definition]) => `u.${definition.field ?? attribute} AS "${attribute}"`)
  .join(', ');

/** Run on every signed-in request, so prepared once per connection: PostgreSQL plans it once. */
const SESSION_STATEMENT = {
  name: 'phaselot-session-of-token',
  text: `SELECT ${USER_COLUMNS}, pg_current_snapshot()::text AS "databaseSnapshot" FROM sessions s JOIN users u ON u.id = s.user_id
          WHERE s.id = $1 AND s.ended_at IS NULL AND s.expires_at > $2`,
};

type PgConnection = { query(statement: typeof SESSION_STATEMENT & { values: unknown[] }): Promise<{ rows: Record<string, unknown>[] }> };

/**
 * The active user and open session a token belongs to, or null; with the database's snapshot as this
 * statement saw it, which answers kept while nothing changed are keyed by (http/unchangedAnswers),
 * read here so that a signed-in request needs no statement of its own for it.
 */
export async function sessionOfToken(token: string): Promise<{ user: User; sessionId: string; databaseSnapshot: string } | null> {
  const claims = claimsOf(token);
  if (!claims) return null;
  // A connection of the pool, asked directly: Sequelize has no named (prepared) statements, and
  // building this through it cost more than the database took to answer.
  const connection = (await sequelize.connectionManager.getConnection({ type: 'read' })) as PgConnection;
  let row: Record<string, unknown> | undefined;
  try {
    [row] = (await connection.query({ ...SESSION_STATEMENT, values: [claims.sessionId, new Date()] })).rows;
  } catch (error) {
    throw asSequelizeError(error);
  } finally {
    sequelize.connectionManager.releaseConnection(connection as never);
  }
  if (!row) return null;
  const { databaseSnapshot, ...attributes } = row;
  const user = User.build(attributes as never, { isNewRecord: false, raw: true });
  if (user.id !== claims.userId || !user.active) return null;
  return { user, sessionId: claims.sessionId, databaseSnapshot: String(databaseSnapshot) };
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
