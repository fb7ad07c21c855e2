// The demo scenario: an invented instrument maker, Veltrane Optics Works, its people and its
// suppliers. Every name is invented; faker runs with a fixed seed so each seed run is the same.
import { faker } from '@faker-js/faker';
import { User } from '../models';
import { ROLES, type Role } from '../../shared/schemas/roles';
import { hashPassword } from '../../server/routes/users/operations';

export const DEMO_PASSWORD = 'phaselot-demo';
export const DEMO_DOMAIN = 'phaselot.test';

export const demoLogin = (role: Role) => ({ email: `${role}@${DEMO_DOMAIN}`, password: DEMO_PASSWORD });

async function seedUsers() {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const users: Partial<Record<Role, User>> = {};
  for (const role of ROLES) {
    users[role] = await User.create({ email: demoLogin(role).email, name: `${faker.person.firstName()} ${faker.person.lastName()}`, roles: [role], passwordHash });
  }
  return users as Record<Role, User>;
}

export async function isDatabaseEmpty() {
  return (await User.count()) === 0;
}

/** Seeds the whole scenario. Later parts of the product add their steps after the users. */
export async function seedDemo() {
  faker.seed(4870);
  const users = await seedUsers();
  return { users };
}
