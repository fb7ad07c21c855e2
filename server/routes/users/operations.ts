import bcrypt from 'bcryptjs';
import { User } from '../../../db/models';
import type { UserCreateInput, UserUpdateInput } from '../../../shared/schemas/users';
import { badRequest, notFound } from '../../http/errors';

const BCRYPT_COST = 10;

export const hashPassword = (password: string) => bcrypt.hash(password, BCRYPT_COST);

export async function createUser(input: UserCreateInput) {
  return User.create({
    email: input.email,
    name: input.name,
    roles: [...new Set(input.roles)],
    passwordHash: await hashPassword(input.password),
  });
}

/** Updates a user; an administrator cannot lock themself out by removing their own admin role
 * or deactivating their own account. */
export async function updateUser(actor: User, id: number, input: UserUpdateInput) {
  const user = await User.findByPk(id);
  if (!user) throw notFound('User');
  if (actor.id === user.id && (input.active === false || (input.roles && !input.roles.includes('admin')))) {
    throw badRequest('You cannot deactivate yourself or remove your own administrator role');
  }
  if (input.name !== undefined) user.name = input.name;
  if (input.roles !== undefined) user.roles = [...new Set(input.roles)];
  if (input.active !== undefined) user.active = input.active;
  if (input.password !== undefined) user.passwordHash = await hashPassword(input.password);
  await user.save();
  return user;
}
