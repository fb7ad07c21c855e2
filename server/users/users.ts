import { inTransaction } from '../../db';
import { User } from '../../db/models';
import type { UserCreateInput, UserUpdateInput } from '../../shared/schemas/users';
import { recordAudit, type AuditActor } from '../audit/record';
import { hashPassword } from '../auth/passwords';
import { endSessionsOf } from '../auth/sessions';
import { badRequest, notFound } from '../http/errors';
import { presentUser } from './views';

export const listUsers = () => User.findAll({ order: [['name', 'ASC']] });

export function createUser(actor: AuditActor, input: UserCreateInput) {
  return inTransaction(async (transaction) => {
    const user = await User.create(
      { email: input.email, name: input.name, roles: [...new Set(input.roles)], passwordHash: await hashPassword(input.password) },
      { transaction },
    );
    await recordAudit(actor, { action: 'user.create', entityType: 'user', entityId: user.id, after: presentUser(user) }, transaction);
    return user;
  });
}

/** Updates a user; an administrator cannot lock themself out by removing their own admin role
 * or deactivating their own account. Deactivating the account or setting its password ends every
 * session of it. */
export function updateUser(actor: AuditActor, id: number, input: UserUpdateInput) {
  return inTransaction(async (transaction) => {
    const user = await User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw notFound('User');
    if (actor.id === user.id && (input.active === false || (input.roles && !input.roles.includes('admin')))) {
      throw badRequest('You cannot deactivate yourself or remove your own administrator role');
    }
    const before = presentUser(user);
    if (input.name !== undefined) user.name = input.name;
    if (input.roles !== undefined) user.roles = [...new Set(input.roles)];
    if (input.active !== undefined) user.active = input.active;
    if (input.password !== undefined) user.passwordHash = await hashPassword(input.password);
    await user.save({ transaction });
    const endReason = input.active === false ? 'deactivated' : input.password !== undefined ? 'password-reset' : null;
    const sessionsEnded = endReason ? await endSessionsOf(user.id, endReason, transaction) : undefined;
    const after = { ...presentUser(user), passwordChanged: input.password !== undefined || undefined, sessionsEnded };
    await recordAudit(actor, { action: 'user.update', entityType: 'user', entityId: user.id, before, after }, transaction);
    return user;
  });
}
