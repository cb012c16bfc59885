/**
 * A suspect or unusable capture's verdict and reasons, where its numbers are read (the
 * spectrum view, the point's header). Nothing for a capture that passed the checks.
 */
import type { AnalysisSummary } from '@turnstone/contracts/points';
import { cn } from '../../../lib/cn.ts';
import { formatDateTime } from '../../../lib/format.ts';

export function qualityReasons(a: Pick<AnalysisSummary, 'findings'>): string {
  const f = a.findings ?? [];
  return f.length > 0 ? f.map((x) => x.message).join(' ') : 'No reason was recorded.';
}

export function CaptureQuality({
  analysis,
  where,
}: {
  analysis: AnalysisSummary;
  /** What the numbers beside it are, e.g. "spectrum". */
  where: string;
}) {
  if (analysis.verdict === 'ok') return null;
  const unusable = analysis.verdict === 'unusable';
  return (
    <div
      role="note"
      aria-label="Capture quality"
      className={cn(
        'rounded-md border-l-4 px-3 py-2 text-sm',
        unusable ? 'border-status-danger bg-danger-soft' : 'border-status-quality bg-sunken',
      )}
    >
      <p className="font-medium text-ink">
        The capture of {formatDateTime(analysis.takenAt)} is {analysis.verdict}
        {unusable
          ? `: read this ${where} with care, its values are not judged against limits.`
          : `: its ${where} may be distorted.`}
      </p>
      <p className="text-ink-muted">{qualityReasons(analysis)}</p>
    </div>
  );
}
