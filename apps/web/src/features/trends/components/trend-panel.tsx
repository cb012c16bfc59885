import { useMemo, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { useQueries } from '@tanstack/react-query';
import { seriesColours, seriesSymbols } from '../../../components/charts/chart-theme.ts';
import { Card } from '../../../components/ui/card.tsx';
import { Field, Select } from '../../../components/ui/field.tsx';
import { useUnits } from '../../account/api/use-units.ts';
import { useMachine } from '../../machines/api/get-machine.ts';
import {
  extraSeriesOf,
  seriesKey,
  withExtraSeries,
  type SeriesRef,
} from '../utils/trend-selection.ts';
import {
  DEFAULT_TREND_DAYS,
  defaultTrendBand,
  getTrendQueryOptions,
  trendAnchor,
  trendCsvHref,
  trendParams,
  useTrend,
} from '../api/get-trend.ts';
import { TrendSeriesPicker } from './trend-series-picker.tsx';
import { TrendBody, type Extra } from './trend-body.tsx';

export const trendPeriods = [
  { key: '7d', label: 'Last 7 days', days: 7 },
  { key: '30d', label: 'Last 30 days', days: 30 },
  { key: '90d', label: 'Last 90 days', days: 90 },
  { key: '1y', label: 'Last 12 months', days: 365 },
  { key: '3y', label: 'Last 3 years', days: 3 * 365 },
] as const;
type PeriodKey = (typeof trendPeriods)[number]['key'];

export interface TrendPanelBand {
  key: string;
  name: string;
  unit: string;
}

/**
 * Trend of a band with period and band pickers, further series (bands of this point or of
 * the machine's other points), levels, projection, events, the values of the zoomed range
 * and CSV download. Band, period and series live in the address, so a trend can be shared.
 */
export function TrendPanel({
  pointId,
  machineId,
  bands,
}: {
  pointId: number;
  machineId: number;
  bands: readonly TrendPanelBand[];
}) {
  const [search, setSearch] = useSearchParams();
  const asked = search.get('band');
  const band = asked && bands.some((b) => b.key === asked) ? asked : defaultTrendBand(bands);
  const askedPeriod = search.get('period');
  const period: PeriodKey =
    trendPeriods.find((p) => p.key === askedPeriod)?.key ??
    trendPeriods.find((p) => p.days === DEFAULT_TREND_DAYS)!.key;
  const setParam = (key: string, value: string) => {
    const next = new URLSearchParams(search);
    next.set(key, value);
    setSearch(next, { replace: true });
  };
  // The window is fixed when the page opens (a minute's resolution), so the query keys stay
  // stable between renders.
  const [anchor] = useState(() => trendAnchor());
  const days = trendPeriods.find((p) => p.key === period)!.days;
  const params = useMemo(
    () => trendParams(pointId, band, days, anchor),
    [pointId, band, days, anchor],
  );
  const trend = useTrend(params);
  const units = useUnits();
  const machine = useMachine(machineId);
  const primary = { pointId, band };
  const extraRefs = extraSeriesOf(search, primary);
  const queries = useQueries({
    queries: extraRefs.map((r) =>
      getTrendQueryOptions(trendParams(r.pointId, r.band, days, anchor)),
    ),
  });
  const tagOf = (id: number) => machine.data?.points.find((p) => p.id === id)?.tag ?? `point ${id}`;
  const extras: Extra[] = extraRefs.map((ref, i) => {
    const q = queries[i]!;
    const bandName =
      (ref.pointId === pointId ? bands.find((b) => b.key === ref.band)?.name : undefined) ??
      q.data?.band.name ??
      ref.band;
    return {
      ref,
      name: ref.pointId === pointId ? bandName : `${tagOf(ref.pointId)} · ${bandName}`,
      colour: seriesColours[(i + 1) % seriesColours.length]!,
      symbol: seriesSymbols[(i + 1) % seriesSymbols.length]!,
      params: trendParams(ref.pointId, ref.band, days, anchor),
      query: q,
    };
  });
  const setExtras = (list: SeriesRef[]) =>
    setSearch(withExtraSeries(search, list), { replace: true });

  return (
    <Card className="flex flex-col gap-3 p-4">
      <div className="flex flex-wrap items-end gap-3">
        <Field label="Band" className="min-w-56">
          {(c) => (
            <Select id={c.id} value={band} onChange={(e) => setParam('band', e.target.value)}>
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
            <Select id={c.id} value={period} onChange={(e) => setParam('period', e.target.value)}>
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
      {machine.data && (
        <TrendSeriesPicker
          pointId={pointId}
          band={band}
          points={machine.data.points}
          taken={[primary, ...extraRefs]}
          onAdd={(list) => setExtras([...extraRefs, ...list])}
        />
      )}
      <TrendBody
        trend={trend}
        params={params}
        now={anchor}
        extras={extras}
        onRemove={(key) => setExtras(extraRefs.filter((r) => seriesKey(r) !== key))}
      />
    </Card>
  );
}
