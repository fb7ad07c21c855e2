// Changes come only from Phaselot's own pages. A browser names the page that sent a request in
// Origin (and Sec-Fetch-Site); the session cookie is sent along even from a page on another port
// of the same host, which SameSite does not stop, so every state-changing request from a browser
// must come from an allowed origin: the addresses in PUBLIC_URL, or the very address the request
// was sent to. Clients that are not browsers (scripts with a bearer token) send no Origin and hold
// no cookie; they pass.
import type { Request, RequestHandler } from 'express';
import { config } from '../config';
import { SESSION_COOKIE } from '../auth/tokens';
import { logger } from '../logger';
import { AppError } from './errors';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/** The origin the request was addressed to, as the browser saw it (through loopback proxies too). */
const ownOrigin = (req: Request) => `${req.protocol}://${req.get('host')}`;

function refusal(req: Request): string | null {
  const origin = req.get('origin');
  if (origin !== undefined) {
    if (config.PUBLIC_ORIGINS.includes(origin) || origin === ownOrigin(req)) return null;
    return `This change was sent from another site (${origin}) and is refused. Open Phaselot at ${config.PUBLIC_URL} and try again.`;
  }
  const site = req.get('sec-fetch-site');
  if (site !== undefined) {
    return site === 'same-origin' || site === 'none'
      ? null
      : `This change was sent from another site (${site}) and is refused. Open Phaselot at ${config.PUBLIC_URL} and try again.`;
  }
  // Neither header: not a current browser. Only a request carrying the session cookie could be
  // riding on someone's session.
  if (req.cookies?.[SESSION_COOKIE] !== undefined) {
    return 'A change sent with the session cookie must name its origin; sign in from a browser, or send a bearer token instead of the cookie.';
  }
  return null;
}

export const sameOriginChanges: RequestHandler = (req, _res, next) => {
  if (SAFE_METHODS.has(req.method)) return next();
  const message = refusal(req);
  if (!message) return next();
  logger.warn(
    { requestId: req.id, method: req.method, path: req.path, origin: req.get('origin'), site: req.get('sec-fetch-site') },
    'cross-origin change refused',
  );
  next(new AppError(403, 'cross_origin', message));
};
