// Odd input answers 4xx with a message, never 500: odd sort keys, page numbers and searches on
// every list (every GET route without parameters, walked from the router), odd ids on every route
// that takes one, a JSON body over the limit, NUL characters in text.
import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { app, as } from '../../tests/helpers/api';
import { apiRoutes, routeName, urlOf, type ApiRoute } from '../../tests/helpers/routes';
import { orderedLine, postReceipt, uniqueTag } from '../../tests/helpers/purchasing';
import { POLICIES } from '../../shared/policies';
import { ROLES, type Role } from '../../shared/schemas/roles';

const ODD_QUERIES: Record<string, string>[] = [
  { sort: '__proto__' },
  { sort: '-__proto__' },
  { sort: 'constructor' },
  { sort: 'toString' },
  { sort: 'hasOwnProperty' },
  { sort: '-' },
  { sort: ' ' },
  { sort: 'x'.repeat(500) },
  { sort: 'id; DROP TABLE lots' },
  { page: '0' },
  { page: '-1' },
  { page: 'abc' },
  { page: '1e309' },
  { page: '99999999999999999999' },
  { pageSize: '0' },
  { pageSize: '1000000' },
  { q: 'a\u0000b' },
  { q: '%_\\' },
  { q: "' OR 1=1 --" },
  { q: 'x'.repeat(5000) },
  { from: '2026-02-30' },
  { to: 'not-a-date' },
  { format: 'csv', sort: '__proto__' },
];

/** Query strings the parser turns into arrays and objects rather than text. */
const ODD_RAW_QUERIES = ['sort[]=a&sort[]=b', 'sort[__proto__]=x', 'page[a]=1', 'q[]=x&q[]=y'];

const ODD_IDS = ['99999999999', '-1', '0', '1.5', 'abc', '1e3', '%00', '9'.repeat(400)];

const routes = apiRoutes();
const lists = routes.filter((route) => route.method === 'get' && !route.path.includes(':') && route.signIn);
const withParams = routes.filter((route) => route.path.includes(':') && route.signIn);

/** A role that passes the route's guards. */
function roleFor(route: ApiRoute): Role {
  const role = route.permission ? POLICIES[route.permission][0] : ROLES[0];
  if (!role) throw new Error(`${routeName(route)}: no role holds ${route.permission}`);
  return role;
}

async function expectClientError(response: request.Response, what: string) {
  expect(response.status, `${what}: ${response.status} ${response.text.slice(0, 200)}`).toBeLessThan(500);
  if (response.status >= 400) expect(response.body?.error?.message, `${what}: a 4xx names its reason`).toEqual(expect.any(String));
}

describe.each(lists.map((route) => [routeName(route), route] as const))('%s with odd query parameters', (_name, route) => {
  it('answers 2xx or 4xx with a message', async () => {
    const client = await as(roleFor(route));
    for (const query of ODD_QUERIES) await expectClientError(await client.get(route.path).query(query), JSON.stringify(query));
    for (const raw of ODD_RAW_QUERIES) await expectClientError(await client.get(`${route.path}?${raw}`), raw);
  });
});

describe.each(withParams.map((route) => [routeName(route), route] as const))('%s with odd ids', (_name, route) => {
  it('answers 4xx with a message', async () => {
    const client = await as(roleFor(route));
    for (const id of ODD_IDS) {
      const response = await client[route.method](urlOf(route.path, id)).send(route.method === 'get' ? undefined : {});
      await expectClientError(response, id);
      expect(response.status, id).toBeGreaterThanOrEqual(400);
    }
  });
});

describe('odd bodies', () => {
  it('refuses a JSON body over 2 MB with 413', async () => {
    const buyer = await as('buyer');
    const response = await buyer
      .post('/api/suppliers')
      .send({ name: 'Big', notes: 'x'.repeat(2.5 * 1024 * 1024) })
      .expect(413);
    expect(response.body.error).toMatchObject({ code: 'too_large', message: expect.stringMatching(/larger than the 2mb allowed/) });
  });

  it('refuses ids, dates and numbers the database cannot hold with 400, in JSON bodies too', async () => {
    const buyer = await as('buyer');
    const order = (fields: Record<string, unknown>) =>
      buyer.post('/api/purchase-orders').send({ number: `PO-${uniqueTag()}`, supplierId: 1, orderedOn: '2026-11-02', currency: 'EUR', lines: [], ...fields });
    for (const fields of [
      { supplierId: 99999999999 },
      { supplierId: 1e300 },
      { orderedOn: '2026-02-30' },
      { orderedOn: '99999-01-01' },
      { lines: [{ partId: 99999999999, quantity: 1, unitPrice: 1 }] },
    ]) {
      const response = await order(fields);
      expect(response.status, `${JSON.stringify(fields)}: ${response.text.slice(0, 200)}`).toBeGreaterThanOrEqual(400);
      await expectClientError(response, JSON.stringify(fields));
    }
  });

  it('refuses a NUL character in the site name with 400 naming the field, and keeps the old name', async () => {
    const admin = await as('admin');
    const before = (await admin.get('/api/settings').expect(200)).body;
    const response = await admin
      .put('/api/settings')
      .send({ ...before, siteName: 'Bench\u0000hall' })
      .expect(400);
    expect(response.body.error.details).toEqual([{ path: 'siteName', message: expect.stringMatching(/NUL character/) }]);
    expect((await admin.get('/api/settings').expect(200)).body.siteName).toBe(before.siteName);
  });

  it('refuses a NUL character in a multipart field of a receipt with 400 naming the field', async () => {
    const line = await orderedLine(2);
    const response = await postReceipt(line.lineId, { quantity: 2, serials: 'A1, A2', supplierLot: 'SL\u00001' });
    expect(response.status, response.text).toBe(400);
    expect(response.body.error.details).toEqual([{ path: 'supplierLot', message: expect.stringMatching(/NUL character/) }]);
  });

  it('refuses a NUL character in a search with 400, and a body that is not JSON with 400', async () => {
    const clerk = await as('clerk');
    expect((await clerk.get('/api/lots').query({ q: 'A\u0000' }).expect(400)).body.error.details[0].path).toBe('q');
    await request(app).post('/api/auth/login').set('Content-Type', 'application/json').send('{"email":').expect(400);
  });
});
