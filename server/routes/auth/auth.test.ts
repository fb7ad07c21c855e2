import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import jwt from 'jsonwebtoken';
import { sequelize } from '../../../db';
import { Session } from '../../../db/models';
import { app, freshUser, tokenFor } from '../../../tests/helpers/api';
import { demoLogin } from '../../../db/seeders/demo';
import { ROLES } from '../../../shared/schemas/roles';
import { updateUser } from '../../users/users';

// The refused sign-ins of this file must not count against the site-wide limit in later files.
afterAll(() => sequelize.query('DELETE FROM refused_sign_ins'));

describe('POST /api/auth/login', () => {
  it.each(ROLES)('signs in the demo %s with a token, the user and an httpOnly SameSite=Strict cookie', async (role) => {
    const response = await request(app).post('/api/auth/login').send(demoLogin(role)).expect(200);
    expect(response.body.user).toMatchObject({ email: `${role}@phaselot.test`, roles: [role] });
    expect(typeof response.body.token).toBe('string');
    const cookie = String(response.headers['set-cookie']);
    expect(cookie).toMatch(/phaselot_session=/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Strict/);
  });

  it('answers a wrong password and an unknown e-mail with the same 401', async () => {
    const wrongPassword = await request(app).post('/api/auth/login').send({ email: 'clerk@phaselot.test', password: 'not-it' }).expect(401);
    const unknown = await request(app).post('/api/auth/login').send({ email: 'nobody@phaselot.test', password: 'not-it' }).expect(401);
    expect(wrongPassword.body.error.message).toBe('Wrong e-mail or password');
    expect(unknown.body.error).toEqual(wrongPassword.body.error);
  });

  it('validates the body with the failing fields', async () => {
    const response = await request(app).post('/api/auth/login').send({ email: 'not-an-address' }).expect(400);
    expect(response.body.error.code).toBe('validation');
    expect(response.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['email', 'password']);
  });

  it('refuses a deactivated account', async () => {
    const { user, email, password } = await freshUser(['clerk']);
    await request(app).post('/api/auth/login').send({ email, password }).expect(200);
    user.active = false;
    await user.save();
    await request(app).post('/api/auth/login').send({ email, password }).expect(401);
  });

  it('throttles an account after 10 refused sign-ins', async () => {
    const { email } = await freshUser(['buyer']);
    for (let i = 0; i < 10; i++) await request(app).post('/api/auth/login').send({ email, password: 'wrong-password' }).expect(401);
    const limited = await request(app).post('/api/auth/login').send({ email, password: 'wrong-password' }).expect(429);
    expect(limited.body.error.code).toBe('too_many_attempts');
    expect(limited.body.error.message).toMatch(/^Too many refused sign-ins for this account\. Try again in 1[45] minutes\.$/);
  });
});

describe('GET /api/auth/me and sessions', () => {
  it('returns the user for a bearer token and for the session cookie', async () => {
    const token = await tokenFor('inspector');
    const bearer = await request(app).get('/api/auth/me').set('Authorization', `Bearer ${token}`).expect(200);
    expect(bearer.body.user.roles).toEqual(['inspector']);
    const agent = request.agent(app);
    await agent.post('/api/auth/login').send(demoLogin('quality')).expect(200);
    const viaCookie = await agent.get('/api/auth/me').expect(200);
    expect(viaCookie.body.user.roles).toEqual(['quality']);
    await agent.post('/api/auth/logout').set('Sec-Fetch-Site', 'same-origin').expect(204);
    await agent.get('/api/auth/me').expect(401);
  });

  it('ends the session on sign-out, for the bearer token and for a kept copy of the cookie', async () => {
    const { email, password } = await freshUser(['clerk']);
    const bearer = (await request(app).post('/api/auth/login').send({ email, password }).expect(200)).body.token;
    await request(app).get('/api/auth/me').set('Authorization', `Bearer ${bearer}`).expect(200);
    await request(app).post('/api/auth/logout').set('Authorization', `Bearer ${bearer}`).expect(204);
    await request(app).get('/api/auth/me').set('Authorization', `Bearer ${bearer}`).expect(401);

    const signIn = await request(app).post('/api/auth/login').send({ email, password }).expect(200);
    const cookie = String(signIn.headers['set-cookie']).match(/phaselot_session=[^;]+/)![0];
    await request(app).get('/api/auth/me').set('Cookie', cookie).expect(200);
    // As a browser sends it: a change carried by the cookie names its origin.
    const out = await request(app).post('/api/auth/logout').set('Cookie', cookie).set('Sec-Fetch-Site', 'same-origin').expect(204);
    expect(String(out.headers['set-cookie'])).toMatch(/phaselot_session=;/);
    // The browser forgets the cookie; a copy kept elsewhere must not work either.
    await request(app).get('/api/auth/me').set('Cookie', cookie).expect(401);
    const session = await Session.findByPk((jwt.decode(cookie.split('=')[1]) as { jti: string }).jti);
    expect(session?.endReason).toBe('sign-out');
  });

  it('refuses a validly signed token whose session does not exist', async () => {
    const { user } = await freshUser(['buyer']);
    const { config } = await import('../../config');
    const orphan = jwt.sign({}, config.JWT_SECRET, { subject: String(user.id), jwtid: 'no-such-session', issuer: 'phaselot', expiresIn: '1h' });
    await request(app).get('/api/auth/me').set('Authorization', `Bearer ${orphan}`).expect(401);
    // A token of the old kind, without a session id, is refused as well.
    const old = jwt.sign({}, config.JWT_SECRET, { subject: String(user.id), issuer: 'phaselot', expiresIn: '1h' });
    await request(app).get('/api/auth/me').set('Authorization', `Bearer ${old}`).expect(401);
  });

  it('401s without a token, with a forged one and with an expired one', async () => {
    await request(app).get('/api/auth/me').expect(401);
    const forged = jwt.sign({}, 'some-other-secret-of-enough-length', { subject: '1', issuer: 'phaselot' });
    await request(app).get('/api/auth/me').set('Authorization', `Bearer ${forged}`).expect(401);
    const { config } = await import('../../config');
    const expired = jwt.sign({ exp: Math.floor(Date.now() / 1000) - 60 }, config.JWT_SECRET, { subject: '1', issuer: 'phaselot' });
    const response = await request(app).get('/api/auth/me').set('Authorization', `Bearer ${expired}`).expect(401);
    expect(response.body).toEqual({ error: { code: 'unauthorized', message: 'Sign in to continue' } });
  });

  it('ends access at once when an account is deactivated', async () => {
    const admin = (await freshUser(['admin'])).user;
    const { user, email, password } = await freshUser(['auditor']);
    const { body } = await request(app).post('/api/auth/login').send({ email, password }).expect(200);
    await updateUser({ id: admin.id, email: admin.email, roles: admin.roles }, user.id, { active: false });
    await request(app).get('/api/auth/me').set('Authorization', `Bearer ${body.token}`).expect(401);
    // Reactivating the account does not bring the old session back.
    await updateUser({ id: admin.id, email: admin.email, roles: admin.roles }, user.id, { active: true });
    await request(app).get('/api/auth/me').set('Authorization', `Bearer ${body.token}`).expect(401);
    expect(await Session.count({ where: { userId: user.id, endReason: 'deactivated' } })).toBe(1);
  });
});
