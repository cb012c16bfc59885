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

/** A key's small drawing: a line across its middle (from the left edge to `to`) and a shape. */
interface KeyMark {
  width: number;
  height: number;
  line?: { to: number; stroke: string; width: number; dash?: string };
  /** An SVG path, filled and/or outlined. */
  shape?: { d: string; fill: string; stroke?: string; width?: number; transform?: string };
}

function Mark({ width, height, line, shape }: KeyMark) {
  return (
    <svg width={width} height={height} aria-hidden="true">
      {line && (
        <line
          x1="0"
          x2={line.to}
          y1={height / 2}
          y2={height / 2}
          stroke={line.stroke}
          strokeWidth={line.width}
          strokeDasharray={line.dash}
        />
      )}
      {shape && (
        <path
          d={shape.d}
          fill={shape.fill}
          stroke={shape.stroke}
          strokeWidth={shape.width}
          transform={shape.transform}
        />
      )}
    </svg>
  );
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
          <Mark
            width={22}
            height={10}
            line={{ to: 22, stroke: s.colour, width: 1.5 }}
            shape={{
              d: seriesSymbolPaths[s.symbol] ?? seriesSymbolPaths.circle!,
              fill: s.colour,
              transform: 'translate(6 0)',
            }}
          />
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

const dashed = '4 3';

/** What the chart's lines and symbols mean, each with its drawing. */
const keys: (KeyMark & { text: string })[] = [
  {
    text: 'Alert level (dashed)',
    width: 22,
    height: 6,
    line: { to: 22, stroke: 'var(--color-status-alert)', width: 1.5, dash: dashed },
  },
  {
    text: 'Danger level (solid)',
    width: 22,
    height: 6,
    line: { to: 22, stroke: 'var(--color-status-danger)', width: 2 },
  },
  {
    text: 'Projection to the next level',
    width: 22,
    height: 8,
    line: { to: 18, stroke: 'var(--color-ink)', width: 1.5, dash: dashed },
    shape: { d: 'M19 4l3-3 3 3-3 3z', fill: 'var(--color-ink)' },
  },
  {
    text: 'Suspect or unusable capture',
    width: 10,
    height: 10,
    shape: { d: 'M1 1h8v8h-8z', fill: 'none', stroke: 'var(--color-status-quality)', width: 1.5 },
  },
  {
    text: 'Capture uploaded from a portable instrument',
    width: 12,
    height: 12,
    shape: {
      d: 'M6 11 2.5 6.5a4 4 0 1 1 7 0z',
      fill: 'var(--color-surface)',
      stroke: 'var(--color-ink)',
      width: 1.3,
    },
  },
];

/** Line styles explained in words, so no meaning rests on colour. */
export function TrendLegend() {
  const item = 'inline-flex items-center gap-1.5';
  return (
    <ul className="flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-muted" aria-label="Chart legend">
      {keys.map(({ text, ...mark }) => (
        <li key={text} className={item}>
          <Mark {...mark} />
          {text}
        </li>
      ))}
      <li className={item}>
        Symbols along the top and vertical lines: alerts, findings, limit changes (point at one, or
        at an event in the list, for its text)
      </li>
    </ul>
  );
}
