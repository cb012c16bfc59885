/**
 * The trend chart: one band's values over time with its limit lines, baseline band, event
 * markers, a projection ahead of today and any extra marker series. Shared by the Point
 * page (trend) and the Limits screen (replay of proposed levels over history).
 *
 * Everything is passed in plain data (types and the option in trend-option.ts): times are
 * epoch milliseconds or ISO strings, values are in `unit`. The chart comes with keyboard
 * zoom and its values as a table.
 */
import { useMemo } from 'react';
import { formatValue } from './chart-theme.ts';
import { useEChart } from './use-echart.ts';
import { ValuesTable } from './values-table.tsx';
import { useChartZoom, xExtent, ZoomKeys } from './zoom-keys.tsx';
import { ChartCanvas } from './chart-canvas.tsx';
import {
  buildTrendOption,
  dateLabel,
  dateTimeLabel,
  displayUnit,
  toMs,
  type TrendChartPoint,
  type TrendChartProps,
} from './trend-option.ts';

export type * from './trend-option.ts';
export { displayUnit };

export function TrendChart(props: TrendChartProps) {
  const {
    points,
    unit,
    name,
    limits,
    baseline,
    events,
    projection,
    markerSeries,
    now,
    range,
    zoom,
  } = props;
  // Rebuilt only when the data change (pass memoised arrays), so a re-render keeps the zoom.
  const option = useMemo(
    () =>
      buildTrendOption({
        points,
        unit,
        name,
        limits,
        baseline,
        events,
        projection,
        markerSeries,
        now,
        range,
        zoom,
        ariaLabel: '',
      }),
    [points, unit, name, limits, baseline, events, projection, markerSeries, now, range, zoom],
  );
  const { onPointClick } = props;
  const { ref, chart } = useEChart(option, (chart) => {
    if (!onPointClick) return;
    chart.on('click', (params) => {
      if (params.seriesIndex === 0 && typeof params.dataIndex === 'number')
        onPointClick(params.dataIndex);
    });
  });
  const shown = useChartZoom(chart, option);
  return (
    <div>
      <ChartCanvas canvasRef={ref} ariaLabel={props.ariaLabel} height={props.height ?? 320} />
      {(zoom ?? true) && (
        <div className="mb-1 px-2">
          <ZoomKeys
            chart={chart}
            shown={shown}
            label="trend"
            extent={xExtent(option)}
            format={(v) => dateLabel.format(v)}
          />
        </div>
      )}
      <TrendValues points={points} unit={displayUnit(unit)} name={name ?? 'Values'} />
    </div>
  );
}

const verdicts = { ok: 'OK', suspect: 'Suspect', unusable: 'Unusable' } as const;

/** The chart's values as a table, for the keyboard and screen readers. */
function TrendValues({
  points,
  unit,
  name,
}: {
  points: readonly TrendChartPoint[];
  unit: string;
  name: string;
}) {
  if (points.length === 0) return null;
  return (
    <ValuesTable
      summary={`Values as a table (${points.length})`}
      caption={`${name} in ${unit}, newest first`}
      label={`${name} values`}
      columns={[{ header: 'Taken' }, { header: unit, numeric: true }, { header: 'Quality' }]}
      rows={() =>
        [...points]
          .reverse()
          .map((p) => [dateTimeLabel.format(toMs(p.t)), formatValue(p.v), verdicts[p.q ?? 'ok']])
      }
    />
  );
}
