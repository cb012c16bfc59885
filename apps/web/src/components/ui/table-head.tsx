import { cn } from '../../lib/cn.ts';

interface Look {
  head?: string;
  row?: string;
  cell: string;
  /** The last column's cell, where it differs (no padding after the table's last column). */
  last?: string;
}

const plain = 'text-left text-xs text-ink-muted';

const looks = {
  /** On a sunken band, as in the users and mail tables. */
  sunken: { head: cn('bg-sunken', plain), cell: 'px-3 py-2 font-medium' },
  /** Ruled off below, as in the tables of a settings card (gateways, tokens, webhooks, audit). */
  ruled: { head: cn('border-b border-line', plain), cell: 'px-4 py-2 font-medium' },
  /** Small and tight, ruled off below (the values of a trend's zoomed range). */
  compact: {
    head: 'text-ink-muted',
    row: 'border-b border-line',
    cell: 'py-1 pr-3 font-medium',
    last: 'py-1 font-medium',
  },
  /** Spaced capitals, ruled off below (the replay's summary per band). */
  capitals: {
    row: 'border-b border-line text-xs tracking-wide text-ink-muted uppercase',
    cell: 'py-1.5 pr-3',
    last: 'py-1.5',
  },
} satisfies Record<string, Look>;

/** A column's label; a numeric column's label is aligned right, over its numbers. */
export type TableColumn = string | { label: string; numeric: true };

/**
 * The header row of a plain data table: one label per column, and an optional right-aligned
 * last column for row actions (its label can be for screen readers only).
 */
export function TableHead({
  columns,
  actions,
  look = 'sunken',
}: {
  columns: TableColumn[];
  actions?: { label: string; visible: boolean };
  look?: keyof typeof looks;
}) {
  const { head, row, cell, last }: Look = looks[look];
  const lastIndex = actions ? -1 : columns.length - 1;
  return (
    <thead className={head}>
      <tr className={row}>
        {columns.map((c, i) => {
          const label = typeof c === 'string' ? c : c.label;
          return (
            <th
              key={label}
              scope="col"
              className={cn(
                i === lastIndex && last ? last : cell,
                typeof c !== 'string' && 'text-right',
              )}
            >
              {label}
            </th>
          );
        })}
        {actions && (
          <th scope="col" className={cn(cell, 'text-right')}>
            {actions.visible ? actions.label : <span className="sr-only">{actions.label}</span>}
          </th>
        )}
      </tr>
    </thead>
  );
}
