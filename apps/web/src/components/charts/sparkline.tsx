import { LevelLine } from './level-line.tsx';

/**
 * A tiny trend drawn as inline SVG (no ECharts: a machine page may show many, and they
 * should appear at once). Optional alert and danger level lines, dashed.
 */
export function Sparkline({
  values,
  alertLevel,
  dangerLevel,
  width = 120,
  height = 28,
  label,
}: {
  values: readonly number[];
  alertLevel?: number | null;
  dangerLevel?: number | null;
  width?: number;
  height?: number;
  label: string;
}) {
  if (values.length < 2)
    return (
      <span className="text-xs text-ink-faint" aria-label={label}>
        too few values
      </span>
    );
  const hi = Math.max(...values, alertLevel ?? 0, dangerLevel ?? 0) * 1.05 || 1;
  const lo = 0;
  const x = (i: number) => (i / (values.length - 1)) * (width - 2) + 1;
  const y = (v: number) => height - 1 - ((v - lo) / (hi - lo)) * (height - 2);
  const d = values
    .map((v, i) => `${i === 0 ? 'M' : 'L'}${x(i).toFixed(1)},${y(v).toFixed(1)}`)
    .join('');
  return (
    <svg width={width} height={height} role="img" aria-label={label} className="overflow-visible">
      {alertLevel != null && alertLevel <= hi && (
        <LevelLine y={y(alertLevel)} width={width} colour="var(--color-status-alert)" dash="3 2" />
      )}
      {dangerLevel != null && (
        <LevelLine
          y={y(dangerLevel)}
          width={width}
          colour="var(--color-status-danger)"
          dash="6 2"
        />
      )}
      <path
        d={d}
        fill="none"
        stroke="var(--color-accent)"
        strokeWidth={1.4}
        strokeLinejoin="round"
      />
      <circle
        cx={x(values.length - 1)}
        cy={y(values[values.length - 1]!)}
        r={2}
        fill="var(--color-accent)"
      />
    </svg>
  );
}
