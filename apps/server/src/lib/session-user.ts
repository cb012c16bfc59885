import type { Role } from '@turnstone/contracts/roles';

/** The signed-in user as every route sees it. Admins see every site. */
export interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  siteIds: number[];
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
