import type { AppContext } from '../../lib/context.ts';
import type { Db } from '@turnstone/db/client';
import { loadRuntime } from './outbox-repository.ts';

/**
 * Base of every link in a message: PUBLIC_URL when set, else the address the web process
 * listens on (kept in settings at start, so a separate worker knows it too).
 */
export async function mailBaseUrl(
  ctx: AppContext,
  db: Pick<Db, 'select'> = ctx.db,
): Promise<string> {
  const base = ctx.config.PUBLIC_URL ?? (await loadRuntime(db))?.baseUrl ?? 'http://127.0.0.1:8080';
  return base.replace(/\/+$/, '');
}

/** The point view: an id only, no token or secret in the link. */
export const pointLink = (base: string, pointId: number) => `${base}/points/${pointId}`;

/** Kinds of mail that carry a single-use sign-in link (a password can be set with it). */
export const LINK_TOKEN_KINDS = ['invite', 'reset'] as const;

/** The token of a link in mail text or HTML (`#token=…`, or `?token=` / `&token=`). */
const TOKEN_IN_LINK = /([#?&]token=)[A-Za-z0-9_-]+/g;
/** The same pattern for MariaDB's REGEXP_REPLACE (PCRE), replacing with `\1hidden`. */
export const TOKEN_IN_LINK_SQL = '([#?&]token=)[A-Za-z0-9_-]+';

/** The text with every link token replaced by "hidden": the link no longer works. */
export function maskLinkTokens(text: string): string;
export function maskLinkTokens(text: string | null): string | null;
export function maskLinkTokens(text: string | null): string | null {
  return text === null ? null : text.replace(TOKEN_IN_LINK, '$1hidden');
}
