import { cn } from '../../lib/cn.ts';

const looks = {
  /** On a sunken band, as in the users and mail tables. */
  sunken: { head: 'bg-sunken', row: '', cell: 'px-3 py-2' },
  /** Ruled off below, as in the tables of a settings card (gateways, tokens, webhooks, audit). */
  ruled: { head: 'border-b border-line', row: '', cell: 'px-4 py-2' },
  /** On a light band, labels on one line, as in the findings list. */
  band: { head: 'bg-sunken/60', row: '', cell: 'px-3 py-2 whitespace-nowrap' },
  /** Ruled off below, on a card of its own (a machine's points). */
  lined: { head: '', row: 'border-b border-line', cell: 'px-3 py-2' },
  /** Ruled off below, tight, for a small table beside other text (fault frequencies). */
  compact: { head: '', row: 'border-b border-line', cell: 'py-1 pr-4 last:pr-0' },
  /** Tighter still, inside a list (a diagnosis hint's evidence). */
  dense: { head: '', row: '', cell: 'py-0.5 pr-2 last:pr-0' },
} as const;

/**
 * One column: its label, `numeric` to align it right over numbers, and any classes of its own
 * (e.g. one that hides it on narrow screens).
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
  const { head, row, cell } = looks[look];
  return (
    <thead className={cn(head, 'text-left text-xs text-ink-muted')}>
      <tr className={row || undefined}>
        {columns.map((c) => {
          const { label, numeric, className } = typeof c === 'string' ? { label: c } : c;
          return (
            <th key={label} className={cn(className, cell, numeric && 'text-right', 'font-medium')}>
              {label}
            </th>
          );
        })}
        {actions && (
          <th
            data-print={actions.printHidden ? 'hide' : undefined}
            className={cn(cell, 'text-right font-medium')}
          >
            {actions.visible ? actions.label : <span className="sr-only">{actions.label}</span>}
          </th>
        )}
      </tr>
    </thead>
  );
}
