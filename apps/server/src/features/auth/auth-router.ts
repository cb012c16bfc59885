import { readFromPrimary } from '@turnstone/db/replicas';
import { Router, type Request, type Response, type CookieOptions } from 'express';
import { createHmac, timingSafeEqual } from 'node:crypto';
import {
  meSchema,
  sessionResponseSchema,
  signInRequestSchema,
  signInResponseSchema,
  type SessionResponse,
} from '@turnstone/contracts/auth';
import { AppError } from '../../lib/app-error.ts';
import { attemptLimiter, clientKey } from '../../lib/attempt-limits.ts';
import type { AppContext } from '../../lib/context.ts';
import {
  ALL_ROLES,
  mountRoutes,
  requireUser,
  type Authenticate,
  type RouteSpec,
} from '../../lib/route-table.ts';
import * as service from './auth-service.ts';
import { COOKIE_NAME, signSession } from './session-token.ts';
import type { SessionUser } from '../../lib/session-user.ts';

/**
 * The service account behind an `Authorization: Bearer` token, or null when the token is
 * unknown or revoked. The API-token feature provides it (app.ts passes it in), so sign-in
 * does not depend on how tokens are issued and stored.
 */
export type BearerLookup = (token: string) => Promise<SessionUser | null>;

/**
 * Puts the caller on the request (or leaves it empty): a service account from an
 * `Authorization: Bearer` API token, else a person from the session cookie. A bearer
 * header that is not a live token is a 401 even when a cookie is present too.
 */
export function createAuthenticate(ctx: AppContext, bearerUser: BearerLookup): Authenticate {
  return async (req: Request) => {
    if (req.user) return;
    const bearer = /^Bearer\s+(\S+)\s*$/i.exec(req.get('authorization') ?? '');
    if (bearer) {
      // On the primary: a token revoked a moment ago must not pass on a lagging replica.
      const user = await readFromPrimary(() => bearerUser(bearer[1]!));
      if (!user)
        throw new AppError(
          'invalid_token',
          'The API token is not valid or was revoked.',
          401,
          undefined,
          {
            headers: { 'WWW-Authenticate': 'Bearer realm="turnstone", error="invalid_token"' },
          },
        );
      req.user = user;
      return;
    }
    const token = (req.cookies as Record<string, string> | undefined)?.[COOKIE_NAME];
    if (!token) return;
    // On the primary even for a replica read: a session ended or an account disabled a
    // moment ago must not pass on a replica that is a few seconds behind.
    const user = await readFromPrimary(() => service.userFromToken(ctx.db, ctx.jwtSecret, token));
    if (user) req.user = user;
  };
}

/**
 * The session as `/auth/session` answers it: the signed-in user, or null. The web app's page
 * carries the same answer (lib/index-page.ts), so a direct load need not ask for it.
 */
export function sessionOf(ctx: AppContext, authenticate: Authenticate) {
  return async (req: Request): Promise<SessionResponse> => {
    await authenticate(req);
    return { user: req.user ? await service.toMe(ctx.db, req.user) : null };
  };
}

function cookieOptions(ctx: AppContext, req: Request): CookieOptions {
  return {
    httpOnly: true,
    sameSite: 'lax',
    secure: ctx.config.COOKIE_SECURE || req.secure,
    path: '/',
    maxAge: ctx.config.SESSION_HOURS * 3600 * 1000,
  };
}

export function authRoutes(ctx: AppContext, authenticate: Authenticate): RouteSpec[] {
  return [
    {
      method: 'post',
      path: '/auth/sign-in',
      access: 'public',
      summary: 'sign in',
      schemas: { body: signInRequestSchema, response: signInResponseSchema },
      handler: async (req: Request, res: Response) => {
        const body = signInRequestSchema.parse(req.body);
        const row = await service.checkCredentials(ctx.db, body.email, body.password);
        const user = await service.sessionUserOf(ctx.db, row);
        const token = signSession(
          ctx.jwtSecret,
          row.id,
          row.tokenVersion,
          ctx.config.SESSION_HOURS,
        );
        res.cookie(COOKIE_NAME, token, cookieOptions(ctx, req));
        res.cookie(KNOWN_CLIENT_COOKIE, knownClientValue(ctx, row.email.toLowerCase()), {
          ...cookieOptions(ctx, req),
          maxAge: 180 * 24 * 3600 * 1000,
        });
        res.json({ user: await service.toMe(ctx.db, user) });
      },
    },
    {
      method: 'post',
      path: '/auth/sign-out',
      access: ALL_ROLES,
      summary: 'sign out',
      schemas: { status: 204 },
      handler: async (req: Request, res: Response) => {
        const user = requireUser(req);
        await service.endSessions(ctx.db, user.id);
        res.clearCookie(COOKIE_NAME, { ...cookieOptions(ctx, req), maxAge: undefined });
        res.status(204).end();
      },
    },
    {
      method: 'get',
      path: '/auth/session',
      access: 'public',
      summary: 'the session, if any',
      schemas: { response: sessionResponseSchema },
      handler: async (req: Request, res: Response) => {
        const session = await sessionOf(ctx, authenticate)(req);
        res.setHeader('Cache-Control', 'no-store');
        res.json(session);
      },
    },
    {
      method: 'get',
      path: '/me',
      access: ALL_ROLES,
      summary: 'who am I',
      schemas: { response: meSchema },
      handler: async (req: Request, res: Response) => {
        res.setHeader('Cache-Control', 'no-store');
        res.json(await service.toMe(ctx.db, requireUser(req)));
      },
    },
  ];
}

/**
 * A client that has signed in to an account before carries this cookie (an HMAC of the
 * address under the session secret, so it cannot be made up without signing in). The
 * account-wide back-off does not apply to it, so a stranger's wrong guesses never lock the
 * owner out of a browser they have used before (OWASP's "device cookie" lockout defence).
 */
const KNOWN_CLIENT_COOKIE = 'turnstone_client';
const knownClientValue = (ctx: AppContext, email: string) =>
  createHmac('sha256', ctx.jwtSecret).update(`known-client:${email}`).digest('base64url');
const emailOf = (req: Request) =>
  typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
function isKnownClient(ctx: AppContext, req: Request): boolean {
  const v = (req.cookies as Record<string, string> | undefined)?.[KNOWN_CLIENT_COOKIE];
  if (!v) return false;
  const want = Buffer.from(knownClientValue(ctx, emailOf(req)));
  const got = Buffer.from(v);
  return got.length === want.length && timingSafeEqual(got, want);
}

/**
 * Sign-in limits, counting failed attempts only:
 * - per client address (SIGN_IN_MAX_PER_IP in the window): one client guessing many accounts;
 * - per account and client (SIGN_IN_MAX_PER_ACCOUNT): one client guessing one account;
 * - per account from all clients together, four times as many: a slower back-off against a
 *   guess spread over many addresses, which a known client of the account is exempt from.
 * Wrong guesses from elsewhere therefore never lock the owner out of their own browser.
 */
function signInLimits(ctx: AppContext) {
  const windowMs = ctx.config.SIGN_IN_WINDOW_MIN * 60_000;
  const message = (what: string) => (minutes: number) =>
    `Too many sign-in attempts ${what}. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`;
  return [
    attemptLimiter({
      windowMs,
      limit: ctx.config.SIGN_IN_MAX_PER_IP,
      key: (req) => `ip:${clientKey(req)}`,
      failuresOnly: true,
      message: message('from this address'),
    }),
    attemptLimiter({
      windowMs,
      limit: ctx.config.SIGN_IN_MAX_PER_ACCOUNT,
      key: (req) => `acct-client:${emailOf(req)}|${clientKey(req)}`,
      failuresOnly: true,
      message: message('for this account from this address'),
    }),
    attemptLimiter({
      windowMs,
      limit: ctx.config.SIGN_IN_MAX_PER_ACCOUNT * 4,
      key: (req) => `acct:${emailOf(req)}`,
      failuresOnly: true,
      skip: (req) => isKnownClient(ctx, req),
      message: message('for this account'),
    }),
  ];
}

export function authRouter(ctx: AppContext, authenticate: Authenticate): Router {
  const router = Router();
  router.post('/auth/sign-in', ...signInLimits(ctx));
  mountRoutes(router, authRoutes(ctx, authenticate), authenticate);
  return router;
}

export { AppError };
