import { useState, type ReactNode } from 'react';

export interface ValuesColumn {
  /** Header text, with the unit, e.g. "Time (ms)". */
  header: string;
  /** Numbers right-aligned. @default false */
  numeric?: boolean;
}

/**
 * A chart's values as a table, for the keyboard and screen readers: a disclosure ("Values as
 * a table") that builds its rows only when opened, in a focusable scroll box (so the keyboard
 * can scroll it) with a caption saying what the rows are.
 */
export function ValuesTable({
  summary,
  caption,
  note,
  columns,
  rows,
  label,
}: {
  /** The disclosure's text, e.g. "Values as a table (21)". */
  summary: string;
  /** Announced with the table: what one row is, the unit, the order. */
  caption: string;
  /** Shown above the table (e.g. how the rows were thinned out). */
  note?: ReactNode;
  columns: readonly ValuesColumn[];
  /** Called when open; one array of cell texts per row. */
  rows: () => readonly (readonly string[])[];
  /** Name of the scroll box. */
  label: string;
}) {
  const [open, setOpen] = useState(false);
  return (
    <details
      className="px-2 text-sm"
      onToggle={(e) => setOpen((e.currentTarget as HTMLDetailsElement).open)}
    >
      <summary className="w-fit cursor-pointer rounded-sm text-xs font-medium text-ink-muted hover:text-ink">
        {summary}
      </summary>
      {open && (
        <>
          {note && <p className="mt-2 text-xs text-ink-muted">{note}</p>}
          <div
            className="mt-2 max-h-72 w-fit max-w-full overflow-auto rounded-md border border-line"
            tabIndex={0}
            role="region"
            aria-label={label}
          >
            <table className="text-left">
              <caption className="sr-only">{caption}</caption>
              <thead className="sticky top-0 bg-surface">
                <tr className="border-b border-line text-xs text-ink-muted">
                  {columns.map((c) => (
                    <th
                      key={c.header}
                      scope="col"
                      className={`px-4 py-1.5 font-medium ${c.numeric ? 'text-right' : ''}`}
                    >
                      {c.header}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody className="font-mono text-[13px]">
                {rows().map((r, i) => (
                  <tr key={i} className="border-b border-line/60 last:border-0">
                    {r.map((cell, j) => (
                      <td
                        key={j}
                        className={`px-4 py-1 ${columns[j]?.numeric ? 'text-right' : ''}`}
                      >
                        {cell}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </>
      )}
    </details>
  );
}
