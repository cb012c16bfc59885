import { cn } from '../../lib/cn.ts';

const looks = {
  /** On a sunken band, as in the users and mail tables. */
  sunken: { head: 'bg-sunken', cell: 'px-3 py-2' },
  /** Ruled off below, as in the tables of a settings card (gateways, tokens, webhooks, audit). */
  ruled: { head: 'border-b border-line', cell: 'px-4 py-2' },
} as const;

/**
 * The header row of a plain data table on a card: one label per column, and an optional
 * right-aligned last column for row actions (its label can be for screen readers only).
 */
export function TableHead({
  columns,
  actions,
  look = 'sunken',
}: {
  columns: string[];
  actions?: { label: string; visible: boolean };
  look?: keyof typeof looks;
}) {
  const { head, cell } = looks[look];
  return (
    <thead className={cn(head, 'text-left text-xs text-ink-muted')}>
      <tr>
        {columns.map((c) => (
          <th key={c} className={cn(cell, 'font-medium')}>
            {c}
          </th>
        ))}
        {actions && (
          <th className={cn(cell, 'text-right font-medium')}>
            {actions.visible ? actions.label : <span className="sr-only">{actions.label}</span>}
          </th>
        )}
      </tr>
    </thead>
  );
}
