import type { WeeklyReview } from '@turnstone/contracts/review';
import { formatDay } from '../utils/format-review.ts';
import { formatDateTime } from '../../../lib/format.ts';

/** Shown only on paper: what, where, which week and when it was printed. */
export function ReviewPrintHeader({
  review,
  printedAt,
}: {
  review: WeeklyReview;
  printedAt: Date;
}) {
  const sites = review.sites.map((s) => `${s.code} ${s.name}`).join(', ') || 'No sites';
  return (
    <div data-print="only" className="review-print-header hidden border-b border-ink pb-2">
      <p className="text-base font-semibold">Turnstone · weekly review</p>
      <p className="text-sm">
        Site: {sites} · Week ending {formatDay(review.period.weekEnding)} (days in{' '}
        {review.siteWeeks.map((w) => w.timeZone).join(', ') || 'UTC'}) · forecast{' '}
        {review.period.weeksAhead} weeks ahead
      </p>
      <p className="text-xs">Printed {formatDateTime(printedAt.toISOString())}</p>
    </div>
  );
}
