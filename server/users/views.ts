// A user as the API shows it, which is also what the audit trail records of a user.
import type { User } from '../../db/models';
import type { SessionUser } from '../../shared/schemas/auth';
import type { UserView } from '../../shared/schemas/users';

export function presentSessionUser(user: User): SessionUser {
  return { id: user.id, email: user.email, name: user.name, roles: user.roles };
}

export function presentUser(user: User): UserView {
  return {
    ...presentSessionUser(user),
    active: user.active,
    createdAt: user.createdAt.toISOString(),
    lastSignInAt: user.lastSignInAt?.toISOString() ?? null,
    signingLockedUntil: user.signingLockedUntil && user.signingLockedUntil.getTime() > Date.now() ? user.signingLockedUntil.toISOString() : null,
  };
}
