import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useLimitHistory } from '../api/get-limit-set.ts';

const actionLabels: Record<string, string> = {
  'limits.update': 'Limits changed',
  'limits.baseline': 'Baseline established',
};

/** Recent changes to the point's limits, from the audit log: who, when, why, which bands. */
export function LimitHistoryList({ pointId }: { pointId: number }) {
  const history = useLimitHistory(pointId);
  if (history.isPending) return <Spinner label="Loading recent changes…" />;
  if (history.isError)
    return <ErrorState error={history.error} onRetry={() => void history.refetch()} />;
  if (history.data.items.length === 0)
    return (
      <p className="text-sm text-ink-muted">
        No changes yet: the limits are as the machine-type template made them.
      </p>
    );
  return (
    <ol className="flex flex-col gap-3" aria-label="Recent changes">
      {history.data.items.map((h) => (
        <li key={h.id} className="border-b border-line pb-3 text-sm last:border-b-0">
          <p className="font-medium text-ink">
            {actionLabels[h.action] ?? h.action}
            <span className="font-normal text-ink-muted">
              {' '}
              · {h.actor ?? 'Turnstone'} · <time dateTime={h.at}>{formatDateTime(h.at)}</time>
            </span>
          </p>
          {h.reason && <p className="mt-0.5 text-ink">“{h.reason}”</p>}
          <p className="mt-0.5 font-mono text-xs text-ink-muted">
            {[
              h.changed.length ? `changed ${h.changed.join(', ')}` : null,
              h.added.length ? `added ${h.added.join(', ')}` : null,
              h.removed.length ? `removed ${h.removed.join(', ')}` : null,
            ]
              .filter(Boolean)
              .join(' · ') || 'no band changed'}
          </p>
        </li>
      ))}
    </ol>
  );
}
