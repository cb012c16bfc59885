import { useMemo, useState } from 'react';
import type { TrendResponse } from '@turnstone/contracts/trend';
import {
  displayUnit,
  TrendChart,
  type TrendExtraSeries,
  type TrendLimitLine,
} from '../../../components/charts/trend-chart.tsx';
import {
  formatValue,
  seriesColours,
  seriesSymbols,
} from '../../../components/charts/chart-theme.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { formatDate, formatDateTime } from '../../../lib/format.ts';
import { useUnits } from '../../account/api/use-units.ts';
import { inUnits, trendInUnits } from '../utils/trend-units.ts';
import { useStableList } from '../utils/use-stable-list.ts';
import { trendEventMarkers } from '../utils/trend-event-labels.ts';
import { seriesKey, type SeriesRef } from '../utils/trend-selection.ts';
import { trendCsvHref, type TrendParams, type useTrend } from '../api/get-trend.ts';
import { TrendEventsList } from './trend-events-list.tsx';
import { TrendRangeTable, type RangeSeries } from './trend-range-table.tsx';
import { SeriesLegend, TrendLegend, type LegendSeries } from './trend-legend.tsx';

/** A series beside the band: where it comes from, its name and its loaded trend. */
export interface Extra {
  ref: SeriesRef;
  name: string;
  colour: string;
  symbol: string;
  params: TrendParams;
  query: { data?: TrendResponse; isPending: boolean; isError: boolean };
}

const projectionText: Record<TrendResponse['projection']['outcome'], string> = {
  projected: 'projected',
  'too-few-points': 'Too few values in the last 60 days to project.',
  'above-danger': 'The latest value is at or above the danger level.',
  'not-rising': 'Not rising: no crossing projected.',
  'beyond-horizon': 'Rising slowly: no crossing within a year.',
};

/** The loaded trend: its numbers, the chart with its series and events, the range's values. */
export function TrendBody({
  trend,
  params,
  now,
  extras,
  onRemove,
}: {
  trend: ReturnType<typeof useTrend>;
  params: TrendParams;
  now: number;
  extras: readonly Extra[];
  onRemove: (key: string) => void;
}) {
  const units = useUnits();
  const data = useMemo(() => trend.data && trendInUnits(trend.data, units), [trend.data, units]);
  const [activeEvent, setActiveEvent] = useState<number | null>(null);
  const [shown, setShown] = useState<[number, number] | null>(null);
  const chartProps = useMemo(() => {
    if (!data) return null;
    const limits: TrendLimitLine[] = [
      { value: data.levels.alert, level: 'alert' },
      { value: data.levels.danger, level: 'danger' },
    ];
    const events = trendEventMarkers(data, displayUnit(data.band.unit));
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
    // the chart's props that come from the answer, memoised so the chart keeps its zoom
    return { limits, events, projection, baseline };
  }, [data]);
  // the further series in the user's units (one converted answer per answer), the same
  // array while nothing in it changed, so the chart keeps its zoom between renders
  const converted = extras.map((e) => e.query.data && inUnits(e.query.data, units));
  const loaded = extras.flatMap((e, i) => {
    const d = converted[i];
    return d ? [{ e, d, unit: displayUnit(d.band.unit) }] : [];
  });
  const extraSeries = useStableList<TrendExtraSeries>(
    loaded.map(({ e, d, unit }) => ({
      id: seriesKey(e.ref),
      name: e.name,
      unit,
      colour: e.colour,
      symbol: e.symbol,
      points: d.items,
    })),
    (a, b) =>
      a.id === b.id &&
      a.name === b.name &&
      a.unit === b.unit &&
      a.colour === b.colour &&
      a.points === b.points,
  );

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
  const legend: LegendSeries[] = [
    {
      key: 'primary',
      name: data.band.name,
      unit,
      colour: seriesColours[0],
      symbol: seriesSymbols[0],
    },
    ...extras.map((e, i) => ({
      key: seriesKey(e.ref),
      name: e.name,
      unit: converted[i] ? displayUnit(converted[i].band.unit) : '…',
      colour: e.colour,
      symbol: e.symbol,
      status: e.query.isError ? 'could not be loaded' : e.query.isPending ? 'loading…' : undefined,
    })),
  ];
  const rangeSeries: RangeSeries[] = [
    rangeOf('primary', data.band.name, unit, seriesColours[0], data, params),
    ...loaded.map(({ e, d, unit }) =>
      rangeOf(seriesKey(e.ref), e.name, unit, e.colour, d, e.params),
    ),
  ];
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
      <SeriesLegend series={legend} onRemove={onRemove} />
      {data.items.length === 0 ? (
        <EmptyState
          title="No values in this period"
          description="Pick a longer period, or wait for the next snapshot of this point."
        />
      ) : (
        <>
          <TrendChart
            {...chartProps}
            points={data.items}
            unit={data.band.unit}
            name={data.band.name}
            seriesId="primary"
            colour={seriesColours[0]}
            extraSeries={extraSeries}
            now={now}
            activeEvent={activeEvent}
            onActiveEvent={setActiveEvent}
            onWindow={(from, to) =>
              setShown((w) => (w && w[0] === from && w[1] === to ? w : [from, to]))
            }
            ariaLabel={`Trend of ${data.band.name} in ${unit}, ${data.decimation ? `${data.items.length} of ${data.decimation.total}` : data.items.length} values${extraSeries.length ? `, with ${extraSeries.map((s) => s.name).join(', ')}` : ''}`}
          />
          <TrendLegend />
          {data.decimation && (
            <p className="text-[13px] text-ink-muted">
              {data.decimation.total.toLocaleString('en')} values in this period: the chart shows
              the lowest and highest of each {bucketText(data.decimation.bucketMs)}, so every peak
              is there. Pick a shorter period to see each value; the CSV has them all.
            </p>
          )}
          <TrendEventsList
            events={chartProps.events}
            active={activeEvent}
            onActive={setActiveEvent}
          />
          {shown && <TrendRangeTable series={rangeSeries} from={shown[0]} to={shown[1]} />}
        </>
      )}
    </div>
  );
}

/** A series' values for the range table, with its CSV of a period. */
function rangeOf(
  key: string,
  name: string,
  unit: string,
  colour: string,
  d: TrendResponse,
  params: TrendParams,
): RangeSeries {
  return {
    key,
    name,
    unit,
    colour,
    items: d.items,
    uploads: new Set(d.uploads.map((u) => u.analysisId)),
    thinned: d.decimation !== null,
    csvHref: (from, to) => trendCsvHref({ ...params, from, to }),
  };
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
