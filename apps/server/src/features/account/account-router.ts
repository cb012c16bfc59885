import type { Request } from 'express';
import {
  changePasswordSchema,
  preferencesSchema,
  subscriptionSettingsResponseSchema,
  subscriptionSettingsSchema,
} from '@turnstone/contracts/account';
import type { AppContext } from '../../lib/context.ts';
import { attemptLimiter, runLimits } from '../../lib/attempt-limits.ts';
import { ALL_ROLES, requireUser, serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import { COOKIE_NAME, signSession } from '../auth/session-token.ts';
import * as service from './account-service.ts';

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
    serviceRoute({
      method: 'get',
      path: '/account/preferences',
      access: ALL_ROLES,
      summary: 'my display preferences (unit system)',
      schemas: { response: preferencesSchema },
      run: ({ user }) => ({ unitSystem: user.unitSystem }),
    }),
    serviceRoute({
      method: 'put',
      path: '/account/preferences',
      access: ALL_ROLES,
      summary: 'change my display preferences (unit system)',
      schemas: { body: preferencesSchema, response: preferencesSchema },
      run: ({ user, body }) => service.putPreferences(ctx, user, body),
    }),
    serviceRoute({
      method: 'get',
      path: '/account/subscriptions',
      access: ALL_ROLES,
      summary: 'my notification settings',
      schemas: { response: subscriptionSettingsResponseSchema },
      run: ({ user }) => service.getSubscriptions(ctx, user),
    }),
    serviceRoute({
      method: 'put',
      path: '/account/subscriptions',
      access: ALL_ROLES,
      summary: 'change my notification settings',
      schemas: { body: subscriptionSettingsSchema, response: subscriptionSettingsResponseSchema },
      run: ({ user, body }) => service.putSubscriptions(ctx, user, body),
    }),
  ];
}
