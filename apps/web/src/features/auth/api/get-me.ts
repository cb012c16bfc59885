import type { Me } from '@turnstone/contracts/auth';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/**
 * The signed-in user, or `null` when there is no session. Asked of `/auth/session`, which
 * answers 200 either way: a 401 here would be logged by the browser as an error on every
 * visit to the sign-in page.
 */
export async function getMe({ signal }: { signal?: AbortSignal } = {}): Promise<Me | null> {
  // The schema (and zod) load beside the request: the shell that asks this carries no zod.
  const schema = import('@turnstone/contracts/auth').then((m) => m.sessionResponseSchema);
  const carried = takePageSession();
  if (carried !== undefined) {
    // Checked like an answer; one that does not pass is asked for again.
    const checked = (await schema).safeParse(carried);
    if (checked.success) return checked.data.user;
  }
  const session = await api.get('/api/v1/auth/session', { schema, signal });
  return session.user;
}

/**
 * The session the server put in the page (apps/server/src/lib/index-page.ts), taken once:
 * the first check of a direct load needs no request. Later checks (after sign-out, expiry,
 * a refetch) ask the server. `undefined` when the page carries none (e.g. the dev server).
 */
function takePageSession(): unknown {
  const el = document.getElementById('turnstone-session');
  if (!el) return undefined;
  el.remove();
  try {
    return JSON.parse(el.textContent ?? '') as unknown;
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
