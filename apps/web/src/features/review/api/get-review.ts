import { reviewSchema, WEEKS_AHEAD_DEFAULT } from '@turnstone/contracts/review';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { isIsoDate, todayIso } from '../utils/format-review.ts';

export interface ReviewParams {
  weekEnding: string;
  weeksAhead: number;
  /** One site, or every site the user may see. */
  siteId?: number | undefined;
}

/**
 * The review the address asks for (?weekEnding=&weeksAhead=&siteId=); default this week, in
 * the screen's zone or the one given.
 */
export function reviewParamsFromSearch(search: URLSearchParams, timeZone?: string): ReviewParams {
  const week = search.get('weekEnding');
  const ahead = Number(search.get('weeksAhead'));
  const site = Number(search.get('siteId'));
  return {
    weekEnding: isIsoDate(week) ? week : todayIso(new Date(), timeZone),
    weeksAhead: Number.isInteger(ahead) && ahead >= 1 && ahead <= 52 ? ahead : WEEKS_AHEAD_DEFAULT,
    siteId: Number.isInteger(site) && site > 0 ? site : undefined,
  };
}

export function reviewSearch(p: ReviewParams): string {
  const q = new URLSearchParams({ weekEnding: p.weekEnding, weeksAhead: String(p.weeksAhead) });
  if (p.siteId !== undefined) q.set('siteId', String(p.siteId));
  return q.toString();
}

/** Where the export of the same review downloads from: a ZIP of CSV files, one per table. */
export function reviewZipHref(p: ReviewParams): string {
  return `/api/v1/review.zip?${reviewSearch(p)}`;
}

/** This week against last: movers, forecasts, open alerts, quality notices, findings due. */
export function getReview(p: ReviewParams, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/v1/review?${reviewSearch(p)}`, { schema: reviewSchema, signal });
}

export function getReviewQueryOptions(p: ReviewParams) {
  return queryOptions({
    queryKey: ['review', 'detail', p] as const,
    queryFn: ({ signal }) => getReview(p, { signal }),
    // Keep the last week on screen while the next one loads.
    placeholderData: keepPreviousData,
  });
}

export function useReview(p: ReviewParams) {
  return useQuery(getReviewQueryOptions(p));
}
