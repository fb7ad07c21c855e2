import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import bcrypt from 'bcryptjs';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../../db';
import { createApp } from '../../app';
import { app, freshUser } from '../../../tests/helpers/api';
import { SIGN_IN_LIMITS } from '../../auth/signIn';

const limit = (scope: string) => SIGN_IN_LIMITS.find((l) => l.scope === scope)!.limit;
const clear = () => sequelize.query('DELETE FROM refused_sign_ins');
const throttleAudits = async (key: string) =>
  (
    await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'auth.sign-in-throttled' AND entity_id = :key`, {
      type: QueryTypes.SELECT,
      replacements: { key },
    })
  )[0].n;

/** A refused sign-in from its own address (the app trusts X-Forwarded-For from the loopback proxy). */
const refusedFrom = (address: string, email: string) =>
  request(app).post('/api/auth/login').set('X-Forwarded-For', address).send({ email, password: 'wrong-password' });

beforeEach(clear);
afterEach(async () => {
  vi.restoreAllMocks();
  await clear();
});

describe('the sign-in throttle (in PostgreSQL)', () => {
  it('answers 429 site-wide once refusals spread over many addresses and accounts reach the limit, without comparing a hash', async () => {
    const auditsBefore = await throttleAudits('site');
    for (let i = 0; i < limit('site'); i++) await refusedFrom(`198.51.100.${i + 1}`, `spread-${i}@example.test`).expect(401);
    const compare = vi.spyOn(bcrypt, 'compare');
    for (let i = 0; i < 5; i++) {
      const response = await refusedFrom(`203.0.113.${i + 1}`, `later-${i}@example.test`).expect(429);
      expect(response.body.error.code).toBe('too_many_attempts');
      expect(response.body.error.message).toMatch(/^Too many refused sign-ins on this site in the last minute\. Try again in \d+ seconds\.$/);
    }
    // A right password is held up as well: the throttle cannot tell it apart without the hash.
    const { email, password } = await freshUser(['clerk']);
    await request(app).post('/api/auth/login').set('X-Forwarded-For', '192.0.2.77').send({ email, password }).expect(429);
    expect(compare).not.toHaveBeenCalled();
    // Recorded once for the window, not once per refused request.
    expect((await throttleAudits('site')) - auditsBefore).toBe(1);
  });

  it('keeps its count in the database: a second app (another process) sees the same limit', async () => {
    for (let i = 0; i < limit('site'); i++) await refusedFrom(`198.51.100.${i + 1}`, `spread-${i}@example.test`).expect(401);
    await request(createApp())
      .post('/api/auth/login')
      .set('X-Forwarded-For', '192.0.2.1')
      .send({ email: 'x@example.test', password: 'whatever-it-is' })
      .expect(429);
  });

  it('throttles one account attacked from many addresses', async () => {
    const { email, password } = await freshUser(['buyer']);
    for (let i = 0; i < limit('account'); i++) await refusedFrom(`198.51.100.${i + 1}`, email).expect(401);
    const compare = vi.spyOn(bcrypt, 'compare');
    const response = await request(app).post('/api/auth/login').set('X-Forwarded-For', '192.0.2.9').send({ email, password }).expect(429);
    expect(response.body.error.message).toMatch(/^Too many refused sign-ins for this account\. Try again in 1[45] minutes\.$/);
    expect(compare).not.toHaveBeenCalled();
    // Other accounts are not held up.
    const other = await freshUser(['buyer']);
    await request(app).post('/api/auth/login').set('X-Forwarded-For', '192.0.2.9').send({ email: other.email, password: other.password }).expect(200);
    expect(compare).toHaveBeenCalledTimes(1);
    expect(await throttleAudits(`account:${email}`)).toBe(1);
  });

  it('throttles one address trying many accounts, before it uses up the site budget', async () => {
    expect(limit('address')).toBeLessThan(limit('site'));
    // Spread over a minute and more, as a patient attacker would, the site limit never comes into play.
    for (let i = 0; i < limit('address'); i++) {
      await refusedFrom('198.51.100.200', `account-${i}@example.test`).expect(401);
      if (i % 10 === 9) await sequelize.query(`UPDATE refused_sign_ins SET created_at = created_at - interval '61 seconds'`);
    }
    const response = await refusedFrom('198.51.100.200', 'one-more@example.test').expect(429);
    expect(response.body.error.message).toMatch(/^Too many refused sign-ins from your network address\./);
    await refusedFrom('198.51.100.201', 'one-more@example.test').expect(401);
  });

  it('lets tries through again once the refusals leave the window', async () => {
    const { email, password } = await freshUser(['auditor']);
    for (let i = 0; i < limit('account'); i++) await refusedFrom(`198.51.100.${i + 1}`, email).expect(401);
    await request(app).post('/api/auth/login').send({ email, password }).expect(429);
    await sequelize.query(`UPDATE refused_sign_ins SET created_at = created_at - interval '15 minutes'`);
    await request(app).post('/api/auth/login').send({ email, password }).expect(200);
  });

  it('does not count successful sign-ins', async () => {
    const { email, password } = await freshUser(['inspector']);
    for (let i = 0; i < limit('account') + 2; i++) await request(app).post('/api/auth/login').send({ email, password }).expect(200);
    const [{ n }] = await sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM refused_sign_ins', { type: QueryTypes.SELECT });
    expect(n).toBe(0);
  });

  it('counts parallel tries exactly', async () => {
    const { email } = await freshUser(['clerk']);
    const responses = await Promise.all(Array.from({ length: limit('account') + 5 }, (_, i) => refusedFrom(`198.51.100.${i + 1}`, email)));
    expect(responses.filter((r) => r.status === 401)).toHaveLength(limit('account'));
    expect(responses.filter((r) => r.status === 429)).toHaveLength(5);
  });
});
