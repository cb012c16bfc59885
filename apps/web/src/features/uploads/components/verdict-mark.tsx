import { StatusShape } from '../../../components/ui/status-mark.tsx';

const shapes = { ok: 'ok', suspect: 'quality', unusable: 'danger' } as const;
const colours = {
  ok: 'text-status-ok',
  suspect: 'text-status-quality',
  unusable: 'text-status-danger',
} as const;
const labels = { ok: 'Quality OK', suspect: 'Quality suspect', unusable: 'Unusable' } as const;

/** A measurement-quality verdict as shape + colour + text (the status marks' shapes). */
export function VerdictMark({ verdict }: { verdict: 'ok' | 'suspect' | 'unusable' }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap">
      <StatusShape status={shapes[verdict]} className={`size-3 shrink-0 ${colours[verdict]}`} />
      <span className="text-[13px] font-medium text-ink">{labels[verdict]}</span>
    </span>
  );
}
