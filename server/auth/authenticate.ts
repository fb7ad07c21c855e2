import type { Request, RequestHandler } from 'express';
import type { User } from '../../db/models';
import { can, type Permission } from '../../shared/policies';
import { forbidden, unauthorized } from '../http/errors';
import { sessionOfToken } from './sessions';
import { SESSION_COOKIE } from './tokens';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      user?: User;
      /** The server-side session the request is signed in with. */
      sessionId?: string;
      /** The database's snapshot (pg_current_snapshot()) when the session was read. */
      databaseSnapshot?: string;
    }
  }
}

/** The request's bearer token, else its session cookie. */
export function tokenOf(req: Request): string | undefined {
  const header = req.get('authorization');
  if (header?.startsWith('Bearer ')) return header.slice(7).trim();
  return req.cookies?.[SESSION_COOKIE];
}

/** Signs the request in from its bearer token or session cookie; 401 when it has neither, or when
 * its session has ended. The session and user are re-read on every request, so that sign-out,
 * password changes, deactivation and role changes apply at once. */
export const authenticate: RequestHandler = async (req, _res, next) => {
  const token = tokenOf(req);
  const signedIn = token ? await sessionOfToken(token) : null;
  if (!signedIn) {
    next(unauthorized());
    return;
  }
  req.user = signedIn.user;
  req.sessionId = signedIn.sessionId;
  req.databaseSnapshot = signedIn.databaseSnapshot;
  next();
};

/** The route's policy: 403 unless one of the user's roles holds the permission. The handler names
 * its permission, so the route table can be checked against shared/policies.ts. */
export function allow(permission: Permission): RequestHandler & { permission: Permission } {
  const handler: RequestHandler = (req, _res, next) => {
    if (!req.user) next(unauthorized());
    else if (!can(req.user, permission)) next(forbidden());
    else next();
  };
  return Object.assign(handler, { permission });
}
