import type { Request, Response } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import {
  acceptInviteSchema,
  forgotPasswordSchema,
  inviteUserSchema,
  resetPasswordSchema,
  updateUserSchema,
} from '@turnstone/contracts/users';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import * as service from './users-service.ts';
import { idParam } from '../../lib/route-params.ts';

/** Users admin: admin only. */
export function userRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'get',
      path: '/users',
      access: ['admin'],
      summary: 'list users',
      handler: async (_req, res) => res.json(await service.listUsers(ctx.db)),
    },
    {
      method: 'post',
      path: '/users/invite',
      access: ['admin'],
      summary: 'invite a user',
      handler: async (req, res) => {
        const body = inviteUserSchema.parse(req.body);
        res.status(201).json(await service.inviteUser(ctx, requireUser(req), body));
      },
    },
    {
      method: 'patch',
      path: '/users/:id',
      access: ['admin'],
      summary: 'change a user',
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        const body = updateUserSchema.parse(req.body);
        res.json(await service.updateUser(ctx, requireUser(req), id, body));
      },
    },
    {
      method: 'post',
      path: '/users/:id/disable',
      access: ['admin'],
      summary: 'disable a user',
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(await service.setDisabled(ctx, requireUser(req), id, true));
      },
    },
    {
      method: 'post',
      path: '/users/:id/enable',
      access: ['admin'],
      summary: 'enable a user',
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        res.json(await service.setDisabled(ctx, requireUser(req), id, false));
      },
    },
  ];
}

/**
 * Reset requests are limited per address (no one's inbox is flooded) and per client
 * address, with the sign-in limits. A 429 says nothing about whether the account exists.
 */
function resetLimiters(ctx: AppContext) {
  const make = (limit: number, key: (req: Request) => string) =>
    rateLimit({
      windowMs: ctx.config.SIGN_IN_WINDOW_MIN * 60_000,
      limit,
      keyGenerator: key,
      standardHeaders: 'draft-7',
      legacyHeaders: false,
      handler: (_req, _res, next, options) =>
        next(
          new AppError(
            'rate_limited',
            'Too many reset requests. Try again later.',
            429,
            undefined,
            {
              headers: { 'Retry-After': String(Math.ceil(options.windowMs / 1000)) },
            },
          ),
        ),
    });
  const perIp = make(ctx.config.SIGN_IN_MAX_PER_IP, (req) => `ip:${ipKeyGenerator(req.ip ?? '')}`);
  const perAccount = make(ctx.config.SIGN_IN_MAX_PER_ACCOUNT, (req) => {
    const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
    return `acct:${email}`;
  });
  const run = (mw: typeof perIp, req: Request, res: Response) =>
    new Promise<void>((resolve, reject) => {
      void mw(req, res, (err?: unknown) => (err ? reject(err) : resolve()));
    });
  return async (req: Request, res: Response) => {
    await run(perIp, req, res);
    await run(perAccount, req, res);
  };
}

/** The public link flows: no session (the link or the address is the credential). */
export function userLinkRoutes(ctx: AppContext): RouteSpec[] {
  const limitResets = resetLimiters(ctx);
  return [
    {
      method: 'post',
      path: '/auth/accept-invite',
      access: 'public',
      summary: 'accept an invite',
      handler: async (req, res) => {
        const body = acceptInviteSchema.parse(req.body);
        await service.acceptInvite(ctx, body.token, body.password);
        res.status(204).end();
      },
    },
    {
      method: 'post',
      path: '/auth/forgot-password',
      access: 'public',
      summary: 'ask for a reset link',
      handler: async (req, res) => {
        const { email } = forgotPasswordSchema.parse(req.body);
        await limitResets(req, res);
        // Answer first, work after: 202 with the same timing whether or not it exists.
        setImmediate(() => {
          service
            .requestPasswordReset(ctx, email)
            .catch((err: unknown) => ctx.log.error('password reset mail failed', { err }));
        });
        res.status(202).json({ accepted: true });
      },
    },
    {
      method: 'post',
      path: '/auth/reset-password',
      access: 'public',
      summary: 'set a new password from a reset link',
      handler: async (req, res) => {
        const body = resetPasswordSchema.parse(req.body);
        await service.resetPassword(ctx, body.token, body.password);
        res.status(204).end();
      },
    },
  ];
}
