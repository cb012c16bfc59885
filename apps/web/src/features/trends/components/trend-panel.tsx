import { useMemo, useState } from 'react';
import type { TrendResponse } from '@turnstone/contracts/trend';
import {
  displayUnit,
  TrendChart,
  type TrendEventMarker,
  type TrendLimitLine,
} from '../../../components/charts/trend-chart.tsx';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Field, Select } from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { formatDate, formatDateTime } from '../../../lib/format.ts';
import { useUnits } from '../../account/api/use-units.ts';
import { trendInUnits } from '../utils/trend-units.ts';
import {
  DEFAULT_TREND_DAYS,
  defaultTrendBand,
  trendAnchor,
  trendCsvHref,
  trendParams,
  useTrend,
} from '../api/get-trend.ts';

export const trendPeriods = [
  { key: '7d', label: 'Last 7 days', days: 7 },
  { key: '30d', label: 'Last 30 days', days: 30 },
  { key: '90d', label: 'Last 90 days', days: 90 },
  { key: '1y', label: 'Last 12 months', days: 365 },
  { key: '3y', label: 'Last 3 years', days: 3 * 365 },
] as const;
type PeriodKey = (typeof trendPeriods)[number]['key'];

const projectionText: Record<TrendResponse['projection']['outcome'], string> = {
  projected: 'projected',
  'too-few-points': 'Too few values in the last 60 days to project.',
  'above-danger': 'The latest value is at or above the danger level.',
  'not-rising': 'Not rising: no crossing projected.',
  'beyond-horizon': 'Rising slowly: no crossing within a year.',
};

const eventLabel: Record<TrendResponse['events'][number]['kind'], string> = {
  raised: 'raised',
  escalated: 'escalated to danger',
  acknowledged: 'acknowledged',
  cleared: 'cleared',
};

export interface TrendPanelBand {
  key: string;
  name: string;
  unit: string;
}

/** Trend of one band with period and band pickers, levels, projection and CSV download. */
export function TrendPanel({
  pointId,
  bands,
  initialBand,
}: {
  pointId: number;
  bands: readonly TrendPanelBand[];
  /** The band to open on (a link's `?band=`); the default band when the point has no such band. */
  initialBand?: string | null;
}) {
  const [band, setBand] = useState(() =>
    initialBand && bands.some((b) => b.key === initialBand) ? initialBand : defaultTrendBand(bands),
  );
  const [period, setPeriod] = useState<PeriodKey>(
    trendPeriods.find((p) => p.days === DEFAULT_TREND_DAYS)!.key,
  );
  // The window is fixed when the period is picked (a minute's resolution), so the query key
  // stays stable between renders.
  const [anchor] = useState(() => trendAnchor());
  const params = useMemo(
    () => trendParams(pointId, band, trendPeriods.find((p) => p.key === period)!.days, anchor),
    [pointId, band, period, anchor],
  );
  const trend = useTrend(params);
  const units = useUnits();

  return (
    <Card className="flex flex-col gap-3 p-4">
      <div className="flex flex-wrap items-end gap-3">
        <Field label="Band" className="min-w-64">
          {(c) => (
            <Select id={c.id} value={band} onChange={(e) => setBand(e.target.value)}>
              {bands.map((b) => (
                <option key={b.key} value={b.key}>
                  {b.name} ({units.unit(b.unit)})
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Period">
          {(c) => (
            <Select
              id={c.id}
              value={period}
              onChange={(e) => setPeriod(e.target.value as PeriodKey)}
            >
              {trendPeriods.map((p) => (
                <option key={p.key} value={p.key}>
                  {p.label}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <a
          href={trendCsvHref(params)}
          download
          className="ml-auto inline-flex h-9 items-center rounded-md border border-line-strong bg-surface px-3 text-[13px] font-medium text-ink hover:bg-sunken"
        >
          Download trend CSV
        </a>
      </div>
      <TrendBody trend={trend} now={anchor} />
    </Card>
  );
}

function TrendBody({ trend, now }: { trend: ReturnType<typeof useTrend>; now: number }) {
  const units = useUnits();
  const data = useMemo(() => trend.data && trendInUnits(trend.data, units), [trend.data, units]);
  const chartProps = useMemo(() => {
    if (!data) return null;
    const limits: TrendLimitLine[] = [
      { value: data.levels.alert, level: 'alert' },
      { value: data.levels.danger, level: 'danger' },
    ];
    const events: TrendEventMarker[] = [
      ...data.events.map((e) => ({
        t: e.t,
        kind: e.kind,
        label: `${e.level === 'danger' ? 'Danger' : 'Alert'} ${eventLabel[e.kind]}${
          e.by ? ` by ${e.by}` : ''
        }${e.note ? `: “${e.note}”` : ''}`,
      })),
      ...data.findings.map((f) => ({
        t: f.t,
        kind: 'finding' as const,
        label: `Finding: ${f.title}${f.workOrderRef ? ` (${f.workOrderRef})` : ''}`,
      })),
    ];
    const last = data.items[data.items.length - 1];
    const p = data.projection;
    const projection =
      p.outcome === 'projected' && p.crossingAt && p.target && last
        ? {
            from: { t: last.t, v: last.v },
            to: { t: p.crossingAt, v: p.target.value },
            label: `${p.target.level === 'danger' ? 'Danger' : 'Alert'} ${formatDate(p.crossingAt)}`,
          }
        : null;
    const baseline = data.baseline
      ? {
          low: Math.max(0, data.baseline.mean - 2 * data.baseline.sigma),
          high: data.baseline.mean + 2 * data.baseline.sigma,
          label: 'Baseline mean ± 2σ',
        }
      : null;
    return { limits, events, projection, baseline };
  }, [data]);

  if (trend.isPending) return <LoadingPanel label="Loading trend…" />;
  if (trend.isError)
    return (
      <ErrorState
        title="Could not load the trend"
        error={trend.error}
        onRetry={() => void trend.refetch()}
      />
    );
  if (!data || !chartProps) return null;
  const unit = displayUnit(data.band.unit);
  const last = data.items[data.items.length - 1];
  const p = data.projection;
  return (
    <div className="flex flex-col gap-3">
      <dl className="flex flex-wrap gap-x-8 gap-y-2 text-sm">
        <Stat
          label="Latest"
          value={last ? `${formatValue(last.v)} ${unit}` : '—'}
          hint={last ? formatDateTime(last.t) : undefined}
        />
        <Stat
          label="Alert level"
          value={`${formatValue(data.levels.alert)} ${unit}`}
          hint={data.levels.source === 'statistical' ? 'statistical' : 'fixed'}
        />
        <Stat label="Danger level" value={`${formatValue(data.levels.danger)} ${unit}`} />
        <Stat
          label="Projection"
          value={
            p.outcome === 'projected' && p.crossingAt && p.target
              ? `${p.target.level === 'danger' ? 'Danger' : 'Alert'} by ${formatDateTime(p.crossingAt)}`
              : projectionText[p.outcome]
          }
          hint={
            p.model
              ? `${p.model} fit, R² ${formatValue(p.r2 ?? 0, 2)}${
                  p.window
                    ? `, over ${p.window.points} values since ${formatDateTime(p.window.from)}${
                        p.window.changed ? ' (the trend changed then)' : ''
                      }`
                    : ''
                }${p.overdue ? '; already due' : ''}`
              : undefined
          }
          wide
          sentence={p.outcome !== 'projected'}
        />
      </dl>
      {data.items.length === 0 ? (
        <EmptyState
          title="No values in this period"
          description="Pick a longer period, or wait for the next snapshot of this point."
        />
      ) : (
        <>
          <TrendChart
            points={data.items}
            unit={data.band.unit}
            name={data.band.name}
            limits={chartProps.limits}
            baseline={chartProps.baseline}
            events={chartProps.events}
            projection={chartProps.projection}
            now={now}
            ariaLabel={`Trend of ${data.band.name} in ${unit}, ${data.decimation ? `${data.items.length} of ${data.decimation.total}` : data.items.length} values`}
          />
          <TrendLegend />
          {data.decimation && (
            <p className="text-[13px] text-ink-muted">
              {data.decimation.total.toLocaleString('en')} values in this period: the chart shows
              the lowest and highest of each {bucketText(data.decimation.bucketMs)}, so every peak
              is there. Pick a shorter period to see each value; the CSV has them all.
            </p>
          )}
        </>
      )}
    </div>
  );
}

/** A bucket width in words: "6 hours", "day", "2 days". */
function bucketText(ms: number): string {
  const hours = ms / 3_600_000;
  if (hours < 1) return `${Math.max(1, Math.round(ms / 60_000))} minutes`;
  if (hours < 23.5) return `${Math.round(hours)} hours`;
  const days = Math.round(hours / 24);
  return days === 1 ? 'day' : `${days} days`;
}

function Stat({
  label,
  value,
  hint,
  wide,
  sentence,
}: {
  label: string;
  value: string;
  hint?: string;
  wide?: boolean;
  /** Words, not a number: the sans font. */
  sentence?: boolean;
}) {
  return (
    <div className={wide ? 'min-w-64' : undefined}>
      <dt className="text-xs text-ink-muted">{label}</dt>
      <dd className={sentence ? 'text-[13.5px] text-ink' : 'font-mono text-[13.5px] text-ink'}>
        {value}
      </dd>
      {hint && <dd className="text-xs text-ink-faint">{hint}</dd>}
    </div>
  );
}

/** Line styles explained in words, so no meaning rests on colour. */
function TrendLegend() {
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
        Vertical lines: alert raised / acknowledged / cleared, findings (hover for the text)
      </li>
    </ul>
  );
}
