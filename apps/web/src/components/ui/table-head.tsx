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
  /** On a light band, labels on one line, as in the findings list. */
  band: { head: cn('bg-sunken/60', plain), cell: 'px-3 py-2 font-medium whitespace-nowrap' },
  /** Ruled off below, on a card of its own (a machine's points). */
  lined: { head: plain, row: 'border-b border-line', cell: 'px-3 py-2 font-medium' },
  /** Small and tight, ruled off below (the values of a trend's zoomed range). */
  compact: {
    head: 'text-ink-muted',
    row: 'border-b border-line',
    cell: 'py-1 pr-3 font-medium',
    last: 'py-1 font-medium',
  },
  /** Tight, wider apart, ruled off below (a machine's fault frequencies). */
  facts: {
    head: plain,
    row: 'border-b border-line',
    cell: 'py-1 pr-4 font-medium',
    last: 'py-1 font-medium',
  },
  /** Tighter still, inside a list (a diagnosis hint's evidence). */
  dense: { head: 'text-ink-muted', cell: 'py-0.5 pr-2 font-medium', last: 'py-0.5 font-medium' },
  /** Spaced capitals, ruled off below (the replay's summary per band). */
  capitals: {
    row: 'border-b border-line text-xs tracking-wide text-ink-muted uppercase',
    cell: 'py-1.5 pr-3',
    last: 'py-1.5',
  },
} satisfies Record<string, Look>;

/**
 * A column's label; a numeric column's label is aligned right, over its numbers. A column
 * may carry classes of its own (e.g. one that hides it on narrow screens).
 */
export type TableColumn = string | { label: string; numeric?: boolean; className?: string };

/**
 * The header row of a plain data table: one label per column, and an optional right-aligned
 * last column for row actions (its label can be for screen readers only, and the column left
 * out of print with `printHidden`).
 */
export function TableHead({
  columns,
  actions,
  look = 'sunken',
}: {
  columns: TableColumn[];
  actions?: { label: string; visible: boolean; printHidden?: boolean };
  look?: keyof typeof looks;
}) {
  const { head, row, cell, last }: Look = looks[look];
  const lastIndex = actions ? -1 : columns.length - 1;
  return (
    <thead className={head}>
      <tr className={row}>
        {columns.map((c, i) => {
          const { label, numeric, className } =
            typeof c === 'string' ? { label: c, numeric: false, className: undefined } : c;
          return (
            <th
              key={label}
              scope="col"
              className={cn(
                className,
                i === lastIndex && last ? last : cell,
                numeric && 'text-right',
              )}
            >
              {label}
            </th>
          );
        })}
        {actions && (
          <th
            scope="col"
            data-print={actions.printHidden ? 'hide' : undefined}
            className={cn(cell, 'text-right')}
          >
            {actions.visible ? actions.label : <span className="sr-only">{actions.label}</span>}
          </th>
        )}
      </tr>
    </thead>
  );
}
