import { Card } from '../../../components/ui/card.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { useRetentionPolicy } from '../api/get-retention.ts';

const days = (n: number) => `${n} day${n === 1 ? '' : 's'}`;

/** The retention policy in force, read-only (it is set by the server's configuration). */
export function RetentionCard() {
  const q = useRetentionPolicy();
  return (
    <Card className="p-4">
      <section aria-labelledby="retention-title" className="flex flex-col gap-3">
        <div>
          <h2 id="retention-title" className="text-sm font-semibold text-ink">
            Data retention
          </h2>
          <p className="text-xs text-ink-muted">
            What older captures keep. Set in the server&apos;s configuration (README,
            &ldquo;Storage&rdquo;); read-only here.
          </p>
        </div>
        {q.isPending ? (
          <LoadingPanel label="Loading the retention policy…" />
        ) : q.isError ? (
          <ErrorState
            title="Could not load the retention policy"
            error={q.error}
            onRetry={() => void q.refetch()}
          />
        ) : (
          <table className="w-full max-w-3xl text-left text-sm" aria-label="Retention policy">
            <thead className="text-xs text-ink-muted">
              <tr>
                <th className="py-1 pr-4 font-medium">Age of a capture</th>
                <th className="py-1 font-medium">Keeps its spectra</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {q.data.spectraWholeDays === 0 ? (
                <tr>
                  <td className="py-1.5 pr-4">any</td>
                  <td className="py-1.5">every capture (spectra are never thinned)</td>
                </tr>
              ) : (
                <>
                  <tr>
                    <td className="py-1.5 pr-4">under {days(q.data.spectraWholeDays)}</td>
                    <td className="py-1.5">every capture</td>
                  </tr>
                  {q.data.spectraHourlyDays > q.data.spectraWholeDays && (
                    <tr>
                      <td className="py-1.5 pr-4">up to {days(q.data.spectraHourlyDays)}</td>
                      <td className="py-1.5">the first capture of each point in each hour (UTC)</td>
                    </tr>
                  )}
                  <tr>
                    <td className="py-1.5 pr-4">older</td>
                    <td className="py-1.5">the first capture of each point in each day (UTC)</td>
                  </tr>
                </>
              )}
            </tbody>
          </table>
        )}
        {q.data && (
          <ul className="list-disc pl-5 text-xs text-ink-muted">
            <li>
              Always whole: captures within ±{q.data.keepWindowMinutes} min of an alert event or a
              finding, at an alert&apos;s peak, where a point turned suspect, uploads, and the first
              capture after a limit change.
            </li>
            <li>
              Overall values, band values and diagnosis hints of every capture (peaks and fault
              frequencies go with the spectra):{' '}
              {q.data.captureMonths === 0
                ? 'kept for ever'
                : `kept ${q.data.captureMonths} months; older months are removed whole, except a month holding a capture kept whole`}
              .
            </li>
            <li>
              Raw waveforms:{' '}
              {q.data.rawSamplesDays === 0
                ? 'kept for ever'
                : `kept ${days(q.data.rawSamplesDays)} after they arrive`}
              .
            </li>
            <li>
              Runs nightly (<span className="font-mono">{q.data.schedule}</span>, server time) in
              batches of {q.data.batchSize} rows, {q.data.batchPauseMs} ms apart.
            </li>
          </ul>
        )}
      </section>
    </Card>
  );
}
