import type { TrendEventMarker } from '../../../components/charts/trend-chart.tsx';
import { stripStyle } from '../../../components/charts/trend-series-option.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { cn } from '../../../lib/cn.ts';

const shapes: Record<string, string> = {
  triangle: 'M5 1 9 9 1 9z',
  circle: 'M5 1a4 4 0 1 0 0.01 0z',
  diamond: 'M5 0.5 9.5 5 5 9.5 0.5 5z',
  rect: 'M1.5 1.5h7v7h-7z',
  pin: 'M5 9.5 2 5.5a3.5 3.5 0 1 1 6 0z',
};

/** An event kind's symbol as drawn on the chart (shape and colour). */
export function EventSymbol({ kind }: { kind: TrendEventMarker['kind'] }) {
  const s = stripStyle[kind];
  return (
    <svg width="10" height="10" aria-hidden="true" className="shrink-0">
      <path
        d={shapes[s.symbol] ?? shapes.rect}
        fill={s.hollow ? 'var(--color-surface)' : s.colour}
        stroke={s.colour}
        strokeWidth="1.3"
      />
    </svg>
  );
}

/**
 * The trend's events as a list under the chart: each one's time and text, for reading and
 * for the keyboard. Pointing at or focusing one shows its text on the chart by its symbol.
 */
export function TrendEventsList({
  events,
  active,
  onActive,
}: {
  events: readonly TrendEventMarker[];
  active: number | null;
  onActive: (index: number | null) => void;
}) {
  if (events.length === 0) return null;
  return (
    <section aria-label="Events on this trend" className="flex flex-col gap-1">
      <h3 className="text-xs font-medium text-ink-muted">Events on this trend ({events.length})</h3>
      <ul className="flex max-h-48 flex-col overflow-y-auto rounded-md border border-line">
        {events.map((e, i) => (
          <li key={i} className="border-b border-line last:border-b-0">
            <button
              type="button"
              aria-current={active === i ? 'true' : undefined}
              onMouseEnter={() => onActive(i)}
              onMouseLeave={() => onActive(null)}
              onFocus={() => onActive(i)}
              onBlur={() => onActive(null)}
              className={cn(
                'flex w-full items-baseline gap-2 px-2.5 py-1 text-left text-xs text-ink hover:bg-sunken',
                active === i && 'bg-accent-soft',
              )}
            >
              <EventSymbol kind={e.kind} />
              <span className="font-mono whitespace-nowrap text-ink-muted">
                {formatDateTime(String(e.t))}
              </span>
              <span>{e.label}</span>
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}
