// Every API route against every role and against no sign-in, the expected answer read from
// shared/policies.ts: a role the route's permission names gets past the guards (any answer but
// 401/403: the records asked for do not exist and the bodies are empty, so mostly 400/404);
// another role gets 403; no sign-in gets 401. A route that names no permission and is not listed
// below as public or as open to every signed-in user fails the test until someone decides.
import { beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { sequelize } from '../../db';
import { app } from '../../tests/helpers/api';
import { apiRoutes, routeName, urlOf, type ApiRoute } from '../../tests/helpers/routes';
import { demoLogin } from '../../db/seeders/demo';
import { POLICIES } from '../../shared/policies';
import { ROLES, type Role } from '../../shared/schemas/roles';

/** Routes anyone may call, with what an anonymous call with no input answers. */
const PUBLIC: Record<string, number[]> = {
  'GET /api/health': [200],
  'POST /api/auth/login': [400],
  'POST /api/auth/logout': [204],
  'POST /api/auth/password-reset/request': [400],
  'POST /api/auth/password-reset': [400],
  'GET /api/certificates/verify': [400],
  // The supplier's answer to a corrective-action request, through the mailed link (no token: refused).
  'GET /api/corrective-actions/respond': [400],
  'POST /api/corrective-actions/respond': [400],
};

/** Routes every signed-in user may call, whatever the role. */
// The scan look-up answers, per kind of record, only what the user's roles may read.
const ANY_SIGNED_IN = new Set(['GET /api/auth/me', 'GET /api/settings', 'GET /api/lookup']);

/** Routes that end the session they are called with: each call gets a session of its own. */
const ENDS_SESSION = new Set(['POST /api/auth/logout']);

const routes = apiRoutes();

async function signIn(role: Role) {
  const response = await request(app).post('/api/auth/login').send(demoLogin(role)).expect(200);
  return response.body.token as string;
}

const tokens = new Map<Role, string>();
beforeAll(async () => {
  // The public routes' rate limits count per address in the database: earlier test files, all from
  // 127.0.0.1, may have used this window's allowance, and a 429 would hide what the route answers.
  await sequelize.query('DELETE FROM rate_limit_hits');
  for (const role of ROLES) tokens.set(role, await signIn(role));
});

async function call(route: ApiRoute, role: Role | null) {
  const token = role && (ENDS_SESSION.has(routeName(route)) ? await signIn(role) : tokens.get(role));
  let req = request(app)[route.method](urlOf(route.path));
  if (token) req = req.set('Authorization', `Bearer ${token}`);
  if (route.method !== 'get') req = req.send({});
  return req;
}

function allowedRoles(route: ApiRoute): readonly Role[] {
  if (route.permission) return POLICIES[route.permission];
  if (!route.signIn || ANY_SIGNED_IN.has(routeName(route))) return ROLES;
  return [];
}

describe('the route table', () => {
  it('is walked from the router (a sanity floor, so an empty walk cannot pass)', () => {
    expect(routes.length).toBeGreaterThan(50);
    expect(routes).toContainEqual({ method: 'post', path: '/api/shipments', signIn: true, permission: 'shipments.receive' });
    // The dashboard and the bell: every signed-in user, each seeing only their own and what their roles read.
    expect(routes).toContainEqual({ method: 'get', path: '/api/dashboard', signIn: true, permission: 'dashboard.read' });
    for (const [method, path] of [
      ['get', '/api/notifications'],
      ['post', '/api/notifications/read-all'],
      ['post', '/api/notifications/:id/read'],
    ])
      expect(routes).toContainEqual({ method, path, signIn: true, permission: 'notifications.read' });
    expect(routes).toContainEqual({ method: 'post', path: '/api/instruments/:id/calibrations', signIn: true, permission: 'instruments.calibrate' });
    expect(routes).toContainEqual({
      method: 'post',
      path: '/api/instruments/:id/calibrations/:calibrationId/certificate',
      signIn: true,
      permission: 'instruments.calibrate',
    });
  });

  it('gives every route an expectation: a permission, sign-in for everyone, or public', () => {
    const undecided = routes.filter((route) => {
      const name = routeName(route);
      if (route.permission) return !route.signIn;
      return route.signIn ? !ANY_SIGNED_IN.has(name) : !(name in PUBLIC);
    });
    expect(undecided.map(routeName), 'routes without allow(permission), not listed as public or open to every signed-in user').toEqual([]);
  });

  it('names no route in the lists that no longer exists', () => {
    const names = new Set(routes.map(routeName));
    expect([...Object.keys(PUBLIC), ...ANY_SIGNED_IN, ...ENDS_SESSION].filter((name) => !names.has(name))).toEqual([]);
  });
});

/** What is wrong with one answer, or null when it is as the policies say. */
function mismatch(route: ApiRoute, who: Role | null, status: number): string | null {
  // A public route answers the same whoever calls it: a sign-in neither helps nor hurts.
  if (!route.signIn) {
    const expected = PUBLIC[routeName(route)];
    return expected.includes(status) ? null : `${who ?? 'signed out'}: ${status}, expected ${expected.join(' or ')}`;
  }
  if (who === null) return status === 401 ? null : `signed out: ${status}, expected 401`;
  if (!allowedRoles(route).includes(who)) return status === 403 ? null : `${who}: ${status}, expected 403`;
  return status === 401 || status === 403 || status >= 500 ? `${who}: ${status}, expected to pass the guards` : null;
}

describe.each(routes.map((route) => [routeName(route), route] as const))('%s', (_name, route) => {
  it('answers each role as the policies say, and 401 without sign-in', async () => {
    const problems: string[] = [];
    for (const who of [...ROLES, null]) {
      const problem = mismatch(route, who, (await call(route, who)).status);
      if (problem) problems.push(problem);
    }
    expect(problems).toEqual([]);
  });
});
