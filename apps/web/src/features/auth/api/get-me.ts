import type { Me, SessionResponse } from '@turnstone/contracts/auth';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/**
 * The signed-in user, or `null` when there is no session. Asked of `/auth/session`, which
 * answers 200 either way: a 401 here would be logged by the browser as an error on every
 * visit to the sign-in page.
 */
export async function getMe({ signal }: { signal?: AbortSignal } = {}): Promise<Me | null> {
  const carried = takePageSession();
  if (carried) return carried.user;
  // The schema (and zod) load beside the request: the shell that asks this carries no zod.
  const schema = import('@turnstone/contracts/auth').then((m) => m.sessionResponseSchema);
  const session = await api.get('/api/v1/auth/session', { schema, signal });
  return session.user;
}

/**
 * The session the server put in the page (apps/server/src/lib/index-page.ts), taken once:
 * the first check of a direct load needs no request. Later checks (after sign-out, expiry,
 * a refetch) ask the server. `undefined` when the page carries none (e.g. the dev server) or
 * a block that is not a session answer; then the server is asked.
 *
 * It is not parsed with the session schema: the server wrote it into this very page from the
 * answer `/auth/session` gives (whose schema the API tests check), and parsing it here would
 * put zod on the first screen's critical path.
 */
function takePageSession(): SessionResponse | undefined {
  const el = document.getElementById('turnstone-session');
  if (!el) return undefined;
  el.remove();
  try {
    const carried = JSON.parse(el.textContent ?? '') as unknown;
    return typeof carried === 'object' && carried !== null && 'user' in carried
      ? (carried as SessionResponse)
      : undefined;
  } catch {
    return undefined;
  }
}

export function getMeQueryOptions() {
  return queryOptions({
    queryKey: ['me', 'detail', {}] as const,
    queryFn: ({ signal }) => getMe({ signal }),
    staleTime: 5 * 60_000,
  });
}

export function useMe() {
  return useQuery(getMeQueryOptions());
}
