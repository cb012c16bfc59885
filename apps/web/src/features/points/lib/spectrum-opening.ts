/**
 * The spectrum the point's spectrum view asks for first, known before the view is open: the
 * page and the route's prefetch ask for it on the intent to open the view (pointer or focus on
 * its tab, or on a link to the point), so it is here, or on its way, when the view opens.
 */
import type { QueryClient } from '@tanstack/react-query';
import type { AnalysisSummary, PointBand, PointDetail } from '@turnstone/contracts/points';
import { getSpectrumQueryOptions } from '../api/get-spectrum.ts';
import { kindFor, readRemembered, spectrumStart } from './spectrum-view.ts';

/** The capture the views open on: the latest usable one (an unusable one stays one pick away). */
export function openingAnalysisId(analyses: readonly AnalysisSummary[]): number | null {
  return (analyses.find((a) => a.verdict !== 'unusable') ?? analyses[0])?.id ?? null;
}

/**
 * The captures a view can open on before the point's list of them is here: the point's latest
 * capture when it is usable, which is where the list (newest first) opens too, so the spectrum
 * need not wait for the whole list. Null when the latest is unusable (or there is none): the
 * opening capture is then known only from the list.
 */
export function latestUsable(point: Pick<PointDetail, 'latest'>): AnalysisSummary[] | null {
  return point.latest && point.latest.verdict !== 'unusable' ? [point.latest] : null;
}

const storage = (): Storage | null => (typeof localStorage === 'undefined' ? null : localStorage);

/** What this user last chose in this browser (the spectrum view's remembered measure and span). */
export function rememberedView(userId: number | null) {
  const st = storage();
  return st && userId !== null ? readRemembered(st, userId) : null;
}

/**
 * Starts loading the spectrum the view opens on (as SpectrumPanel's first query asks for it:
 * same options, same key): `band` the band it is opened on (`?band=`), `userId` whose
 * remembered measure applies. Does nothing when there is no capture, or it is already cached.
 */
export function prefetchOpeningSpectrum(
  queryClient: QueryClient,
  analyses: readonly AnalysisSummary[],
  band: PointBand | null,
  userId: number | null,
): Promise<void> {
  const analysisId = openingAnalysisId(analyses);
  if (analysisId === null) return Promise.resolve();
  // The opening measure does not depend on the fault frequencies (only its span does).
  const { measure } = spectrumStart(band, [], rememberedView(userId));
  return queryClient.prefetchQuery(getSpectrumQueryOptions(analysisId, kindFor(measure, 'hz')));
}
