import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { EmptyState } from './empty-state.tsx';
import { ErrorState } from './error-state.tsx';
import { LoadingPanel } from './spinner.tsx';

/**
 * A list query's four states in one place: loading, an error with a retry, an empty list
 * (`empty`: the title and a hint) and the items, which `children` lays out.
 */
export function QueryItems<T>({
  query,
  empty,
  children,
}: {
  query: UseQueryResult<{ items: T[] }>;
  empty: { title: string; description: string };
  children: (items: T[]) => ReactNode;
}) {
  if (query.isPending) return <LoadingPanel />;
  if (query.isError)
    return (
      <ErrorState
        error={query.error}
        onRetry={() => void query.refetch()}
        retrying={query.isFetching}
      />
    );
  if (query.data.items.length === 0)
    return <EmptyState title={empty.title} description={empty.description} />;
  return children(query.data.items);
}
