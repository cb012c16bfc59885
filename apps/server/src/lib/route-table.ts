/**
 * Every dashboard route is declared in a table with the roles it admits. The table is the
 * one place access is decided, and the role × route test walks it, so a route added
 * without a rule cannot slip through.
 */
import type { Request, Response, NextFunction, Router } from 'express';
import type { Role } from '@turnstone/contracts/roles';
import { forbidden, unauthenticated } from './app-error.ts';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
export const ALL_ROLES: readonly Role[] = ['admin', 'engineer', 'planner', 'operator'];

export interface RouteSpec {
  method: Method;
  /** Express path below the router's mount point, e.g. `/alerts/:id/acknowledge`. */
  path: string;
  /** `public`: no session needed. Otherwise the roles that may call it. */
  access: 'public' | readonly Role[];
  /** Short description, shown in the matrix test's names. */
  summary: string;
  handler: (req: Request, res: Response) => unknown;
}

export type Authenticate = (req: Request) => Promise<void>;

export function mountRoutes(router: Router, specs: RouteSpec[], authenticate: Authenticate): void {
  for (const spec of specs) {
    const guard = async (req: Request, _res: Response, next: NextFunction) => {
      if (spec.access === 'public') return next();
      await authenticate(req);
      if (!req.user) throw unauthenticated();
      if (!spec.access.includes(req.user.role)) throw forbidden();
      next();
    };
    router[spec.method](spec.path, guard, async (req: Request, res: Response) => {
      await spec.handler(req, res);
    });
  }
}

export function requireUser(req: Request) {
  if (!req.user) throw unauthenticated();
  return req.user;
}
