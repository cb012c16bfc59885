import type { Role } from '@turnstone/contracts/roles';
import type { UnitSystem } from '@turnstone/contracts/units';

/** The signed-in user as every route sees it. Admins see every site. */
export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  siteIds: number[];
  /** How the user reads velocity and displacement (CSV exports follow it). */
  unitSystem: UnitSystem;
}

declare module 'express-serve-static-core' {
  interface Request {
    user?: SessionUser;
    requestId?: string;
  }
}

export function canSeeSite(user: SessionUser, siteId: number): boolean {
  return user.role === 'admin' || user.siteIds.includes(siteId);
}
