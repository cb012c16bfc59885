/**
 * Attempt limits for the credential routes (sign-in, password change, link flows), on
 * express-rate-limit's fixed-window memory store. A refusal is 429 with the error shape and
 * a `Retry-After` of the seconds left in *this* counter's window (not the window's length).
 */
import type { Request, RequestHandler, Response } from 'express';
import { rateLimit, ipKeyGenerator, type RateLimitInfo } from 'express-rate-limit';
import { AppError } from './app-error.ts';

let counter = 0;

export interface AttemptLimit {
  windowMs: number;
  limit: number;
  key: (req: Request) => string;
  /** The message of the 429; gets the wait in whole minutes. */
  message: (minutes: number) => string;
  /** Count only failed attempts (status ≥ 400); a success does not use up the allowance. */
  failuresOnly?: boolean;
  /** Requests this limit does not apply to (still passed on). */
  skip?: (req: Request) => boolean;
}

/** The seconds until `info`'s window ends, at least 1. */
export function secondsLeft(info: RateLimitInfo | undefined, windowMs: number): number {
  const reset = info?.resetTime?.getTime();
  const ms = reset === undefined ? windowMs : reset - Date.now();
  return Math.max(1, Math.ceil(ms / 1000));
}

export function attemptLimiter(opts: AttemptLimit): RequestHandler {
  const prop = `attemptLimit${++counter}`;
  return rateLimit({
    windowMs: opts.windowMs,
    limit: opts.limit,
    keyGenerator: opts.key,
    requestPropertyName: prop,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    skipSuccessfulRequests: opts.failuresOnly ?? false,
    skip: opts.skip,
    handler: (req, _res, next) => {
      const info = (req as unknown as Record<string, RateLimitInfo | undefined>)[prop];
      const seconds = secondsLeft(info, opts.windowMs);
      next(
        new AppError('rate_limited', opts.message(Math.ceil(seconds / 60)), 429, undefined, {
          headers: { 'Retry-After': String(seconds) },
        }),
      );
    },
  });
}

/** The client's address as the limits see it (IPv6 grouped by /56, as express-rate-limit does). */
export const clientKey = (req: Request) => ipKeyGenerator(req.ip ?? 'unknown');

/** Runs middlewares in order inside a route handler; a refusal rejects with its error. */
export function runLimits(limits: RequestHandler[], req: Request, res: Response): Promise<void> {
  return limits.reduce(
    (done, mw) =>
      done.then(
        () =>
          new Promise<void>((resolve, reject) => {
            void mw(req, res, (err?: unknown) => (err ? reject(err) : resolve()));
          }),
      ),
    Promise.resolve(),
  );
}
