import { lazy, Suspense, useState } from 'react';
import type { BandDefinitionInput, ReplayResponse } from '@turnstone/contracts/limits';
import { Select } from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { TableHead } from '../../../components/ui/table-head.tsx';
import { formatDateTime } from '../../../lib/format.ts';

const ReplayChart = lazy(() =>
  import('./replay-chart.tsx').then((m) => ({ default: m.ReplayChart })),
);

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** What the proposed levels would have done over the stored history, in words and drawn. */
export function ReplaySummary({
  replay,
  current,
}: {
  replay: ReplayResponse;
  current: readonly BandDefinitionInput[];
}) {
  const withAlerts = replay.bands.find((b) => b.alerts.length > 0);
  const [chosen, setChosen] = useState(withAlerts?.bandKey ?? replay.bands[0]?.bandKey ?? '');
  const band = replay.bands.find((b) => b.bandKey === chosen) ?? replay.bands[0];
  const now = current.find((b) => b.key === band?.bandKey);
  if (replay.snapshots === 0)
    return (
      <p className="text-sm text-ink-muted" role="status">
        This point has no stored history yet, so there is nothing to replay.
      </p>
    );
  return (
    <div className="flex flex-col gap-3" aria-live="polite">
      <p className="text-sm text-ink" data-testid="replay-total">
        Over {plural(replay.snapshots, 'snapshot')} ({formatDateTime(replay.from!)} –{' '}
        {formatDateTime(replay.to!)}) these levels would have raised{' '}
        <strong className="font-mono">{plural(replay.totals.alerts, 'alert')}</strong>,{' '}
        <strong className="font-mono">{replay.totals.reachedDanger}</strong> of them reaching danger
        {replay.qualityNotices.length > 0 && (
          <>
            , and {plural(replay.qualityNotices.length, 'data-quality notice')} for unusable
            captures
          </>
        )}
        .
      </p>
      <table className="w-full text-left text-sm">
        <TableHead
          look="capitals"
          columns={['Band', 'Evaluated', 'Alerts', 'Reached danger', 'When raised']}
        />
        <tbody>
          {replay.bands.map((b) => (
            <tr key={b.bandKey} className="border-b border-line last:border-b-0 align-top">
              <td className="py-1.5 pr-3">{b.bandName}</td>
              <td className="py-1.5 pr-3 font-mono">{b.evaluated}</td>
              <td className="py-1.5 pr-3 font-mono">{b.alerts.length}</td>
              <td className="py-1.5 pr-3 font-mono">{b.byLevel.danger}</td>
              <td className="py-1.5 text-xs text-ink-muted">
                {b.alerts.length === 0
                  ? '—'
                  : b.alerts
                      .slice(0, 4)
                      .map((a) => `${formatDateTime(a.raisedAt)} (${a.raisedLevel})`)
                      .join('; ') + (b.alerts.length > 4 ? ` and ${b.alerts.length - 4} more` : '')}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {band && (
        <>
          <label className="flex items-center gap-2 text-sm text-ink-muted">
            Draw band
            <Select
              value={band.bandKey}
              onChange={(e) => setChosen(e.target.value)}
              className="w-auto"
            >
              {replay.bands.map((b) => (
                <option key={b.bandKey} value={b.bandKey}>
                  {b.bandName}
                </option>
              ))}
            </Select>
          </label>
          <Suspense fallback={<LoadingPanel label="Drawing the trend…" />}>
            <ReplayChart band={band} current={now} />
          </Suspense>
        </>
      )}
    </div>
  );
}
