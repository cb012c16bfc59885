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
