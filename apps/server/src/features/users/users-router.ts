import {
  acceptInviteSchema,
  forgotPasswordResponseSchema,
  forgotPasswordSchema,
  inviteUserSchema,
  resetPasswordSchema,
  updateUserSchema,
  userListSchema,
  userSummarySchema,
} from '@turnstone/contracts/users';
import type { AppContext } from '../../lib/context.ts';
import { attemptLimiter, clientKey, runLimits } from '../../lib/attempt-limits.ts';
import { serviceRoute, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './users-service.ts';
import { idParam } from '../../lib/route-params.ts';

/** Users admin: admin only. */
export function userRoutes(ctx: AppContext): RouteSpec[] {
  return [
    serviceRoute({
      method: 'get',
      path: '/users',
      access: ['admin'],
      summary: 'list users',
      schemas: { response: userListSchema },
      run: () => service.listUsers(ctx.db),
    }),
    serviceRoute({
      method: 'post',
      path: '/users/invite',
      access: ['admin'],
      summary: 'invite a user',
      schemas: { body: inviteUserSchema, response: userSummarySchema, status: 201 },
      run: ({ user, body }) => service.inviteUser(ctx, user, body),
    }),
    serviceRoute({
      method: 'patch',
      path: '/users/:id',
      access: ['admin'],
      summary: 'change a user',
      schemas: { params: idParam, body: updateUserSchema, response: userSummarySchema },
      run: ({ user, params, body }) => service.updateUser(ctx, user, params.id, body),
    }),
    serviceRoute({
      method: 'post',
      path: '/users/:id/disable',
      access: ['admin'],
      summary: 'disable a user',
      schemas: { params: idParam, response: userSummarySchema },
      run: ({ user, params }) => service.setDisabled(ctx, user, params.id, true),
    }),
    serviceRoute({
      method: 'post',
      path: '/users/:id/enable',
      access: ['admin'],
      summary: 'enable a user',
      schemas: { params: idParam, response: userSummarySchema },
      run: ({ user, params }) => service.setDisabled(ctx, user, params.id, false),
    }),
  ];
}

/**
 * Reset requests are limited per address (no one's inbox is flooded) and per client
 * address, with the sign-in limits. A 429 says nothing about whether the account exists.
 */
function resetLimiters(ctx: AppContext) {
  const windowMs = ctx.config.SIGN_IN_WINDOW_MIN * 60_000;
  const message = () => 'Too many reset requests. Try again later.';
  return [
    attemptLimiter({
      windowMs,
      limit: ctx.config.SIGN_IN_MAX_PER_IP,
      key: (req) => `ip:${clientKey(req)}`,
      message,
    }),
    attemptLimiter({
      windowMs,
      limit: ctx.config.SIGN_IN_MAX_PER_ACCOUNT,
      key: (req) => {
        const email =
          typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
        return `acct:${email}`;
      },
      message,
    }),
  ];
}

/**
 * Link submissions (accept an invite, set a new password) are limited per client address:
 * failed attempts count, so a flood of made-up tokens is refused early, while a person
 * with a real link is not held up by it.
 */
function linkLimiters(ctx: AppContext) {
  return [
    attemptLimiter({
      windowMs: ctx.config.SIGN_IN_WINDOW_MIN * 60_000,
      limit: ctx.config.SIGN_IN_MAX_PER_IP,
      key: (req) => `link-ip:${clientKey(req)}`,
      failuresOnly: true,
      message: (minutes) =>
        `Too many attempts with invalid links from this address. Try again in ${minutes} minutes.`,
    }),
  ];
}

/** The public link flows: no session (the link or the address is the credential). */
export function userLinkRoutes(ctx: AppContext): RouteSpec[] {
  const limitResets = resetLimiters(ctx);
  const limitLinks = linkLimiters(ctx);
  /** A link's form: the link limits first, then its token and the new password. */
  const linkRoute = (
    path: string,
    summary: string,
    schema: typeof acceptInviteSchema,
    submit: (ctx: AppContext, token: string, password: string) => Promise<void>,
  ): RouteSpec => ({
    method: 'post',
    path,
    access: 'public',
    summary,
    schemas: { body: schema, status: 204 },
    handler: async (req, res) => {
      await runLimits(limitLinks, req, res);
      const body = schema.parse(req.body);
      await submit(ctx, body.token, body.password);
      res.status(204).end();
    },
  });
  return [
    linkRoute('/auth/accept-invite', 'accept an invite', acceptInviteSchema, service.acceptInvite),
    {
      method: 'post',
      path: '/auth/forgot-password',
      access: 'public',
      summary: 'ask for a reset link',
      schemas: { body: forgotPasswordSchema, response: forgotPasswordResponseSchema, status: 202 },
      handler: async (req, res) => {
        const { email } = forgotPasswordSchema.parse(req.body);
        await runLimits(limitResets, req, res);
        // Answer first, work after: 202 with the same timing whether or not it exists.
        setImmediate(() => {
          service
            .requestPasswordReset(ctx, email)
            .catch((err: unknown) => ctx.log.error('password reset mail failed', { err }));
        });
        res.status(202).json(forgotPasswordResponseSchema.parse({ accepted: true }));
      },
    },
    linkRoute(
      '/auth/reset-password',
      'set a new password from a reset link',
      resetPasswordSchema,
      service.resetPassword,
    ),
  ];
}
