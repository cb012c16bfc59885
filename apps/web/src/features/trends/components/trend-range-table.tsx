import type { TrendResponse } from '@turnstone/contracts/trend';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import { TableHead } from '../../../components/ui/table-head.tsx';
import { formatDateTime } from '../../../lib/format.ts';

/** Rows the range table shows before it says how many more there are. */
export const RANGE_ROWS = 12;

export interface RangeSeries {
  key: string;
  name: string;
  /** Shown unit. */
  unit: string;
  colour: string;
  items: TrendResponse['items'];
  /** Analyses of the series' captures that came from an uploaded file. */
  uploads: ReadonlySet<number>;
  /** Whether `items` were thinned to each bucket's lowest and highest value. */
  thinned: boolean;
  /** The series' CSV of a period. */
  csvHref: (from: string, to: string) => string;
}

const verdicts = { ok: 'OK', suspect: 'Suspect', unusable: 'Unusable' } as const;

/**
 * The values behind the window the chart shows (the zoom's range), every series', in time
 * order: the first {@link RANGE_ROWS}, then how many more, with each series' CSV of the range.
 */
export function TrendRangeTable({
  series,
  from,
  to,
}: {
  series: readonly RangeSeries[];
  from: number;
  to: number;
}) {
  const rows = series
    .flatMap((s) =>
      s.items
        .filter((i) => {
          const t = Date.parse(i.t);
          return t >= from && t <= to;
        })
        .map((i) => ({ s, i })),
    )
    .sort((a, b) => Date.parse(a.i.t) - Date.parse(b.i.t));
  const fromIso = new Date(from).toISOString();
  const toIso = new Date(to).toISOString();
  const more = rows.length - RANGE_ROWS;
  const thinned = series.some((s) => s.thinned);
  return (
    <section aria-labelledby="trend-range-title" className="flex flex-col gap-2">
      <h3 id="trend-range-title" className="text-sm font-medium text-ink">
        Values from {formatDateTime(fromIso)} to {formatDateTime(toIso)}
      </h3>
      <p className="text-xs text-ink-muted">
        Zoom the chart or drag the slider to pick a range; its values are listed here.
        {thinned && ' The chart holds each period’s lowest and highest values: the CSV has all.'}
      </p>
      {rows.length === 0 ? (
        <p className="text-sm text-ink-muted">No values in this range.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-xs" aria-label="Values in the selected range">
            <TableHead
              look="compact"
              columns={['Taken', 'Series', { label: 'Value', numeric: true }, 'Quality', 'Source']}
            />
            <tbody>
              {rows.slice(0, RANGE_ROWS).map(({ s, i }) => (
                <tr key={`${s.key}-${i.analysisId}-${i.t}`} className="border-b border-line">
                  <td className="py-1 pr-3 font-mono whitespace-nowrap">{formatDateTime(i.t)}</td>
                  <td className="py-1 pr-3">
                    <span
                      className="mr-1.5 inline-block size-2 rounded-full align-middle"
                      style={{ background: s.colour }}
                      aria-hidden="true"
                    />
                    {s.name}
                  </td>
                  <td className="py-1 pr-3 text-right font-mono whitespace-nowrap">
                    {formatValue(i.v)} {s.unit}
                  </td>
                  <td className="py-1 pr-3">{verdicts[i.q]}</td>
                  <td className="py-1">
                    {s.uploads.has(i.analysisId) ? 'Portable instrument (upload)' : 'Gateway'}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <div className="flex flex-wrap items-center gap-x-4 gap-y-1 text-xs">
        {more > 0 && (
          <span className="text-ink-muted" data-testid="range-more">
            {more.toLocaleString('en')} more {more === 1 ? 'value' : 'values'} in this range
          </span>
        )}
        {series.map((s) => (
          <a
            key={s.key}
            href={s.csvHref(fromIso, toIso)}
            download
            className="text-accent underline"
          >
            CSV of this range: {s.name}
          </a>
        ))}
      </div>
    </section>
  );
}
