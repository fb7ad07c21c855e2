import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { Op } from 'sequelize';
import { sequelize } from '../../../db';
import { OutboxMail, PasswordResetToken, Session } from '../../../db/models';
import { app, as, freshUser } from '../../../tests/helpers/api';
import { passwordWeakness } from '../../../shared/schemas/password';

afterAll(() => sequelize.query('DELETE FROM refused_sign_ins'));

const signIn = async (email: string, password: string, status = 200) =>
  (await request(app).post('/api/auth/login').send({ email, password }).expect(status)).body;
const me = (token: string) => request(app).get('/api/auth/me').set('Authorization', `Bearer ${token}`);

/** The reset link in the latest mail to an address, and how many mails went there. */
async function mailedLink(email: string) {
  const mails = await OutboxMail.findAll({ where: { recipients: { [Op.contains]: [email] } }, order: [['id', 'DESC']] });
  const token = mails[0]?.bodyText.match(/\/reset-password#token=([\w-]+)/)?.[1];
  return { token, count: mails.length, mail: mails[0] };
}

describe('the password policy', () => {
  // Repeats, famous passwords and keyboard runs are the first guesses of any cracker (common practice);
  // a long mix of unrelated words or random characters is not.
  it.each(['aaaaaaaaaa', 'password123', 'qwertyuiop', '1234567890', 'iloveyou2026'])('calls %s too easy to guess', async (password) => {
    expect(await passwordWeakness(password)).toMatch(/^This password is too easy to guess\./);
  });

  it.each(['kettle-orbit-47-plum', 'ZdF9k2pLm7Qx', 'correct horse battery staple'])('accepts %s', async (password) => {
    expect(await passwordWeakness(password)).toBeNull();
  });

  it('does not let a password lean on the user name, e-mail or the product name', async () => {
    expect(await passwordWeakness('tamsinokonjo', ['Tamsin Okonjo', 'tamsin.okonjo@example.test'])).toMatch(/too easy/);
    expect(await passwordWeakness('phaselotphaselot')).toMatch(/too easy/);
  });

  it('refuses aaaaaaaaaa when an admin creates a user or sets a password, with the reason on the field', async () => {
    const admin = await as('admin');
    const created = await admin
      .post('/api/users')
      .send({ email: 'weak@example.test', name: 'Weak Password', password: 'aaaaaaaaaa', roles: ['clerk'] })
      .expect(400);
    expect(created.body.error.details).toEqual([
      { path: 'password', message: expect.stringMatching(/^This password is too easy to guess\. Repeated characters like "aaa"/) },
    ]);
    const { user } = await freshUser(['clerk']);
    const set = await admin.patch(`/api/users/${user.id}`).send({ password: 'aaaaaaaaaa' }).expect(400);
    expect(set.body.error.details[0]).toMatchObject({ path: 'password', message: expect.stringMatching(/too easy to guess/) });
  });
});

describe('POST /api/auth/password (own change)', () => {
  it('needs the current password, keeps this session and ends every other', async () => {
    const { email, password } = await freshUser(['inspector']);
    const here = (await signIn(email, password)).token;
    const elsewhere = (await signIn(email, password)).token;

    const wrong = await request(app)
      .post('/api/auth/password')
      .set('Authorization', `Bearer ${here}`)
      .send({ currentPassword: 'not-the-password', newPassword: 'kettle-orbit-47-plum' })
      .expect(400);
    expect(wrong.body.error.details).toEqual([{ path: 'currentPassword', message: 'This is not your current password' }]);
    await me(elsewhere).expect(200);

    await request(app)
      .post('/api/auth/password')
      .set('Authorization', `Bearer ${here}`)
      .send({ currentPassword: password, newPassword: 'kettle-orbit-47-plum' })
      .expect(204);
    await me(here).expect(200);
    await me(elsewhere).expect(401);
    await signIn(email, password, 401);
    await signIn(email, 'kettle-orbit-47-plum');
  });

  it('refuses a weak new password and the current one again', async () => {
    const { email, password } = await freshUser(['buyer']);
    const token = (await signIn(email, password)).token;
    const weak = await request(app)
      .post('/api/auth/password')
      .set('Authorization', `Bearer ${token}`)
      .send({ currentPassword: password, newPassword: 'aaaaaaaaaa' })
      .expect(400);
    expect(weak.body.error.details[0]).toMatchObject({ path: 'newPassword', message: expect.stringMatching(/too easy to guess/) });
    const same = await request(app)
      .post('/api/auth/password')
      .set('Authorization', `Bearer ${token}`)
      .send({ currentPassword: password, newPassword: password })
      .expect(400);
    expect(same.body.error.details[0]).toEqual({ path: 'newPassword', message: 'Choose a password different from the current one' });
  });

  it('is for signed-in users only', async () => {
    await request(app).post('/api/auth/password').send({ currentPassword: 'x', newPassword: 'kettle-orbit-47-plum' }).expect(401);
  });
});

describe('password reset by a mailed link', () => {
  it('answers the same for an unknown address and mails a one-time link to a known one', async () => {
    const { user, email, password } = await freshUser(['auditor']);
    const unknown = await request(app).post('/api/auth/password-reset/request').send({ email: 'nobody-here@example.test' }).expect(202);
    const known = await request(app).post('/api/auth/password-reset/request').send({ email }).expect(202);
    expect(known.body).toEqual(unknown.body);
    expect(await OutboxMail.count({ where: { recipients: { [Op.contains]: ['nobody-here@example.test'] } } })).toBe(0);

    const { token, mail } = await mailedLink(email);
    expect(token).toMatch(/^[\w-]{43}$/);
    expect(mail!.subject).toBe('Phaselot: choose a new password');
    // Only the token's hash is stored.
    const stored = await PasswordResetToken.findOne({ where: { userId: user.id } });
    expect(stored!.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(stored!.tokenHash).not.toContain(token);

    const before = (await signIn(email, password)).token;
    await request(app).post('/api/auth/password-reset').send({ token, newPassword: 'aaaaaaaaaa' }).expect(400);
    await request(app).post('/api/auth/password-reset').send({ token, newPassword: 'lantern-basalt-93-fig' }).expect(204);
    await me(before).expect(401);
    expect(await Session.count({ where: { userId: user.id, endReason: 'password-reset' } })).toBe(1);
    await signIn(email, 'lantern-basalt-93-fig');

    const again = await request(app).post('/api/auth/password-reset').send({ token, newPassword: 'another-lantern-94-fig' }).expect(400);
    expect(again.body.error.code).toBe('reset_link_used');
    await signIn(email, 'another-lantern-94-fig', 401);
  });

  it('refuses an expired link and a made-up one', async () => {
    const { user, email } = await freshUser(['clerk']);
    await request(app).post('/api/auth/password-reset/request').send({ email }).expect(202);
    const { token } = await mailedLink(email);
    await PasswordResetToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { userId: user.id } });
    const expired = await request(app).post('/api/auth/password-reset').send({ token, newPassword: 'lantern-basalt-93-fig' }).expect(400);
    expect(expired.body.error).toMatchObject({ code: 'reset_link_expired', message: expect.stringMatching(/has expired/) });
    const madeUp = await request(app)
      .post('/api/auth/password-reset')
      .send({ token: 'x'.repeat(43), newPassword: 'lantern-basalt-93-fig' })
      .expect(400);
    expect(madeUp.body.error.code).toBe('reset_link_invalid');
  });

  it('sends at most 3 links an hour to one account, with the same answer', async () => {
    const { email } = await freshUser(['buyer']);
    for (let i = 0; i < 5; i++) await request(app).post('/api/auth/password-reset/request').send({ email }).expect(202);
    expect((await mailedLink(email)).count).toBe(3);
  });

  it('lets an admin mail a link, and ends sessions when the admin sets a password', async () => {
    const admin = await as('admin');
    const { user, email, password } = await freshUser(['quality']);
    const token = (await signIn(email, password)).token;
    const sent = await admin.post(`/api/users/${user.id}/password-reset-link`).expect(202);
    expect(sent.body.message).toMatch(/mailed/);
    const { mail } = await mailedLink(email);
    expect(mail!.bodyText).toMatch(/An administrator \(admin@phaselot\.test\) sent you a link/);
    await me(token).expect(200);

    await admin.patch(`/api/users/${user.id}`).send({ password: 'lantern-basalt-93-fig' }).expect(200);
    await me(token).expect(401);
    await signIn(email, 'lantern-basalt-93-fig');
    await (await as('clerk')).post(`/api/users/${user.id}/password-reset-link`).expect(403);
  });
});
