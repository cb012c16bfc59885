import { Link } from 'react-router-dom';
import { useUnits } from '../../account/api/use-units.ts';
import type { QualityFinding } from '@turnstone/contracts/points';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { paths } from '../../../config/paths.ts';
import { formatBandHz } from '../../../lib/format.ts';
import { useSnapshot } from '../api/get-snapshot.ts';
import { VerdictMark } from './verdict-mark.tsx';

export type UploadItem = {
  key: string;
  file: File;
  pointId: number;
  pointTag: string;
  state: 'ready' | 'uploading' | 'sent' | 'refused';
  progress: number;
  snapshotId?: number;
  repeated?: boolean;
  error?: string;
};

const size = (n: number) =>
  n < 1024
    ? `${n} B`
    : n < 1048576
      ? `${(n / 1024).toFixed(1)} KiB`
      : `${(n / 1048576).toFixed(2)} MiB`;

function Findings({ findings }: { findings: QualityFinding[] }) {
  if (findings.length === 0) return <p className="text-xs text-ink-muted">No quality findings.</p>;
  return (
    <ul className="list-disc pl-5 text-xs text-ink-muted">
      {findings.map((f, i) => (
        <li key={`${f.code}-${i}`}>
          <span className="font-medium text-ink">{f.severity}</span> {f.message}
        </li>
      ))}
    </ul>
  );
}

function Result({ item }: { item: UploadItem }) {
  const units = useUnits();
  const snap = useSnapshot(item.snapshotId ?? null);
  if (!item.snapshotId) return null;
  if (snap.isError)
    return (
      <p className="text-sm text-status-danger">Could not read the result: {snap.error.message}</p>
    );
  const s = snap.data;
  if (!s || s.status === 'queued')
    return (
      <p className="text-sm text-ink-muted">
        <Spinner size="sm" /> Analysing…
      </p>
    );
  if (s.status !== 'done' || !s.analysis)
    return (
      <p className="text-sm text-status-danger">
        Analysis {s.status}
        {s.statusReason ? `: ${s.statusReason}` : '.'}
      </p>
    );
  const a = s.analysis;
  return (
    <div className="flex flex-col gap-1.5">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm">
        <VerdictMark verdict={a.verdict} />
        <span>
          <span className="text-ink-muted">accel </span>
          <span className="font-mono">{a.overall.accelRmsG.toFixed(3)} g RMS</span>
          <span className="text-ink-muted"> ({formatBandHz(a.overall.accelBandHz)})</span>
        </span>
        <span>
          <span className="text-ink-muted">velocity </span>
          <span className="font-mono">{units.format(a.overall.velocityRmsMmS, 'mm/s')} RMS</span>
          <span className="text-ink-muted"> ({formatBandHz(a.overall.velocityBandHz)})</span>
        </span>
        {a.speedRpm !== null && (
          <span>
            <span className="text-ink-muted">speed </span>
            <span className="font-mono">{Math.round(a.speedRpm)} r/min</span>
          </span>
        )}
        <Link
          to={paths.app.point.getHref(s.pointId)}
          className="font-medium text-accent underline-offset-2 hover:underline"
        >
          Open point {item.pointTag}
        </Link>
      </div>
      <Findings findings={a.findings} />
    </div>
  );
}

export function UploadRow({ item, onRemove }: { item: UploadItem; onRemove: () => void }) {
  const pct = Math.round(item.progress * 100);
  return (
    <li
      className="flex flex-col gap-2 border-b border-line px-4 py-3 last:border-0"
      aria-label={item.file.name}
    >
      <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
        <span className="font-mono text-[13px] font-medium break-all">{item.file.name}</span>
        <span className="font-mono text-xs text-ink-faint">{size(item.file.size)}</span>
        <span className="text-xs text-ink-muted">
          for <span className="font-mono">{item.pointTag}</span>
        </span>
        {item.state === 'ready' && (
          <button
            type="button"
            onClick={onRemove}
            className="ml-auto text-xs text-ink-muted hover:text-ink hover:underline"
          >
            Remove
          </button>
        )}
      </div>
      {(item.state === 'uploading' || item.state === 'sent') && (
        <div className="flex items-center gap-3">
          <div
            role="progressbar"
            aria-label={`Upload of ${item.file.name}`}
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={pct}
            className="h-1.5 flex-1 overflow-hidden rounded-full bg-sunken"
          >
            <div
              className="h-full rounded-full bg-accent transition-[width]"
              style={{ width: `${pct}%` }}
            />
          </div>
          <span className="w-10 text-right font-mono text-xs text-ink-muted">{pct} %</span>
        </div>
      )}
      {item.state === 'refused' && (
        <p role="alert" className="flex items-start gap-1.5 text-sm text-status-danger">
          <svg viewBox="0 0 12 12" aria-hidden="true" className="mt-1 size-3 shrink-0">
            <path d="M6 .6 11.4 6 6 11.4.6 6Z" fill="currentColor" />
          </svg>
          <span>
            <span className="font-medium">Refused:</span>{' '}
            <span className="text-ink">{item.error}</span>
          </span>
        </p>
      )}
      {item.state === 'sent' && item.repeated && (
        <p className="text-xs text-ink-muted">
          This file was uploaded before; showing that result.
        </p>
      )}
      {item.state === 'sent' && <Result item={item} />}
    </li>
  );
}
