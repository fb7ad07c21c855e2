import jwt from 'jsonwebtoken';
import { config } from '../config';

export const SESSION_COOKIE = 'phaselot_session';

export function issueToken(userId: number): string {
  return jwt.sign({}, config.JWT_SECRET, { subject: String(userId), expiresIn: `${config.TOKEN_TTL_HOURS}h`, issuer: 'phaselot' });
}

/** The user id inside a valid token, or null for a missing, forged or expired one. */
export function userIdFromToken(token: string): number | null {
  try {
    const payload = jwt.verify(token, config.JWT_SECRET, { issuer: 'phaselot' });
    const id = Number(typeof payload === 'object' ? payload.sub : NaN);
    return Number.isInteger(id) ? id : null;
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
