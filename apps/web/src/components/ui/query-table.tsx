import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { Card } from './card.tsx';
import { QueryItems } from './query-items.tsx';
import { TableHead } from './table-head.tsx';

/**
 * A list query shown as a table on its own card (gateways, API tokens, webhook receivers):
 * loading, error and empty states as `QueryItems` gives them, then a ruled header row, a last
 * column for row actions named for screen readers, and one row per item from `row`.
 */
export function QueryTable<T>({
  query,
  empty,
  caption,
  columns,
  row,
}: {
  query: UseQueryResult<{ items: T[] }>;
  empty: { title: string; description: string };
  /** The table's name for screen readers. */
  caption: string;
  columns: string[];
  row: (item: T) => ReactNode;
}) {
  return (
    <Card className="overflow-x-auto">
      <QueryItems query={query} empty={empty}>
        {(items) => (
          <table className="w-full text-sm">
            <caption className="sr-only">{caption}</caption>
            <TableHead
              look="ruled"
              columns={columns}
              actions={{ label: 'Actions', visible: false }}
            />
            <tbody>{items.map(row)}</tbody>
          </table>
        )}
      </QueryItems>
    </Card>
  );
}
