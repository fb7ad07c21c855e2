// The electronic signature's password check, and the lock-out that keeps it from being guessed:
// after 5 wrong signature passwords within 15 minutes the user cannot sign for 15 minutes, or until
// an administrator unlocks signing. A right password clears the count of wrong ones.
import bcrypt from 'bcryptjs';
import { QueryTypes, type Transaction } from 'sequelize';
import { inTransaction, sequelize } from '../../db';
import { User } from '../../db/models';
import { recordAudit, type AuditActor } from '../audit/record';
import { AppError, notFound } from '../http/errors';

export const SIGNATURE_TRIES = 5;
const WINDOW_MINUTES = 15;
export const SIGNING_LOCK_MINUTES = 15;

const clock = (at: Date) => `${at.toISOString().slice(11, 16)} UTC`;

/** What the signature was for, named in the audit entries of wrong passwords and lock-outs. */
export type SignedAct = { entityType: string; entityId: string | number };

type Outcome = { kind: 'right' } | { kind: 'wrong'; triesLeft: number } | { kind: 'locked'; until: Date; justNow: boolean };

/** Checks a signature password; throws 401 `signature_refused` (with the tries left) when it is wrong
 * and 423 `signing_locked` (with the time it unlocks) while signing is locked.
 *
 * The count of wrong passwords and its audit entries are written in a transaction of their own, so
 * that the caller's rollback cannot erase them; `transaction`, when given, is the caller's, in which a
 * right password clears the count (so it is cleared only if the signed act commits). Call it before
 * the caller's transaction locks the signer's users row. */
export async function verifySignature(user: User, password: string, actor: AuditActor, transaction?: Transaction, act?: SignedAct): Promise<void> {
  const outcome = await inTransaction(async (own): Promise<Outcome> => {
    // The row lock makes parallel guesses for one user count one after another.
    const current = await User.findByPk(user.id, { transaction: own, lock: own.LOCK.UPDATE, rejectOnEmpty: true });
    if (current.signingLockedUntil && current.signingLockedUntil.getTime() > Date.now())
      return { kind: 'locked', until: current.signingLockedUntil, justNow: false };
    if (await bcrypt.compare(password, current.passwordHash)) return { kind: 'right' };

    await sequelize.query('INSERT INTO signature_failures (user_id) VALUES (:userId)', {
      type: QueryTypes.INSERT,
      transaction: own,
      replacements: { userId: user.id },
    });
    const [{ failures }] = await sequelize.query<{ failures: number }>(
      `SELECT count(*)::int AS failures FROM signature_failures WHERE user_id = :userId AND created_at > now() - make_interval(mins => :window)`,
      { type: QueryTypes.SELECT, transaction: own, replacements: { userId: user.id, window: WINDOW_MINUTES } },
    );
    if (failures < SIGNATURE_TRIES) {
      const triesLeft = SIGNATURE_TRIES - failures;
      await recordAudit(actor, { action: 'signature.refused', entityType: 'user', entityId: user.id, after: { act, failures, triesLeft } }, own);
      return { kind: 'wrong', triesLeft };
    }
    current.signingLockedUntil = new Date(Date.now() + SIGNING_LOCK_MINUTES * 60_000);
    await current.save({ transaction: own });
    // The lock-out begins a fresh count: the wrong passwords that caused it are settled by it.
    await sequelize.query('DELETE FROM signature_failures WHERE user_id = :userId', {
      type: QueryTypes.DELETE,
      transaction: own,
      replacements: { userId: user.id },
    });
    await recordAudit(
      actor,
      { action: 'signature.locked', entityType: 'user', entityId: user.id, after: { act, failures, lockedUntil: current.signingLockedUntil.toISOString() } },
      own,
    );
    return { kind: 'locked', until: current.signingLockedUntil, justNow: true };
  });

  if (outcome.kind === 'right') {
    await sequelize.query('DELETE FROM signature_failures WHERE user_id = :userId', {
      type: QueryTypes.DELETE,
      transaction,
      replacements: { userId: user.id },
    });
    return;
  }
  if (outcome.kind === 'wrong') {
    const tries = outcome.triesLeft === 1 ? '1 try' : `${outcome.triesLeft} tries`;
    throw new AppError(
      401,
      'signature_refused',
      `The password does not match: nothing was signed. ${tries} left before signing is locked for ${SIGNING_LOCK_MINUTES} minutes.`,
      {
        triesLeft: outcome.triesLeft,
      },
    );
  }
  const minutes = Math.max(1, Math.ceil((outcome.until.getTime() - Date.now()) / 60_000));
  throw new AppError(
    423,
    'signing_locked',
    `${outcome.justNow ? `The password does not match, ${SIGNATURE_TRIES} times in ${WINDOW_MINUTES} minutes: signing` : 'Signing'} is locked until ${clock(outcome.until)} (in ${minutes} minutes). An administrator can unlock it sooner.`,
    { lockedUntil: outcome.until.toISOString() },
  );
}

/** An administrator lifts a user's signing lock and clears the count of wrong passwords. */
export async function unlockSigning(admin: AuditActor, userId: number) {
  return inTransaction(async (transaction) => {
    const user = await User.findByPk(userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('User');
    const lockedUntil = user.signingLockedUntil;
    user.signingLockedUntil = null;
    await user.save({ transaction });
    await sequelize.query('DELETE FROM signature_failures WHERE user_id = :userId', { type: QueryTypes.DELETE, transaction, replacements: { userId } });
    await recordAudit(
      admin,
      {
        action: 'signature.unlocked',
        entityType: 'user',
        entityId: userId,
        before: { lockedUntil: lockedUntil?.toISOString() ?? null },
        after: { lockedUntil: null },
      },
      transaction,
    );
    return user;
  });
}
