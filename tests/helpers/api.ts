// Helpers for API tests: the app under supertest, sign-in as a demo role, and fresh users.
import request from 'supertest';
import { faker } from '@faker-js/faker';
import { createApp } from '../../server/app';
import { demoLogin } from '../../db/seeders/demo';
import { createUser } from '../../server/users/users';
import { SYSTEM_ACTOR } from '../../server/audit/record';
import type { Role } from '../../shared/schemas/roles';

export const app = createApp();

const tokens = new Map<Role, string>();

/** A bearer token for the seeded demo account of a role (signed in once per test file). */
export async function tokenFor(role: Role): Promise<string> {
  const cached = tokens.get(role);
  if (cached) return cached;
  const response = await request(app).post('/api/auth/login').send(demoLogin(role)).expect(200);
  tokens.set(role, response.body.token);
  return response.body.token;
}

export async function as(role: Role) {
  const auth = `Bearer ${await tokenFor(role)}`;
  return {
    get: (url: string) => request(app).get(url).set('Authorization', auth),
    post: (url: string) => request(app).post(url).set('Authorization', auth),
    patch: (url: string) => request(app).patch(url).set('Authorization', auth),
    put: (url: string) => request(app).put(url).set('Authorization', auth),
    delete: (url: string) => request(app).delete(url).set('Authorization', auth),
  };
}

export async function freshUser(roles: Role[], password = faker.internet.password({ length: 14 })) {
  const email = `${faker.string.alphanumeric(10).toLowerCase()}@example.test`;
  const user = await createUser(SYSTEM_ACTOR, { email, name: faker.person.fullName(), password, roles });
  return { user, email, password };
}
