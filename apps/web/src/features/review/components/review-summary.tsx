import type { WeeklyReview } from '@turnstone/contracts/review';
import { Card } from '../../../components/ui/card.tsx';

function SummaryCard({
  label,
  value,
  detail,
  href,
}: {
  label: string;
  value: number;
  detail?: string;
  href: string;
}) {
  return (
    <Card className="review-card px-4 py-3">
      <a href={href} className="block rounded-md">
        <p className="text-xs font-medium tracking-wide text-ink-muted uppercase">{label}</p>
        <p className="mt-1 font-mono text-2xl font-semibold text-ink">{value}</p>
        {detail && <p className="mt-0.5 text-xs text-ink-muted">{detail}</p>}
      </a>
    </Card>
  );
}

/** The week at a glance; each card jumps to its table. */
export function ReviewSummary({ review }: { review: WeeklyReview }) {
  const s = review.summary;
  const cards: { label: string; value: number; detail: string; href: string }[] = [
    {
      label: 'Rising this week',
      value: s.movers,
      detail: 'point bands above last week’s mean',
      href: '#movers',
    },
    {
      label: `Crossing in ${review.period.weeksAhead} weeks`,
      value: s.forecasts,
      detail: 'projected to reach a level',
      href: '#forecasts',
    },
    {
      label: 'Open alerts',
      value: s.openAlerts,
      detail: `${s.openDanger} danger · ${s.unacknowledged} not acknowledged`,
      href: '#open-alerts',
    },
    {
      label: 'Quality notices',
      value: s.qualityNotices,
      detail: 'unreviewed captures this week',
      href: '#quality-notices',
    },
    {
      label: 'Findings due',
      value: s.findingsDue,
      detail: `${s.findingsOverdue} overdue · by the end of next week`,
      href: '#findings',
    },
  ];
  return (
    <section
      aria-label="Summary"
      className="review-summary grid grid-cols-2 gap-3 md:grid-cols-3 xl:grid-cols-5"
    >
      {cards.map((c) => (
        <SummaryCard key={c.href} {...c} />
      ))}
    </section>
  );
}
