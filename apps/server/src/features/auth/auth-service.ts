import type { Db } from '@turnstone/db/client';
import type { Me } from '@turnstone/contracts/auth';
import { AppError } from '../../lib/app-error.ts';
import { verifyPassword } from '../../lib/passwords.ts';
import type { SessionUser } from '../../lib/session-user.ts';
import * as repo from './auth-repository.ts';
import { verifySession } from './session-token.ts';

// Compared against when the address is unknown, so both paths take the same time
// (a bcrypt hash of a throw-away word at the same cost as real ones).
const DUMMY_HASH = '$2b$11$bUFSeS2eEuXqD8d4R2a5tuUXsFFjXhNrCas19YGZnf7tMF7hN1bgK';

export const invalidCredentials = () =>
  new AppError('invalid_credentials', 'E-mail address or password is not correct.', 401);

export async function checkCredentials(
  db: Db,
  email: string,
  password: string,
): Promise<repo.UserRow> {
  const user = await repo.findUserByEmail(db, email);
  const ok = await verifyPassword(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !user.passwordHash || !ok || user.disabledAt) throw invalidCredentials();
  await repo.touchSignIn(db, user.id);
  return user;
}

/** The user behind a session token, or null when the token or the user is no longer valid. */
export async function userFromToken(
  db: Db,
  secret: string,
  token: string,
): Promise<SessionUser | null> {
  const claims = verifySession(secret, token);
  if (!claims) return null;
  const id = Number(claims.sub);
  if (!Number.isInteger(id)) return null;
  const user = await repo.findUserById(db, id);
  if (!user || user.disabledAt || user.tokenVersion !== claims.ver) return null;
  return toSessionUser(user, await repo.siteIdsOf(db, user));
}

export function toSessionUser(user: repo.UserRow, siteIds: number[]): SessionUser {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    siteIds,
    unitSystem: user.unitSystem,
  };
}

export async function sessionUserOf(db: Db, user: repo.UserRow): Promise<SessionUser> {
  return toSessionUser(user, await repo.siteIdsOf(db, user));
}

/**
 * The time zone of screens not tied to one site: the zone of the user's sites when they all
 * share one, otherwise UTC (a planner over London and Berlin reads UTC, named on screen).
 */
export async function displayZoneOf(db: Db, user: SessionUser): Promise<string> {
  const zones = await repo.zonesOfSites(db, user.siteIds);
  return zones.length === 1 ? zones[0]! : 'UTC';
}

export async function toMe(db: Db, user: SessionUser): Promise<Me> {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    siteIds: user.siteIds,
    unitSystem: user.unitSystem,
    timeZone: await displayZoneOf(db, user),
  };
}

/** Ends every session of the user: tokens carry the version they were issued with. */
export async function endSessions(db: Db, userId: number): Promise<void> {
  await repo.bumpTokenVersion(db, userId);
}
