import type { QualityNotice } from '@turnstone/contracts/quality';
import { Button } from '../../../components/ui/button.tsx';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useReviewNotices } from '../../review/api/review-notices.ts';
import { useQualityNotices } from '../api/get-quality-notices.ts';

/** Who reviewed a notice and when, or that nobody has yet. */
export function ReviewedBy({
  notice,
}: {
  notice: Pick<QualityNotice, 'reviewedBy' | 'reviewedAt'>;
}) {
  return notice.reviewedBy && notice.reviewedAt ? (
    <span>
      Reviewed by {notice.reviewedBy.name},{' '}
      <span className="font-mono">{formatDateTime(notice.reviewedAt)}</span>
    </span>
  ) : (
    <span className="font-medium text-ink">Not reviewed</span>
  );
}

/**
 * The point's data-quality area: its recent quality notices (suspect or unusable captures),
 * each with its reasons and who reviewed it when; planners and engineers mark them reviewed
 * here as on the weekly review. Nothing when the point has no notice.
 */
export function PointQualityNotices({
  pointId,
  pointTag,
  canReview,
}: {
  pointId: number;
  pointTag: string;
  canReview: boolean;
}) {
  const notices = useQualityNotices(pointId);
  const review = useReviewNotices();
  const items = notices.data?.items ?? [];
  if (items.length === 0) return null;
  const open = items.filter((n) => n.reviewedAt === null).length;
  return (
    <section
      aria-labelledby="point-quality-title"
      className="rounded-lg border border-line bg-surface px-4 py-3"
    >
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="point-quality-title" className="text-sm font-semibold text-ink">
          Data quality{' '}
          <span className="font-normal text-ink-muted">
            · {open === 0 ? 'all notices reviewed' : `${open} not reviewed`}
          </span>
        </h2>
        {canReview && open > 0 && (
          <Button
            size="sm"
            busy={review.isPending}
            onClick={() => review.mutate({ pointId })}
            aria-label={`Mark reviewed: notices of ${pointTag}`}
          >
            Mark reviewed
          </Button>
        )}
      </div>
      {review.error && (
        <p role="alert" className="mt-1 text-xs text-status-danger">
          {review.error.message}
        </p>
      )}
      <ul className="mt-2 divide-y divide-line text-[13px]">
        {items.map((n) => (
          <li key={n.id} data-notice-id={n.id} className="flex flex-wrap gap-x-4 gap-y-0.5 py-1.5">
            <span className="font-mono whitespace-nowrap text-ink">
              {formatDateTime(n.takenAt)}
            </span>
            <span className="whitespace-nowrap">
              <StatusMark status="quality" labelHidden />{' '}
              {n.verdict === 'unusable' ? 'Unusable' : 'Suspect'}
            </span>
            <span className="min-w-0 flex-1 text-ink-muted">
              {n.findings.map((f) => f.message).join(' ') || 'No reason was recorded.'}
            </span>
            <span className="text-xs text-ink-muted">
              <ReviewedBy notice={n} />
            </span>
          </li>
        ))}
      </ul>
    </section>
  );
}
