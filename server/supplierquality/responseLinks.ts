// The supplier's link to answer a corrective-action request without an account: a token signed with
// the server's key that names the request and the link row, valid for 30 days. The row decides the
// rest (revoked, already used), so a link can be withdrawn and works for one submission. The token
// is not stored: it is signed again from the row (same claims, same issue time) when a reminder
// needs it. It travels in the URL's fragment, which browsers never send to a server or a log.
import jwt from 'jsonwebtoken';
import type { Transaction } from 'sequelize';
import { CorrectiveActionLink, type CorrectiveAction } from '../../db/models';
import { tokenKey } from '../auth/tokens';
import { config } from '../config';
import { AppError } from '../http/errors';

export const LINK_DAYS = 30;
const AUDIENCE = 'phaselot:corrective-action-response';

export function tokenOf(link: Pick<CorrectiveActionLink, 'id' | 'correctiveActionId' | 'issuedAt' | 'expiresAt'>) {
  return jwt.sign({ iat: Math.floor(link.issuedAt.getTime() / 1000), exp: Math.floor(link.expiresAt.getTime() / 1000) }, tokenKey, {
    subject: String(link.correctiveActionId),
    jwtid: String(link.id),
    audience: AUDIENCE,
    issuer: 'phaselot',
  });
}

export const responseUrl = (token: string) => `${config.PUBLIC_URL}/respond#token=${token}`;

/** A new link for the request (the caller has revoked or used up the one before). */
export async function issueLink(request: CorrectiveAction, issuedBy: number | null, transaction: Transaction) {
  // Whole seconds: the token carries its times in seconds and is signed again from the row.
  const issuedAt = new Date(Math.floor(Date.now() / 1000) * 1000);
  const link = await CorrectiveActionLink.create(
    { correctiveActionId: request.id, issuedBy, issuedAt, expiresAt: new Date(issuedAt.getTime() + LINK_DAYS * 86_400_000) },
    { transaction },
  );
  return { link, url: responseUrl(tokenOf(link)) };
}

const refused = (status: number, code: string, message: string) => new AppError(status, code, message);

/** The live link a token names, locked for the caller's transaction when one is given; 401 for a
 * forged or malformed token, 410 for one expired, revoked or already used. */
export async function linkOfToken(token: string, transaction?: Transaction) {
  let claims: jwt.JwtPayload;
  try {
    const verified = jwt.verify(token, tokenKey, { audience: AUDIENCE, issuer: 'phaselot' });
    if (typeof verified !== 'object') throw new Error('not a claim set');
    claims = verified;
  } catch (error) {
    if (error instanceof jwt.TokenExpiredError)
      throw refused(410, 'link_expired', `This link expired on ${error.expiredAt.toISOString().slice(0, 10)}. Ask your contact for a new one.`);
    throw refused(401, 'link_invalid', 'This link is not valid. Open the link exactly as it was mailed to you.');
  }
  const link = await CorrectiveActionLink.findByPk(Number(claims.jti), { transaction, lock: transaction?.LOCK.UPDATE });
  // The signed request id must be the row's: a link reaches its own request and no other.
  if (!link || String(link.correctiveActionId) !== claims.sub)
    throw refused(401, 'link_invalid', 'This link is not valid. Open the link exactly as it was mailed to you.');
  if (link.revokedAt)
    throw refused(410, 'link_revoked', 'This link was withdrawn by the buyer. Ask your contact for a new one if an answer is still expected.');
  if (link.submittedAt)
    throw refused(410, 'link_used', `An answer was already sent through this link on ${link.submittedAt.toISOString().slice(0, 10)}. A link takes one answer.`);
  if (link.expiresAt.getTime() <= Date.now())
    throw refused(410, 'link_expired', `This link expired on ${link.expiresAt.toISOString().slice(0, 10)}. Ask your contact for a new one.`);
  return link;
}

/** The link row a token claims to be, read without checking its signature or standing: for the
 * audit entry of a refused submission only. */
export async function claimedLink(token: string) {
  const claims = jwt.decode(token);
  const id = typeof claims === 'object' && claims?.jti ? Number(claims.jti) : NaN;
  return Number.isSafeInteger(id) && id > 0 && id <= 2_147_483_647 ? CorrectiveActionLink.findByPk(id) : null;
}
