// The web surface: changes only from Phaselot's own origins, security headers on app and API, and
// no session token or password in the log.
import { describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { app, tokenFor } from '../../tests/helpers/api';
import { orderedLine, TINY_PDF, uniqueTag } from '../../tests/helpers/purchasing';
import { demoLogin } from '../../db/seeders/demo';
import { sequelize } from '../../db';
import { createApp } from '../app';
import { SESSION_COOKIE } from '../auth/tokens';
import { config } from '../config';
import { createLogger } from '../logger';

const OTHER_ORIGIN = 'http://127.0.0.1:9';

/** A browser-like sign-in: the session cookie the server sets. */
async function sessionCookie(role: Parameters<typeof demoLogin>[0]) {
  const response = await request(app).post('/api/auth/login').send(demoLogin(role)).expect(200);
  const cookie = ([] as string[]).concat(response.headers['set-cookie'] ?? []).find((c) => c.startsWith(`${SESSION_COOKIE}=`));
  if (!cookie) throw new Error('no session cookie set');
  return cookie.split(';')[0];
}

const newSupplier = () => ({ name: `Origin test ${uniqueTag()}`, contactEmail: `origin-${uniqueTag().toLowerCase()}@example.test` });

describe('changes from other origins', () => {
  it('refuses a multipart receipt posted from another origin with the session cookie, and creates no lot', async () => {
    const line = await orderedLine(2);
    const supplierLot = `SL-${uniqueTag()}`;
    const response = await request(app)
      .post('/api/shipments')
      .set('Cookie', await sessionCookie('clerk'))
      .set('Origin', OTHER_ORIGIN)
      .field('poLineId', String(line.lineId))
      .field('packingSlipNumber', `PS-${uniqueTag()}`)
      .field('supplierLot', supplierLot)
      .field('quantity', '2')
      .field('serials', `${supplierLot}-1, ${supplierLot}-2`)
      .attach('packingSlip', TINY_PDF, 'slip.pdf')
      .expect(403);
    expect(response.body.error).toMatchObject({ code: 'cross_origin', message: expect.stringContaining(`sent from another site (${OTHER_ORIGIN})`) });
    expect(await sequelize.query('SELECT id FROM lots WHERE supplier_lot = :supplierLot', { type: QueryTypes.SELECT, replacements: { supplierLot } })).toEqual(
      [],
    );
  });

  it('accepts changes from the public address and from the address the request was sent to', async () => {
    const cookie = await sessionCookie('buyer');
    await request(app).post('/api/suppliers').set('Cookie', cookie).set('Origin', config.PUBLIC_ORIGINS[0]).send(newSupplier()).expect(201);
    await request(app)
      .post('/api/suppliers')
      .set('Cookie', cookie)
      .set('Host', 'bench-hall.example:8443')
      .set('Origin', 'http://bench-hall.example:8443')
      .send(newSupplier())
      .expect(201);
    await request(app).post('/api/suppliers').set('Cookie', cookie).set('Sec-Fetch-Site', 'same-origin').send(newSupplier()).expect(201);
  });

  it('refuses a cookie-borne change that names no origin, or that the browser marks as from another site', async () => {
    const cookie = await sessionCookie('buyer');
    const noOrigin = await request(app).post('/api/suppliers').set('Cookie', cookie).send(newSupplier()).expect(403);
    expect(noOrigin.body.error.message).toMatch(/must name its origin/);
    // Another port of the same host is the same site, not the same origin.
    await request(app).post('/api/suppliers').set('Cookie', cookie).set('Sec-Fetch-Site', 'same-site').send(newSupplier()).expect(403);
    await request(app).put('/api/suppliers/1').set('Cookie', cookie).set('Origin', 'null').send(newSupplier()).expect(403);
    await request(app).delete('/api/suppliers/1').set('Cookie', cookie).set('Origin', OTHER_ORIGIN).expect(403);
  });

  it('lets a script with a bearer token and no cookie change things, and anyone read from anywhere', async () => {
    await request(app)
      .post('/api/suppliers')
      .set('Authorization', `Bearer ${await tokenFor('buyer')}`)
      .send(newSupplier())
      .expect(201);
    await request(app)
      .get('/api/suppliers')
      .set('Cookie', await sessionCookie('buyer'))
      .set('Origin', OTHER_ORIGIN)
      .expect(200);
  });

  it('reads PUBLIC_URL as a list: the first address is printed, all are allowed origins', async () => {
    const saved = process.env.PUBLIC_URL;
    try {
      process.env.PUBLIC_URL = 'https://inspection.example/, https://bench.example:8443/phaselot';
      vi.resetModules();
      const { config: listed } = await import('../config');
      expect(listed.PUBLIC_URL).toBe('https://inspection.example');
      expect(listed.PUBLIC_ORIGINS).toEqual(['https://inspection.example', 'https://bench.example:8443']);
      process.env.PUBLIC_URL = 'inspection.example';
      vi.resetModules();
      await expect(import('../config')).rejects.toThrow(/PUBLIC_URL/);
    } finally {
      if (saved === undefined) delete process.env.PUBLIC_URL;
      else process.env.PUBLIC_URL = saved;
      vi.resetModules();
    }
  });
});

describe('security headers', () => {
  it('sends a content security policy, no framing and no sniffing on the API, the app and errors', async () => {
    for (const path of ['/api/health', '/api/no-such-route', '/', '/lots']) {
      const response = await request(app).get(path);
      expect(response.headers['content-security-policy'], path).toMatch(/default-src 'self'/);
      expect(response.headers['content-security-policy'], path).toMatch(/frame-ancestors 'none'/);
      expect(response.headers['content-security-policy'], path).toMatch(/script-src 'self'(;|$)/);
      expect(response.headers['x-frame-options'], path).toBe('DENY');
      expect(response.headers['x-content-type-options'], path).toBe('nosniff');
    }
  });
});

describe('the log', () => {
  it('never holds a session token, cookie or password', async () => {
    const lines: string[] = [];
    const logged = createApp({ logger: createLogger('info', { write: (line: string) => lines.push(line) }) });
    const { email, password } = demoLogin('auditor');
    const signIn = await request(logged).post('/api/auth/login').set('X-Request-Id', 'log-redaction-sign-in').send({ email, password }).expect(200);
    const token = signIn.body.token as string;
    await request(logged)
      .get('/api/auth/me')
      .set('Authorization', `Bearer ${token}`)
      .set('Cookie', `${SESSION_COOKIE}=${token}`)
      .set('X-Request-Id', 'log-redaction-me')
      .expect(200);
    // pino-http writes its line when the response finishes; let that turn of the event loop pass.
    await new Promise((done) => setImmediate(done));
    const text = lines.join('');
    expect(text).toContain('log-redaction-sign-in');
    expect(text).toContain('log-redaction-me');
    expect(text).toContain('[redacted]');
    expect(text).not.toContain(token);
    expect(text).not.toContain(password);
  });
});
