import { Router, type Request, type Response, type CookieOptions } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import { signInRequestSchema } from '@turnstone/contracts/auth';
import { AppError } from '../../lib/app-error.ts';
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

/** Reads the session cookie and puts the user on the request (or leaves it empty). */
export function createAuthenticate(ctx: AppContext): Authenticate {
  return async (req: Request) => {
    if (req.user) return;
    const token = (req.cookies as Record<string, string> | undefined)?.[COOKIE_NAME];
    if (!token) return;
    const user = await service.userFromToken(ctx.db, ctx.jwtSecret, token);
    if (user) req.user = user;
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

function limiter(ctx: AppContext, limit: number, key: (req: Request) => string, what: string) {
  return rateLimit({
    windowMs: ctx.config.SIGN_IN_WINDOW_MIN * 60_000,
    limit,
    keyGenerator: key,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    handler: (_req, res, _next, options) => {
      const retryAfter = Math.ceil(options.windowMs / 1000);
      res.setHeader('Retry-After', String(retryAfter));
      res.status(429).json({
        error: {
          code: 'rate_limited',
          message: `Too many sign-in attempts ${what}. Try again in ${Math.ceil(retryAfter / 60)} minutes.`,
        },
      });
    },
  });
}

export function authRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'post',
      path: '/auth/sign-in',
      access: 'public',
      summary: 'sign in',
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
        res.json({ user: service.toMe(user) });
      },
    },
    {
      method: 'post',
      path: '/auth/sign-out',
      access: ALL_ROLES,
      summary: 'sign out',
      handler: async (req: Request, res: Response) => {
        const user = requireUser(req);
        await service.endSessions(ctx.db, user.id);
        res.clearCookie(COOKIE_NAME, { ...cookieOptions(ctx, req), maxAge: undefined });
        res.status(204).end();
      },
    },
    {
      method: 'get',
      path: '/me',
      access: ALL_ROLES,
      summary: 'who am I',
      handler: (req: Request, res: Response) => {
        res.setHeader('Cache-Control', 'no-store');
        res.json(service.toMe(requireUser(req)));
      },
    },
  ];
}

export function authRouter(ctx: AppContext, authenticate: Authenticate): Router {
  const router = Router();
  const accountKey = (req: Request) => {
    const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
    return `acct:${email}`;
  };
  const ipKey = (req: Request) => `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`;
  router.post(
    '/auth/sign-in',
    limiter(ctx, ctx.config.SIGN_IN_MAX_PER_IP, ipKey, 'from this address'),
    limiter(ctx, ctx.config.SIGN_IN_MAX_PER_ACCOUNT, accountKey, 'for this account'),
  );
  mountRoutes(router, authRoutes(ctx), authenticate);
  return router;
}

export { AppError };
