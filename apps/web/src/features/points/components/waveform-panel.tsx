import type { AnalysisSummary } from '@turnstone/contracts/points';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import { WaveformChart } from '../../../components/charts/waveform-chart.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { useWaveform, waveformDownloadHref } from '../api/get-waveform.ts';
import { SnapshotCard } from './snapshot-picker.tsx';

const linkButton =
  'inline-flex h-9 items-center rounded-md border border-line-strong bg-surface px-3 text-[13px] font-medium text-ink hover:bg-sunken';

export function WaveformPanel({
  analyses,
  selectedId,
  onSelect,
}: {
  analyses: readonly AnalysisSummary[];
  selectedId: number | null;
  onSelect: (id: number | null) => void;
}) {
  const q = useWaveform(selectedId);
  const w = q.data;
  const expired = isApiError(q.error) && q.error.status === 410;
  return (
    <SnapshotCard
      analyses={analyses}
      selectedId={selectedId}
      onSelect={onSelect}
      beside={
        selectedId !== null &&
        !expired && (
          <div className="ml-auto flex gap-2">
            <a className={linkButton} href={waveformDownloadHref(selectedId, 'wav')} download>
              Download WAV
            </a>
            <a className={linkButton} href={waveformDownloadHref(selectedId, 'csv')} download>
              Download CSV (g)
            </a>
          </div>
        )
      }
    >
      {selectedId === null ? (
        <EmptyState title="No snapshot chosen" description="Pick a snapshot above." />
      ) : q.isPending ? (
        <LoadingPanel label="Loading waveform…" />
      ) : expired ? (
        <EmptyState
          title="Raw samples no longer kept"
          description={q.error instanceof Error ? q.error.message : undefined}
        />
      ) : q.isError ? (
        <ErrorState
          title="Could not load the waveform"
          error={q.error}
          onRetry={() => void q.refetch()}
        />
      ) : w ? (
        <>
          <dl className="flex flex-wrap gap-x-8 gap-y-2 text-sm">
            <div>
              <dt className="text-xs text-ink-muted">Quality</dt>
              <dd>
                <StatusMark status={w.verdict === 'ok' ? 'ok' : 'quality'} />
                {w.verdict !== 'ok' && (
                  <span className="ml-1 text-[13px] text-ink">({w.verdict})</span>
                )}
              </dd>
            </div>
            <div>
              <dt className="text-xs text-ink-muted">Bits used</dt>
              <dd className="font-mono text-[13.5px]">
                {w.bitsUsed === null ? '—' : `${w.bitsUsed.toFixed(1)} of ${w.adcBits}`}
              </dd>
            </div>
            <div>
              <dt className="text-xs text-ink-muted">ADC range</dt>
              <dd className="font-mono text-[13.5px]">
                {formatValue(w.rails.lowG)} … +{formatValue(w.rails.highG)} g
              </dd>
            </div>
            <div>
              <dt className="text-xs text-ink-muted">Samples</dt>
              <dd className="font-mono text-[13.5px]">
                {w.sampleCount} at {formatValue(w.sampleRateHz, 5)} Hz (
                {formatValue((w.sampleCount / w.sampleRateHz) * 1000, 4)} ms)
              </dd>
            </div>
            <div>
              <dt className="text-xs text-ink-muted">Clipping</dt>
              <dd className="text-[13.5px]">{w.clipped ? 'Clipped: rails drawn' : 'None found'}</dd>
            </div>
          </dl>
          {w.findings.length > 0 && (
            <ul className="flex flex-col gap-1 rounded-md border border-line bg-sunken/50 p-3 text-sm">
              {w.findings.map((f, i) => (
                <li key={i} className="flex gap-2">
                  <span className="font-mono text-xs uppercase text-status-quality">
                    {f.severity}
                  </span>
                  <span className="font-mono text-xs text-ink-muted">{f.code}</span>
                  <span className="text-ink">{f.message}</span>
                </li>
              ))}
            </ul>
          )}
          <WaveformChart
            values={w.decoded}
            sampleRateHz={w.sampleRateHz}
            rails={w.rails}
            showRails={w.clipped}
            ariaLabel={`Time waveform in g, ${w.sampleCount} samples${w.clipped ? ', clipped, with the ADC rails drawn' : ''}`}
          />
        </>
      ) : null}
    </SnapshotCard>
  );
}
