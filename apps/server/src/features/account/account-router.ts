import type { Request } from 'express';
import type { z } from 'zod';
import {
  changePasswordSchema,
  preferencesSchema,
  subscriptionSettingsResponseSchema,
  subscriptionSettingsSchema,
} from '@turnstone/contracts/account';
import type { AppContext } from '../../lib/context.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import { attemptLimiter, runLimits } from '../../lib/attempt-limits.ts';
import { ALL_ROLES, requireUser, serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import { COOKIE_NAME, signSession } from '../auth/session-token.ts';
import * as service from './account-service.ts';

/**
 * A setting of the caller's own: every role reads it by GET and replaces it by PUT at one
 * path, and both answer it in the same shape.
 */
function ownSetting<B extends z.ZodType>(setting: {
  path: string;
  response: z.ZodType;
  read: { summary: string; run: (user: SessionUser) => unknown };
  change: {
    summary: string;
    body: B;
    run: (user: SessionUser, body: z.output<B>) => unknown;
  };
}): RouteSpec[] {
  const { path, response, read, change } = setting;
  return [
    serviceRoute({
      method: 'get',
      path,
      access: ALL_ROLES,
      summary: read.summary,
      schemas: { response },
      run: (input) => read.run(input.user),
    }),
    serviceRoute({
      method: 'put',
      path,
      access: ALL_ROLES,
      summary: change.summary,
      schemas: { body: change.body, response },
      run: (input) => change.run(input.user, input.body as z.output<B>),
    }),
  ];
}

export function accountRoutes(ctx: AppContext): RouteSpec[] {
  // A stolen session must not become a password oracle: wrong current passwords are
  // limited per user as sign-in limits them per account.
  const passwordLimits = [
    attemptLimiter({
      windowMs: ctx.config.SIGN_IN_WINDOW_MIN * 60_000,
      limit: ctx.config.SIGN_IN_MAX_PER_ACCOUNT,
      key: (req) => `change-password:${requireUser(req).id}`,
      failuresOnly: true,
      message: (minutes) =>
        `Too many wrong current passwords. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
    }),
  ];
  const cookie = (req: Request) => ({
    httpOnly: true,
    sameSite: 'lax' as const,
    secure: ctx.config.COOKIE_SECURE || req.secure,
    path: '/',
    maxAge: ctx.config.SESSION_HOURS * 3600 * 1000,
  });
  return [
    {
      method: 'post',
      path: '/account/password',
      access: ALL_ROLES,
      summary: 'change my password',
      schemas: { body: changePasswordSchema, status: 204 },
      handler: async (req, res) => {
        const user = requireUser(req);
        await runLimits(passwordLimits, req, res);
        const body = changePasswordSchema.parse(req.body);
        const version = await service.changePassword(ctx, user, body);
        // Other sessions end with the old version; this one continues on a new cookie.
        res.cookie(
          COOKIE_NAME,
          signSession(ctx.jwtSecret, user.id, version, ctx.config.SESSION_HOURS),
          cookie(req),
        );
        res.status(204).end();
      },
    },
    ...ownSetting({
      path: '/account/preferences',
      response: preferencesSchema,
      read: {
        summary: 'my display preferences (unit system)',
        run: (user) => ({ unitSystem: user.unitSystem }),
      },
      change: {
        summary: 'change my display preferences (unit system)',
        body: preferencesSchema,
        run: (user, body) => service.putPreferences(ctx, user, body),
      },
    }),
    ...ownSetting({
      path: '/account/subscriptions',
      response: subscriptionSettingsResponseSchema,
      read: {
        summary: 'my notification settings',
        run: (user) => service.getSubscriptions(ctx, user),
      },
      change: {
        summary: 'change my notification settings',
        body: subscriptionSettingsSchema,
        run: (user, body) => service.putSubscriptions(ctx, user, body),
      },
    }),
  ];
}
