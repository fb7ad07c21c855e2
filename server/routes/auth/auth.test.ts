import { describe, expect, it } from 'vitest';
import request from 'supertest';
import jwt from 'jsonwebtoken';
import { app, freshUser, tokenFor } from '../../../tests/helpers/api';
import { demoLogin } from '../../../db/seeders/demo';
import { ROLES } from '../../../shared/schemas/roles';
import { updateUser } from '../users/operations';

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

  it('rate-limits repeated failures for one address', async () => {
    const { email } = await freshUser(['buyer']);
    for (let i = 0; i < 10; i++) await request(app).post('/api/auth/login').send({ email, password: 'wrong-password' }).expect(401);
    const limited = await request(app).post('/api/auth/login').send({ email, password: 'wrong-password' }).expect(429);
    expect(limited.body.error.code).toBe('too_many_attempts');
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
    await agent.post('/api/auth/logout').expect(204);
    await agent.get('/api/auth/me').expect(401);
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
  });
});
