/**
 * The header row of a plain data table on a card: one label per column, and an optional
 * right-aligned last column for row actions (its label can be for screen readers only).
 */
export function TableHead({
  columns,
  actions,
}: {
  columns: string[];
  actions?: { label: string; visible: boolean };
}) {
  return (
    <thead className="bg-sunken text-left text-xs text-ink-muted">
      <tr>
        {columns.map((c) => (
          <th key={c} className="px-3 py-2 font-medium">
            {c}
          </th>
        ))}
        {actions && (
          <th className="px-3 py-2 text-right font-medium">
            {actions.visible ? actions.label : <span className="sr-only">{actions.label}</span>}
          </th>
        )}
      </tr>
    </thead>
  );
}
