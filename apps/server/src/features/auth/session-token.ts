/**
 * Session tokens: HS256 JWTs, algorithm pinned on verify, with expiry, issuer and audience
 * checked (OWASP ASVS 5.0 9.1–9.2). `ver` ties a token to the user's token version, so
 * signing out or disabling a user ends every earlier token.
 */
import jwt from 'jsonwebtoken';

export const ISSUER = 'turnstone';
export const AUDIENCE = 'turnstone-dashboard';
export const COOKIE_NAME = 'turnstone_session';

export interface SessionClaims {
  sub: string;
  ver: number;
}

export function signSession(
  secret: string,
  userId: number,
  tokenVersion: number,
  hours: number,
): string {
  return jwt.sign({ ver: tokenVersion }, secret, {
    algorithm: 'HS256',
    subject: String(userId),
    issuer: ISSUER,
    audience: AUDIENCE,
    expiresIn: Math.round(hours * 3600),
  });
}

/** The claims of a valid token, or null for anything else (expired, tampered, alg none…). */
export function verifySession(secret: string, token: string): SessionClaims | null {
  try {
    const claims = jwt.verify(token, secret, {
      algorithms: ['HS256'],
      issuer: ISSUER,
      audience: AUDIENCE,
    });
    if (
      typeof claims !== 'object' ||
      typeof claims.sub !== 'string' ||
      typeof claims.ver !== 'number'
    )
      return null;
    return { sub: claims.sub, ver: claims.ver };
  } catch {
    return null;
  }
}
