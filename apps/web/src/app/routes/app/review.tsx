import { useDeferredValue, useMemo, useState } from 'react';
import { reviewInUnits } from '@turnstone/contracts/review-units';
import { useUnits } from '../../../features/account/api/use-units.ts';
import { useSearchParams } from 'react-router-dom';
import { PageHeader } from '../../../components/ui/page-header.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { useMe } from '../../../features/auth/api/get-me.ts';
import {
  reviewZipHref,
  reviewParamsFromSearch,
  useReview,
  type ReviewParams,
} from '../../../features/review/api/get-review.ts';
import { ReviewToolbar } from '../../../features/review/components/review-toolbar.tsx';
import { ReviewSummary } from '../../../features/review/components/review-summary.tsx';
import { ReviewPrintHeader } from '../../../features/review/components/review-print-header.tsx';
import { MoversTable } from '../../../features/review/components/review-movers-table.tsx';
import { ReviewPrintSummary } from '../../../features/review/components/review-print-summary.tsx';
import { useReviewNotices } from '../../../features/review/api/review-notices.ts';
import {
  ForecastsTable,
  OpenAlertsTable,
  QualityNoticesTable,
} from '../../../features/review/components/review-tables.tsx';
import type { FindingDraft } from '../../../features/review/components/review-table-parts.tsx';
import { formatDay } from '../../../features/review/utils/format-review.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { CreateFindingDialog } from '../../../features/findings/components/create-finding-dialog.tsx';
import { FindingsList } from '../../../features/findings/components/findings-list.tsx';
import '../../../features/review/components/review-print.css';

/** Week, horizon and site live in the address, so a review can be shared or printed again. */
function useReviewParams(): [ReviewParams, (p: ReviewParams) => void] {
  const [search, setSearch] = useSearchParams();
  const params = reviewParamsFromSearch(search);
  const set = (p: ReviewParams) => {
    const next = new URLSearchParams({
      weekEnding: p.weekEnding,
      weeksAhead: String(p.weeksAhead),
    });
    if (p.siteId !== undefined) next.set('siteId', String(p.siteId));
    setSearch(next, { replace: true });
  };
  return [params, set];
}

export function ReviewRoute() {
  const [params, setParams] = useReviewParams();
  const review = useReview(params);
  const me = useMe();
  const canEdit = me.data?.role === 'planner' || me.data?.role === 'engineer';
  const [draft, setDraft] = useState<FindingDraft | null>(null);
  const [created, setCreated] = useState<string | null>(null);
  const onCreateFinding = canEdit
    ? (d: FindingDraft) => {
        setCreated(null);
        setDraft(d);
      }
    : undefined;
  const units = useUnits();
  // Values in the user's unit system (in/s, mil for imperial), as the ZIP export gives them.
  const data = useMemo(
    () => review.data && reviewInUnits(review.data, units.system),
    [review.data, units.system],
  );
  // The tables below the first screen (forecasts, open alerts, quality notices) render just
  // after it, in a background render once the review is here: the first screen shows
  // without waiting for their rows. Later changes (another week) render all together.
  const belowShown = useDeferredValue(data !== undefined, false);
  const markReviewed = useReviewNotices();
  const [reviewedMsg, setReviewedMsg] = useState<string | null>(null);
  const onMarkReviewed = canEdit
    ? (pointId: number, pointTag: string) =>
        markReviewed.mutateAsync({ pointId }).then(
          (r) =>
            setReviewedMsg(
              `${r.reviewed} quality ${r.reviewed === 1 ? 'notice' : 'notices'} of ${pointTag} marked reviewed by ${r.reviewedBy.name} at ${formatDateTime(r.reviewedAt)}; the point’s page lists them with who reviewed each.`,
            ),
          (e: unknown) =>
            setReviewedMsg(e instanceof Error ? e.message : 'Could not mark reviewed'),
        )
    : undefined;
  const zones = Object.fromEntries((data?.siteWeeks ?? []).map((w) => [w.siteId, w.timeZone]));
  const zoneText = data
    ? data.period.timeZone === 'per site'
      ? `each site’s own days: ${data.siteWeeks.map((w) => `${w.siteCode} ${w.timeZone}`).join(', ')}`
      : `days in ${data.period.timeZone}`
    : 'days in each site’s time zone';

  return (
    <div className="review-page flex flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Weekly review · Turnstone</title>
      {data && <ReviewPrintHeader review={data} printedAt={new Date()} />}
      <div data-print="hide">
        <PageHeader
          title="Weekly review"
          description={`This week against last, week ending ${formatDay(params.weekEnding)} (${zoneText}).`}
          actions={
            <>
              <a
                href={reviewZipHref(params)}
                download
                className="inline-flex h-10 items-center justify-center rounded-md border border-line-strong bg-surface px-4 text-sm font-medium text-ink hover:bg-sunken"
              >
                Export CSV files (ZIP)
              </a>
              <Button onClick={() => window.print()}>Print</Button>
            </>
          }
        />
      </div>
      <ReviewToolbar params={params} onChange={setParams} />
      {created && (
        <p
          role="status"
          data-print="hide"
          className="rounded-md border border-accent/30 bg-accent-soft px-3 py-2 text-sm text-ink"
        >
          Finding “{created}” created; it is listed under Findings.
        </p>
      )}
      {review.isPending ? (
        <Card>
          <LoadingPanel label="Building the review…" />
        </Card>
      ) : review.isError ? (
        <Card>
          <ErrorState
            title="Could not build the review"
            error={review.error}
            onRetry={() => void review.refetch()}
            retrying={review.isFetching}
          />
        </Card>
      ) : data ? (
        <div
          className="flex flex-col gap-4 transition-opacity"
          style={{ opacity: review.isPlaceholderData ? 0.6 : 1 }}
          aria-busy={review.isPlaceholderData || undefined}
        >
          <ReviewSummary review={data} />
          <ReviewPrintSummary review={data} />
          <div className="review-details flex flex-col gap-4">
            <FindingsList siteId={params.siteId} canEdit={canEdit} />
            <MoversTable review={data} onCreateFinding={onCreateFinding} />
            {belowShown && (
              <>
                <ForecastsTable
                  rows={data.forecasts}
                  total={data.summary.forecasts}
                  weeksAhead={data.period.weeksAhead}
                  onCreateFinding={onCreateFinding}
                  zones={zones}
                />
                <OpenAlertsTable
                  rows={data.openAlerts}
                  total={data.summary.openAlerts}
                  onCreateFinding={onCreateFinding}
                  zones={zones}
                />
                {reviewedMsg && (
                  <p
                    role="status"
                    data-print="hide"
                    className="rounded-md border border-accent/30 bg-accent-soft px-3 py-2 text-sm text-ink"
                  >
                    {reviewedMsg}
                  </p>
                )}
                <QualityNoticesTable
                  rows={data.qualityNotices}
                  total={data.summary.qualityNotices}
                  onCreateFinding={onCreateFinding}
                  zones={zones}
                  onMarkReviewed={onMarkReviewed}
                />
              </>
            )}
          </div>
        </div>
      ) : null}
      <CreateFindingDialog
        origin={draft}
        onClose={() => setDraft(null)}
        onCreated={(title) => setCreated(title)}
      />
    </div>
  );
}
