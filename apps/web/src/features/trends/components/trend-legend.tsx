import { seriesSymbolPaths } from './series-symbols.ts';

/** A series as the legend names it: its colour, symbol, name and shown unit. */
export interface LegendSeries {
  key: string;
  name: string;
  unit: string;
  colour: string;
  symbol: string;
  /** Loading, or why it could not be loaded. */
  status?: string;
}

/** The chart's series with their colour and symbol; each added one can be removed. */
export function SeriesLegend({
  series,
  onRemove,
}: {
  series: readonly LegendSeries[];
  onRemove: (key: string) => void;
}) {
  return (
    <ul
      className="flex flex-wrap gap-x-4 gap-y-1.5 text-xs text-ink"
      aria-label="Series on the chart"
    >
      {series.map((s, i) => (
        <li key={s.key} className="inline-flex items-center gap-1.5">
          <svg width="22" height="10" aria-hidden="true">
            <line x1="0" x2="22" y1="5" y2="5" stroke={s.colour} strokeWidth="1.5" />
            <path
              d={seriesSymbolPaths[s.symbol] ?? seriesSymbolPaths.circle}
              transform="translate(6 0)"
              fill={s.colour}
            />
          </svg>
          <span style={{ color: s.colour }} className="font-medium">
            {s.name}
          </span>
          <span className="text-ink-muted">
            ({s.unit}
            {i === 0 ? ', levels drawn' : ''})
          </span>
          {s.status && <span className="text-ink-muted">{s.status}</span>}
          {i > 0 && (
            <button
              type="button"
              onClick={() => onRemove(s.key)}
              aria-label={`Remove ${s.name}`}
              className="rounded px-1 text-ink-muted underline hover:bg-sunken hover:text-ink"
            >
              Remove
            </button>
          )}
        </li>
      ))}
    </ul>
  );
}

/** Line styles explained in words, so no meaning rests on colour. */
export function TrendLegend() {
  const item = 'inline-flex items-center gap-1.5';
  return (
    <ul className="flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-muted" aria-label="Chart legend">
      <li className={item}>
        <svg width="22" height="6" aria-hidden="true">
          <line
            x1="0"
            x2="22"
            y1="3"
            y2="3"
            stroke="var(--color-status-alert)"
            strokeWidth="1.5"
            strokeDasharray="4 3"
          />
        </svg>
        Alert level (dashed)
      </li>
      <li className={item}>
        <svg width="22" height="6" aria-hidden="true">
          <line x1="0" x2="22" y1="3" y2="3" stroke="var(--color-status-danger)" strokeWidth="2" />
        </svg>
        Danger level (solid)
      </li>
      <li className={item}>
        <svg width="22" height="8" aria-hidden="true">
          <line
            x1="0"
            x2="18"
            y1="4"
            y2="4"
            stroke="var(--color-ink)"
            strokeWidth="1.5"
            strokeDasharray="4 3"
          />
          <path d="M19 4l3-3 3 3-3 3z" fill="var(--color-ink)" />
        </svg>
        Projection to the next level
      </li>
      <li className={item}>
        <svg width="10" height="10" aria-hidden="true">
          <rect
            x="1"
            y="1"
            width="8"
            height="8"
            fill="none"
            stroke="var(--color-status-quality)"
            strokeWidth="1.5"
          />
        </svg>
        Suspect or unusable capture
      </li>
      <li className={item}>
        <svg width="12" height="12" aria-hidden="true">
          <path
            d="M6 11 2.5 6.5a4 4 0 1 1 7 0z"
            fill="var(--color-surface)"
            stroke="var(--color-ink)"
            strokeWidth="1.3"
          />
        </svg>
        Capture uploaded from a portable instrument
      </li>
      <li className={item}>
        Symbols along the top and vertical lines: alerts, findings, limit changes (point at one, or
        at an event in the list, for its text)
      </li>
    </ul>
  );
}
