import { describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { User } from '../../db/models';
import { as, freshUser } from '../../tests/helpers/api';
import { actorFromUser } from '../audit/record';
import { AppError } from '../http/errors';
import { SIGNATURE_TRIES, verifySignature } from './signature';

const act = { entityType: 'lot', entityId: 4242 };

/** The error a signature attempt ends in, or null when it is accepted. */
async function attempt(user: User, password: string) {
  try {
    await verifySignature(await User.findByPk(user.id, { rejectOnEmpty: true }), password, actorFromUser(user), undefined, act);
    return null;
  } catch (error) {
    if (error instanceof AppError) return error;
    throw error;
  }
}

const auditsOf = async (userId: number) =>
  sequelize.query<{ action: string; after: { triesLeft?: number; act?: unknown } }>(
    `SELECT action, after FROM audit_events WHERE entity_type = 'user' AND entity_id = :id AND action LIKE 'signature.%' ORDER BY id`,
    { type: QueryTypes.SELECT, replacements: { id: String(userId) } },
  );

describe('the signature lock-out', () => {
  it('counts down 4 wrong passwords with 401, locks at the 5th with 423 for 15 minutes, refuses even the right one, and an admin unlocks', async () => {
    expect(SIGNATURE_TRIES).toBe(5);
    const { user, password } = await freshUser(['quality']);
    for (const triesLeft of [4, 3, 2, 1]) {
      const error = await attempt(user, 'not-my-password');
      expect(error).toMatchObject({ status: 401, code: 'signature_refused', details: { triesLeft } });
      expect(error!.message).toMatch(
        new RegExp(`^The password does not match: nothing was signed\\. ${triesLeft} tr(y|ies) left before signing is locked for 15 minutes\\.$`),
      );
    }
    const locked = await attempt(user, 'not-my-password');
    expect(locked).toMatchObject({ status: 423, code: 'signing_locked' });
    expect(locked!.message).toMatch(
      /^The password does not match, 5 times in 15 minutes: signing is locked until \d\d:\d\d UTC \(in 15 minutes\)\. An administrator can unlock it sooner\.$/,
    );
    const until = new Date((locked!.details as { lockedUntil: string }).lockedUntil).getTime();
    expect(until - Date.now()).toBeGreaterThan(14 * 60_000);
    expect(until - Date.now()).toBeLessThanOrEqual(15 * 60_000);

    expect(await attempt(user, password)).toMatchObject({ status: 423, message: expect.stringMatching(/^Signing is locked until/) });

    const admin = await as('admin');
    const listed = (await admin.get('/api/users').expect(200)).body.data.find((u: { id: number }) => u.id === user.id);
    expect(listed.signingLockedUntil).toBe(new Date(until).toISOString());
    const unlocked = await admin.post(`/api/users/${user.id}/signing-unlock`).expect(200);
    expect(unlocked.body.signingLockedUntil).toBeNull();
    expect(await attempt(user, password)).toBeNull();
    // After the unlock the count starts afresh.
    expect(await attempt(user, 'not-my-password')).toMatchObject({ status: 401, details: { triesLeft: 4 } });

    const audits = await auditsOf(user.id);
    expect(audits.map((a) => a.action)).toEqual([...Array(4).fill('signature.refused'), 'signature.locked', 'signature.unlocked', 'signature.refused']);
    expect(audits[0].after.act).toEqual(act);
  });

  it('lifts the lock by itself after 15 minutes', async () => {
    const { user, password } = await freshUser(['quality']);
    for (let i = 0; i < 5; i++) await attempt(user, 'not-my-password');
    expect(await attempt(user, password)).toMatchObject({ status: 423 });
    await User.update({ signingLockedUntil: new Date(Date.now() - 1000) }, { where: { id: user.id } });
    expect(await attempt(user, password)).toBeNull();
  });

  it('starts the count afresh after a right password', async () => {
    const { user, password } = await freshUser(['quality']);
    for (let i = 0; i < 4; i++) await attempt(user, 'not-my-password');
    expect(await attempt(user, password)).toBeNull();
    expect(await attempt(user, 'not-my-password')).toMatchObject({ status: 401, details: { triesLeft: 4 } });
  });

  it('counts parallel guesses one by one', async () => {
    const { user } = await freshUser(['quality']);
    const errors = await Promise.all(Array.from({ length: 8 }, () => attempt(user, 'not-my-password')));
    expect(errors.filter((e) => e?.status === 401)).toHaveLength(4);
    expect(errors.filter((e) => e?.status === 423)).toHaveLength(4);
    expect((await auditsOf(user.id)).filter((a) => a.action === 'signature.locked')).toHaveLength(1);
  });

  it('lets only administrators unlock', async () => {
    const { user } = await freshUser(['quality']);
    await (await as('quality')).post(`/api/users/${user.id}/signing-unlock`).expect(403);
    await (await as('admin')).post('/api/users/999999/signing-unlock').expect(404);
  });
});
