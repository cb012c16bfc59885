/**
 * `Idempotency-Key` on creating POSTs (IETF draft-ietf-httpapi-idempotency-key-header): a
 * client that did not get the answer to a creation sends it again with the same key and is
 * answered what the first request was answered, instead of creating a second finding.
 *
 * - The key is the caller's (per account: a service token and a person never share keys),
 *   kept IDEMPOTENCY_KEY_HOURS after first use.
 * - Same key, same request (method, path and JSON body, compared by SHA-256): the stored
 *   status and body again, with `Idempotent-Replayed: true`.
 * - Same key, another request: 422 `idempotency_key_reused`.
 * - Same key while the first request is still running: 409 `idempotency_key_in_use`.
 * - A request that failed (any error answer) created nothing and frees its key.
 * Routes whose answer holds a secret shown once (a gateway key, an API token) or that take
 * a file do not take a key (400 `idempotency_not_supported`): replaying would keep the
 * secret, or compare no file.
 */
import { createHash } from 'node:crypto';
import type { Request, Response } from 'express';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import * as repo from './idempotency-repository.ts';

export const IDEMPOTENCY_HEADER = 'Idempotency-Key';
const KEY_PATTERN = /^[\x21-\x7e]{1,255}$/;

/** Creating POSTs: a 201 among the success answers. */
export const isCreating = (spec: RouteSpec) =>
  spec.method === 'post' && [spec.schemas?.status ?? 200].flat().includes(201);

/** Creating POSTs that take a key (see above for those that do not). */
export const takesIdempotencyKey = (spec: RouteSpec) =>
  isCreating(spec) && !spec.schemas?.form && spec.idempotency !== 'refused';

const requestHash = (req: Request) =>
  createHash('sha256')
    .update(`${req.method} ${req.baseUrl}${req.path}\n${JSON.stringify(req.body ?? null)}`)
    .digest('hex');

/** Wraps a creating route's handler; requests without the header pass through unchanged. */
export function idempotentHandler(ctx: AppContext, spec: RouteSpec): RouteSpec['handler'] {
  const supported = takesIdempotencyKey(spec);
  return async (req: Request, res: Response) => {
    const key = req.get(IDEMPOTENCY_HEADER);
    if (key === undefined) return spec.handler(req, res);
    if (!supported)
      throw new AppError(
        'idempotency_not_supported',
        'This operation does not take an Idempotency-Key (its answer holds a secret shown once, or it takes a file).',
        400,
      );
    if (!KEY_PATTERN.test(key))
      throw new AppError(
        'validation_failed',
        'Idempotency-Key is 1 to 255 printable ASCII characters.',
        400,
        [{ path: IDEMPOTENCY_HEADER, message: '1 to 255 printable ASCII characters' }],
      );
    const user = requireUser(req);
    const hash = requestHash(req);
    const ttlS = ctx.config.IDEMPOTENCY_KEY_HOURS * 3600;
    const claim = await repo.claimKey(ctx.db, user.id, key, hash, ttlS);
    if ('existing' in claim) {
      const row = claim.existing;
      if (row.requestHash !== hash)
        throw new AppError(
          'idempotency_key_reused',
          'This Idempotency-Key was used for another request; use a new key for a new request.',
          422,
        );
      if (row.status === null)
        throw new AppError(
          'idempotency_key_in_use',
          'A request with this Idempotency-Key is still being answered; try again shortly.',
          409,
          undefined,
          { headers: { 'Retry-After': '1' } },
        );
      res.setHeader('Idempotent-Replayed', 'true');
      res.status(row.status);
      if (row.responseBody === null) return res.end();
      res.type('application/json').send(row.responseBody);
      return;
    }
    if (Math.random() < 0.05) await repo.purgeExpired(ctx.db).catch(() => {});
    const send = res.json.bind(res);
    let answer: { status: number; body: unknown } | null = null;
    res.json = (body: unknown) => {
      answer = { status: res.statusCode, body };
      return res;
    };
    try {
      await spec.handler(req, res);
    } catch (err) {
      res.json = send;
      await repo.releaseKey(ctx.db, claim.claimed);
      throw err;
    }
    res.json = send;
    const got = answer as { status: number; body: unknown } | null;
    if (got && got.status < 300) {
      await repo.completeKey(ctx.db, claim.claimed, got.status, JSON.stringify(got.body));
    } else if (!got && res.statusCode < 300) {
      await repo.completeKey(ctx.db, claim.claimed, res.statusCode, null);
    } else {
      await repo.releaseKey(ctx.db, claim.claimed);
    }
    if (got) send(got.body);
  };
}
