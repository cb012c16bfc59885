/**
 * What each screen asks the API for first, started by the route's loader: at the same time
 * as the screen's code and the session check instead of after them, and on the intent to
 * open a link (lib/route-preload.ts). The loaders return at once; the answers land in
 * TanStack Query's cache, where the page's own queries (same options, same keys) find them,
 * and the page keeps showing its own loading and error states.
 *
 * Each prefetch imports its feature's API module on demand, so the zod schemas of every
 * feature stay out of the first download; a query module that loads its schema beside its
 * request (no zod in it) is imported here directly, so its request starts at once.
 */
import type { LoaderFunctionArgs, Params } from 'react-router-dom';
import { getMeQueryOptions } from '../features/auth/api/get-me.ts';
import { getFleetQueryOptions } from '../features/fleet/api/get-fleet.ts';
import {
  getLimitHistoryQueryOptions,
  getLimitsQueryOptions,
} from '../features/limits/api/get-limit-set.ts';
import { queryClient } from '../lib/query-client.ts';

type Prefetch = (params: Params, url: URL) => Promise<unknown>;

/**
 * A route loader that starts `prefetch` and does not wait for it. The data is asked for once
 * the session is known (the session check answers in milliseconds, and is cached after the
 * first screen): a visitor without one is sent to sign-in, not shown a row of 401s.
 */
export function prefetching(prefetch: Prefetch) {
  return ({ params, request }: LoaderFunctionArgs) => {
    const url = new URL(request.url);
    // A failed prefetch is the page's query failing: the page shows it (and retries).
    queryClient
      .ensureQueryData(getMeQueryOptions())
      .then((me) => (me ? prefetch(params, url) : undefined))
      .catch(() => undefined);
    return null;
  };
}

const idOf = (value: string | undefined) => {
  const id = Number(value);
  return Number.isInteger(id) && id > 0 ? id : null;
};

/** The first screen: its query module carries no schema, so it ships with the shell. */
export const fleetData: Prefetch = () => queryClient.prefetchQuery(getFleetQueryOptions());

export const alertsData: Prefetch = async (_params, url) => {
  const m = await import('../features/alerts/api/get-alerts.ts');
  const { filters } = m.alertFiltersFromSearch(url.searchParams);
  return Promise.all([
    queryClient.prefetchQuery(m.getAlertsQueryOptions(filters)),
    queryClient.prefetchQuery(m.getSitesQueryOptions()),
  ]);
};

export const machineData: Prefetch = async (params) => {
  const id = idOf(params.machineId);
  if (!id) return;
  const { getMachineQueryOptions } = await import('../features/machines/api/get-machine.ts');
  return queryClient.prefetchQuery(getMachineQueryOptions(id));
};

/**
 * The point, its snapshots, its quality notices and the trend it opens on, all at once: the
 * trend is asked for on overall velocity, the band a point opens on when it has it (every
 * measured point of the built-in templates does), so it need not wait for the point to name
 * its bands; a point on another band gets that one once its bands are known. Then, with the
 * point and its snapshots here, its machine (the trend's series picker) and the spectrum its
 * spectrum view opens on.
 */
export const pointData: Prefetch = async (params, url) => {
  const id = idOf(params.pointId);
  if (!id) return;
  const [points, analyses, trends, notices, machines, opening] = await Promise.all([
    import('../features/points/api/get-point.ts'),
    import('../features/points/api/get-analyses.ts'),
    import('../features/trends/api/get-trend.ts'),
    import('../features/points/api/get-quality-notices.ts'),
    import('../features/machines/api/get-machine.ts'),
    import('../features/points/lib/spectrum-opening.ts'),
  ]);
  const anchor = trends.trendAnchor();
  const trendOn = (band: string) =>
    queryClient.prefetchQuery(
      trends.getTrendQueryOptions(trends.trendParams(id, band, trends.DEFAULT_TREND_DAYS, anchor)),
    );
  const guessed = trends.defaultTrendBand([]);
  const list = queryClient.ensureQueryData(
    analyses.getAnalysesQueryOptions({ pointId: id, limit: analyses.POINT_PAGE_ANALYSES }),
  );
  const started = [
    trendOn(guessed),
    queryClient.prefetchQuery(notices.getQualityNoticesQueryOptions(id)),
  ];
  const point = await queryClient.ensureQueryData(points.getPointQueryOptions(id));
  const band = trends.defaultTrendBand(point.bands);
  const me = queryClient.getQueryData(getMeQueryOptions().queryKey);
  const openBand = point.bands.find((b) => b.key === url.searchParams.get('band')) ?? null;
  return Promise.all([
    ...started,
    band === guessed || point.bands.length === 0 ? undefined : trendOn(band),
    queryClient.prefetchQuery(machines.getMachineQueryOptions(point.machine.id)),
    // On the latest capture when it is usable, without waiting for the list.
    Promise.resolve(opening.latestUsable(point) ?? list.then((l) => l.items)).then((items) =>
      opening.prefetchOpeningSpectrum(queryClient, items, openBand, me?.id ?? null),
    ),
  ]);
};

/** The point's limit set, and its history (listed under the editor). */
export const limitsData: Prefetch = (_params, url) => {
  const id = idOf(url.searchParams.get('point') ?? undefined);
  if (!id) return Promise.resolve();
  return Promise.all([
    queryClient.prefetchQuery(getLimitsQueryOptions(id)),
    queryClient.prefetchQuery(getLimitHistoryQueryOptions(id)),
  ]);
};

/** The review, the sites of its picker and the findings listed above its tables. */
export const reviewData: Prefetch = async (_params, url) => {
  const [m, sites, findings] = await Promise.all([
    import('../features/review/api/get-review.ts'),
    import('../features/review/api/get-sites.ts'),
    import('../features/findings/api/get-findings.ts'),
  ]);
  // "This week" in the user's zone: the loader may run before the shell has set the screen's.
  const me = queryClient.getQueryData(getMeQueryOptions().queryKey);
  const params = m.reviewParamsFromSearch(url.searchParams, me?.timeZone);
  return Promise.all([
    queryClient.prefetchQuery(m.getReviewQueryOptions(params)),
    queryClient.prefetchQuery(sites.getSitesQueryOptions()),
    // As the findings list opens: active ones (no state asked), of the review's site.
    queryClient.prefetchQuery(findings.getFindingsQueryOptions({ siteId: params.siteId })),
  ]);
};

export const usersData: Prefetch = async () => {
  const { getUsersQueryOptions } = await import('../features/users/api/get-users.ts');
  return queryClient.prefetchQuery(getUsersQueryOptions());
};

export const setupData: Prefetch = async () => {
  const { getSetupQueryOptions } = await import('../features/setup/api/get-setup.ts');
  return queryClient.prefetchQuery(getSetupQueryOptions());
};

export const gatewaysData: Prefetch = async () => {
  const m = await import('../features/gateways/api/get-gateways.ts');
  return Promise.all([
    queryClient.prefetchQuery(m.getGatewaysQueryOptions()),
    queryClient.prefetchQuery(m.getSitesQueryOptions()),
  ]);
};

export const mailboxData: Prefetch = async () => {
  const { getMailboxQueryOptions } = await import('../features/mailbox/api/get-mailbox.ts');
  return queryClient.prefetchQuery(getMailboxQueryOptions());
};
