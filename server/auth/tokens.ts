import jwt from 'jsonwebtoken';
import { config } from '../config';

export const SESSION_COOKIE = 'phaselot_session';

/** A signed token naming the user and the server-side session (`jti`) it belongs to; the token is
 * valid only as long as that session row is open (server/auth/sessions.ts). */
export function issueToken(userId: number, sessionId: string, expiresAt: Date): string {
  return jwt.sign({ exp: Math.floor(expiresAt.getTime() / 1000) }, config.JWT_SECRET, { subject: String(userId), jwtid: sessionId, issuer: 'phaselot' });
}

/** The user and session a valid token names, or null for a missing, forged or expired one. */
export function claimsOf(token: string): { userId: number; sessionId: string } | null {
  try {
    const payload = jwt.verify(token, config.JWT_SECRET, { issuer: 'phaselot' });
    if (typeof payload !== 'object') return null;
    const userId = Number(payload.sub);
    return Number.isInteger(userId) && typeof payload.jti === 'string' ? { userId, sessionId: payload.jti } : null;
  } catch {
    return null;
  }
}

export const sessionCookieOptions = {
  httpOnly: true,
  sameSite: 'strict' as const,
  secure: config.NODE_ENV === 'production' && config.PUBLIC_URL.startsWith('https:'),
  maxAge: config.TOKEN_TTL_HOURS * 3600 * 1000,
  path: '/',
};
