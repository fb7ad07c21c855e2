import type { RequestHandler } from 'express';
import { User } from '../../db/models';
import { can, type Permission } from '../../shared/policies';
import { forbidden, unauthorized } from '../http/errors';
import { SESSION_COOKIE, userIdFromToken } from './tokens';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      user?: User;
    }
  }
}

function tokenOf(req: Parameters<RequestHandler>[0]): string | undefined {
  const header = req.get('authorization');
  if (header?.startsWith('Bearer ')) return header.slice(7).trim();
  return req.cookies?.[SESSION_COOKIE];
}

/** Signs the request in from its bearer token or session cookie; 401 when it has neither. The
 * user is re-read on every request so that deactivation and role changes apply at once. */
export const authenticate: RequestHandler = async (req, _res, next) => {
  const token = tokenOf(req);
  const id = token ? userIdFromToken(token) : null;
  const user = id ? await User.findByPk(id) : null;
  if (!user || !user.active) {
    next(unauthorized());
    return;
  }
  req.user = user;
  next();
};

/** The route's policy: 403 unless one of the user's roles holds the permission. */
export function allow(permission: Permission): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) next(unauthorized());
    else if (!can(req.user, permission)) next(forbidden());
    else next();
  };
}
