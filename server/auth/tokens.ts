import jwt from 'jsonwebtoken';
import { createSecretKey } from 'node:crypto';
import { config } from '../config';

export const SESSION_COOKIE = 'phaselot_session';

/** The server's signing secret as a key object, made once: given a string, the library tries on
 * every call to read it as a public key and builds the secret key only after that throws, a good
 * part of the work of every signed-in request. Every token the server signs uses it. */
export const tokenKey = createSecretKey(Buffer.from(config.JWT_SECRET));

/** A signed token naming the user and the server-side session (`jti`) it belongs to; the token is
 * valid only as long as that session row is open (server/auth/sessions.ts). */
export function issueToken(userId: number, sessionId: string, expiresAt: Date): string {
  return jwt.sign({ exp: Math.floor(expiresAt.getTime() / 1000) }, tokenKey, { subject: String(userId), jwtid: sessionId, issuer: 'phaselot' });
}

/** The user and session a valid token names, or null for a missing, forged or expired one. */
export function claimsOf(token: string): { userId: number; sessionId: string } | null {
  try {
    const payload = jwt.verify(token, tokenKey, { issuer: 'phaselot' });
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
