// Passwords: hashing, a user's own change, and reset through a one-time link mailed to the account's
// address (asked for on the sign-in page, or sent by an administrator). A link's token is random,
// kept only as its SHA-256, valid for an hour and once; using it ends every session of the account.
import bcrypt from 'bcryptjs';
import { createHash, randomBytes } from 'node:crypto';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { PasswordResetToken, User } from '../../db/models';
import type { PasswordChangeInput } from '../../shared/schemas/auth';
import { actorFromUser, recordAudit, type AuditActor } from '../audit/record';
import { config } from '../config';
import { AppError, notFound } from '../http/errors';
import { queueMail } from '../mail/outbox';
import { endSessionsOf } from './sessions';
import { checkPassword } from './signIn';

const BCRYPT_COST = 10;
export const RESET_LINK_MINUTES = 60;
/** More links than this per account and hour are not sent: the request form must not become a way
 * to flood someone's mailbox. */
const RESET_LINKS_PER_HOUR = 3;

type RequestInfo = Pick<AuditActor, 'requestId' | 'address'>;

export const hashPassword = (password: string) => bcrypt.hash(password, BCRYPT_COST);

const tokenHash = (token: string) => createHash('sha256').update(token).digest('hex');

const fieldError = (path: string, message: string) => new AppError(400, 'validation', 'Some fields are not valid', [{ path, message }]);

/** A signed-in user changes their own password: the current one is required (and throttled like a
 * sign-in); every other session of the account ends, this one stays. */
export async function changePassword(user: User, sessionId: string, input: PasswordChangeInput, request: RequestInfo) {
  const actor = { ...actorFromUser(user), ...request };
  const checked = await checkPassword(user.email, input.currentPassword, actor);
  if (checked?.id !== user.id) {
    await recordAudit(actor, { action: 'auth.password-change-refused', entityType: 'user', entityId: user.id });
    throw fieldError('currentPassword', 'This is not your current password');
  }
  return inTransaction(async (transaction) => {
    const locked = await User.findByPk(user.id, { transaction, lock: transaction.LOCK.UPDATE, rejectOnEmpty: true });
    locked.passwordHash = await hashPassword(input.newPassword);
    await locked.save({ transaction });
    const sessionsEnded = await endSessionsOf(user.id, 'password-changed', transaction, sessionId);
    await recordAudit(actor, { action: 'auth.password-change', entityType: 'user', entityId: user.id, after: { sessionsEnded } }, transaction);
  });
}

function resetUrl(token: string) {
  // In the fragment, not the query: a fragment is never sent to a server, so the token stays out
  // of access logs and Referer headers.
  return `${config.PUBLIC_URL.replace(/\/+$/, '')}/reset-password#token=${token}`;
}

/** Creates a link for the user and queues its mail, in the caller's transaction; answers false
 * (and sends nothing) when the account has had its share of links this hour. */
async function issueResetLink(user: User, requestedBy: AuditActor, transaction: Transaction): Promise<boolean> {
  const recent = await PasswordResetToken.count({ where: { userId: user.id, createdAt: { [Op.gt]: new Date(Date.now() - 3600_000) } }, transaction });
  if (recent >= RESET_LINKS_PER_HOUR) return false;
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(Date.now() + RESET_LINK_MINUTES * 60_000);
  const link = await PasswordResetToken.create({ userId: user.id, tokenHash: tokenHash(token), requestedBy: requestedBy.id, expiresAt }, { transaction });
  const byAdmin = requestedBy.id !== null && requestedBy.id !== user.id;
  await queueMail(
    {
      to: [user.email],
      subject: 'Phaselot: choose a new password',
      text: [
        `Hello ${user.name},`,
        '',
        byAdmin
          ? `An administrator (${requestedBy.email}) sent you a link to choose a new password for your Phaselot account ${user.email}.`
          : `Someone, probably you, asked to reset the password of your Phaselot account ${user.email}.`,
        '',
        `Open this link within ${RESET_LINK_MINUTES} minutes to choose a new password. It works once:`,
        resetUrl(token),
        '',
        'Choosing a new password signs the account out everywhere. If you did not ask for this, ignore this mail: your password stays as it is.',
      ].join('\n'),
      related: { type: 'user', id: user.id },
    },
    transaction,
  );
  await recordAudit(
    requestedBy,
    { action: 'auth.password-reset-link-sent', entityType: 'user', entityId: user.id, after: { linkId: link.id, expiresAt: expiresAt.toISOString() } },
    transaction,
  );
  return true;
}

/** The sign-in page's "forgot password": the answer never tells whether the address has an account,
 * so this answers nothing either way. */
export async function requestPasswordReset(email: string, request: RequestInfo): Promise<void> {
  await inTransaction(async (transaction) => {
    const user = await User.findOne({ where: { email }, transaction, lock: transaction.LOCK.UPDATE });
    if (!user?.active) return;
    await issueResetLink(user, { id: null, email, roles: [], ...request }, transaction);
  });
}

/** An administrator mails a user a reset link. */
export async function sendResetLink(admin: AuditActor, userId: number): Promise<{ sent: boolean }> {
  return inTransaction(async (transaction) => {
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('User');
    if (!user.active) throw new AppError(409, 'user_inactive', 'The account is deactivated: reactivate it before sending a reset link');
    const sent = await issueResetLink(user, admin, transaction);
    if (!sent)
      throw new AppError(
        429,
        'too_many_reset_links',
        `${RESET_LINKS_PER_HOUR} reset links were sent to this account in the last hour: wait before sending another`,
      );
    return { sent };
  });
}

/** Sets a new password through a link: once, within its hour, for an active account. Every session
 * of the account ends, its other links lapse and its refused sign-ins are forgotten. */
export async function resetPassword(token: string, newPassword: string, request: RequestInfo) {
  return inTransaction(async (transaction) => {
    const link = await PasswordResetToken.findOne({ where: { tokenHash: tokenHash(token) }, transaction, lock: transaction.LOCK.UPDATE });
    const user = link && (await User.findByPk(link.userId, { transaction, lock: transaction.LOCK.UPDATE }));
    if (!link || !user?.active) throw new AppError(400, 'reset_link_invalid', 'This reset link is not valid.');
    if (link.usedAt) throw new AppError(400, 'reset_link_used', 'This reset link has already been used, or a newer one was used instead.');
    if (link.expiresAt.getTime() <= Date.now()) {
      throw new AppError(400, 'reset_link_expired', `This reset link has expired: links are valid for ${RESET_LINK_MINUTES} minutes.`);
    }
    user.passwordHash = await hashPassword(newPassword);
    await user.save({ transaction });
    await PasswordResetToken.update({ usedAt: new Date() }, { where: { userId: user.id, usedAt: { [Op.is]: null } }, transaction });
    const sessionsEnded = await endSessionsOf(user.id, 'password-reset', transaction);
    await sequelize.query('DELETE FROM refused_sign_ins WHERE email = :email', { type: QueryTypes.DELETE, transaction, replacements: { email: user.email } });
    await recordAudit(
      { ...actorFromUser(user), ...request },
      { action: 'auth.password-reset', entityType: 'user', entityId: user.id, after: { linkId: link.id, sessionsEnded } },
      transaction,
    );
  });
}
