import { Suspense, useEffect, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import type { AnalysisSummary, PointDetail } from '@turnstone/contracts/points';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { PageHeader } from '../../../components/ui/page-header.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { TabList, TabPanel } from '../../../components/ui/tabs.tsx';
import { paths } from '../../../config/paths.ts';
import { cn } from '../../../lib/cn.ts';
import { formatBandHz, formatDateTime } from '../../../lib/format.ts';
import { POINT_PAGE_ANALYSES, useAnalyses } from '../../../features/points/api/get-analyses.ts';
import { usePoint } from '../../../features/points/api/get-point.ts';
import { hasVectors } from '../../../features/points/lib/has-vectors.ts';
import {
  latestUsable,
  openingAnalysisId,
  prefetchOpeningSpectrum,
} from '../../../features/points/lib/spectrum-opening.ts';
import { preloadable } from '../../../lib/preloadable.tsx';
import { CaptureQuality } from '../../../features/points/components/capture-quality.tsx';
import { PointQualityNotices } from '../../../features/points/components/quality-notices.tsx';
import { useMe } from '../../../features/auth/api/get-me.ts';
import { TrendPanel } from '../../../features/trends/components/trend-panel.tsx';
import { useUnits } from '../../../features/account/api/use-units.ts';

/**
 * The views behind the other tabs load on demand: the point opens on its trend, so their code
 * (and their charts' parts) is not in its way. It is asked for when the pointer or focus
 * reaches the tabs, and once the page has settled, so a tab opens without waiting for it.
 */
const spectrumView = preloadable(
  () => import('../../../features/points/components/spectrum-panel.tsx'),
  (m) => m.SpectrumPanel,
);
const waveformView = preloadable(
  () => import('../../../features/points/components/waveform-panel.tsx'),
  (m) => m.WaveformPanel,
);
const waterfallView = preloadable(
  () => import('../../../features/points/components/waterfall-panel.tsx'),
  (m) => m.WaterfallPanel,
);
const vectorView = preloadable(
  () => import('../../../features/points/components/vector-panel.tsx'),
  (m) => m.VectorPanel,
);
const SpectrumPanel = spectrumView.View;
const WaveformPanel = waveformView.View;
const WaterfallPanel = waterfallView.View;
const VectorPanel = vectorView.View;
function preloadViews() {
  for (const v of [spectrumView, waveformView, waterfallView, vectorView])
    v.preload().catch(() => undefined);
}
const SETTLED_MS = 1500;

const tabs = [
  { key: 'trend', label: 'Trend' },
  { key: 'spectrum', label: 'Spectrum' },
  { key: 'waveform', label: 'Waveform' },
  { key: 'waterfall', label: 'Waterfall' },
  { key: 'vector', label: '1× vector' },
] as const;
type Tab = (typeof tabs)[number]['key'];

const verdictText = { ok: 'OK', suspect: 'Suspect', unusable: 'Unusable' } as const;

/**
 * The header's values: of the latest usable capture. When the latest capture is unusable it is
 * named with its reasons, and the values are those of the newest usable one before it.
 */
function LatestValues({
  point,
  analyses,
}: {
  point: PointDetail;
  analyses: readonly AnalysisSummary[];
}) {
  const latest = point.latest;
  if (!latest) return null;
  const l =
    latest.verdict === 'unusable'
      ? (analyses.find((a) => a.verdict !== 'unusable') ?? null)
      : latest;
  return (
    <div className="flex flex-col gap-2">
      {latest.verdict !== 'ok' && <CaptureQuality analysis={latest} where="capture" />}
      {latest.verdict === 'unusable' && (
        <p className="text-xs text-ink-muted" data-testid="header-values-from">
          {l
            ? `Values below are from the latest usable capture, ${formatDateTime(l.takenAt)}.`
            : 'No usable capture among the recent ones: no values to show.'}
        </p>
      )}
      {l && <ValuesList l={l} />}
    </div>
  );
}

function ValuesList({ l }: { l: AnalysisSummary }) {
  const units = useUnits();
  // Every overall value is shown with the band it was taken over.
  const vBand = formatBandHz(l.overall.velocityBandHz);
  const aBand = formatBandHz(l.overall.accelBandHz);
  const items: [string, string][] = [
    [`Velocity RMS · ${vBand}`, units.format(l.overall.velocityRmsMmS, 'mm/s')],
    [`Accel RMS · ${aBand}`, `${formatValue(l.overall.accelRmsG)} g`],
    [`Accel peak · ${aBand}`, `${formatValue(l.overall.accelPeakG)} g`],
    [`Displ. pk-pk · ${vBand}`, units.format(l.overall.displacementPkPkUm, 'um')],
    [`Crest factor · ${aBand}`, formatValue(l.overall.crestFactor)],
    ['ISO 20816', l.isoZone ? `Zone ${l.isoZone}` : '—'],
    ['Speed', l.speedRpm ? `${formatValue(l.speedRpm, 4)} r/min (${l.speedSource})` : 'unknown'],
    ['Quality', verdictText[l.verdict]],
  ];
  return (
    <dl className="flex flex-wrap gap-x-7 gap-y-2 rounded-lg border border-line bg-surface px-4 py-3">
      {items.map(([k, v]) => (
        <div key={k}>
          <dt className="text-xs text-ink-muted">{k}</dt>
          <dd className="font-mono text-[13.5px] text-ink">{v}</dd>
        </div>
      ))}
      <div>
        <dt className="text-xs text-ink-muted">Latest snapshot</dt>
        <dd className="font-mono text-[13.5px] text-ink">{formatDateTime(l.takenAt)}</dd>
      </div>
    </dl>
  );
}

export function PointRoute() {
  const { pointId } = useParams();
  const [search] = useSearchParams();
  const id = Number(pointId);
  const point = usePoint(id);
  const analyses = useAnalyses({ pointId: id, limit: POINT_PAGE_ANALYSES });
  const me = useMe();
  const queryClient = useQueryClient();
  // `?view=spectrum` (a link from an alert) opens the spectrum view, on `?band=`'s band.
  const [tab, setTab] = useState<Tab>(search.get('view') === 'spectrum' ? 'spectrum' : 'trend');
  const [picked, setPicked] = useState<number | null>(null);
  // `?alert=`: opened from that alert's detail; the way back to it is the first link here.
  const fromAlert = Number(search.get('alert')) || null;
  useEffect(() => {
    // The spectrum is the view most often opened next: its code comes with the page's.
    spectrumView.preload().catch(() => undefined);
    const timer = window.setTimeout(preloadViews, SETTLED_MS);
    return () => window.clearTimeout(timer);
  }, []);

  if (!Number.isInteger(id) || id <= 0)
    return <EmptyState title="No such point" description="The address does not name a point." />;
  if (point.isPending) return <LoadingPanel label="Loading point…" />;
  if (point.isError)
    return (
      <div className="p-6">
        <ErrorState
          title="Could not load the point"
          error={point.error}
          onRetry={() => void point.refetch()}
          action={
            <Link className="text-sm text-accent underline" to={paths.app.fleet.getHref()}>
              Back to the fleet
            </Link>
          }
        />
      </div>
    );
  const p = point.data;
  // While the list is on its way, the views open on the latest capture when it is usable.
  const early = analyses.isPending ? latestUsable(p) : null;
  const list = analyses.data?.items ?? early ?? [];
  const selectedId = picked ?? openingAnalysisId(list);
  const openBand = p.bands.find((b) => b.key === search.get('band')) ?? null;
  // On the intent to open a view: its code, and the spectrum the spectrum view opens on.
  const onViewIntent = () => {
    preloadViews();
    if (picked === null && analyses.data)
      prefetchOpeningSpectrum(queryClient, list, openBand, me.data?.id ?? null).catch(
        () => undefined,
      );
  };

  const snapshotBody = () => {
    if (analyses.isPending) return <LoadingPanel label="Loading snapshots…" />;
    if (analyses.isError)
      return (
        <ErrorState
          title="Could not load the snapshots"
          error={analyses.error}
          onRetry={() => void analyses.refetch()}
        />
      );
    if (list.length === 0)
      return (
        <EmptyState
          title="No snapshots yet"
          description="This point has no analysed capture yet."
        />
      );
    return null;
  };

  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 overflow-y-auto p-4 sm:px-6 sm:py-5">
      <title>{`${p.tag} · Turnstone`}</title>
      <nav aria-label="Breadcrumb" className="text-xs text-ink-muted">
        <Link to={paths.app.fleet.getHref()} className="hover:underline">
          Fleet
        </Link>{' '}
        / {p.machine.siteName} / {p.machine.areaName} /{' '}
        <Link to={paths.app.machine.getHref(p.machine.id)} className="hover:underline">
          {p.machine.name}
        </Link>
        {fromAlert && (
          <>
            {' · '}
            <Link to={paths.app.alerts.getHref(fromAlert)} className="text-accent underline">
              Back to the alert
            </Link>
          </>
        )}
      </nav>
      <PageHeader
        title={p.name}
        description={
          <span className="inline-flex flex-wrap items-center gap-3">
            <span className="font-mono text-ink">{p.tag}</span>
            <StatusMark status={p.status} />
            <span>
              {p.location}, {p.direction}
              {p.bearing ? ` · bearing ${p.bearing}` : ''}
            </span>
            <span className="font-mono">
              {p.sensitivityMvPerG} mV/g · Fmax {p.fmaxHz} Hz · {p.lines} lines
            </span>
          </span>
        }
      />
      <LatestValues point={p} analyses={list} />
      <PointQualityNotices
        pointId={p.id}
        pointTag={p.tag}
        canReview={me.data?.role === 'planner' || me.data?.role === 'engineer'}
      />
      <div className="contents" onPointerOver={onViewIntent} onFocus={onViewIntent}>
        <TabList
          group="point"
          label="Analysis views"
          tabs={tabs.filter((t) => t.key !== 'vector' || hasVectors(list))}
          value={tab}
          onChange={setTab}
          className="flex gap-1 border-b border-line"
          tabClassName={(selected) =>
            cn(
              '-mb-px border-b-2 px-3 py-2 text-sm font-medium',
              selected
                ? 'border-accent text-ink'
                : 'border-transparent text-ink-muted hover:text-ink',
            )
          }
        />
      </div>
      <TabPanel group="point" value={tab}>
        <Suspense fallback={<LoadingPanel label="Loading the view…" />}>
          {tab === 'trend' &&
            (p.bands.length === 0 ? (
              <EmptyState
                title="No bands yet"
                description="The point gets its limit set with its first analysed snapshot."
              />
            ) : (
              <TrendPanel pointId={p.id} machineId={p.machine.id} bands={p.bands} />
            ))}
          {tab === 'spectrum' &&
            ((early ? null : snapshotBody()) ?? (
              <SpectrumPanel
                band={openBand}
                userId={me.data?.id ?? null}
                bearing={p.bearing}
                analyses={list}
                selectedId={selectedId}
                onSelect={setPicked}
              />
            ))}
          {tab === 'waveform' &&
            (snapshotBody() ?? (
              <WaveformPanel analyses={list} selectedId={selectedId} onSelect={setPicked} />
            ))}
          {tab === 'waterfall' && <WaterfallPanel pointId={p.id} />}
          {tab === 'vector' && (snapshotBody() ?? <VectorPanel analyses={list} />)}
        </Suspense>
      </TabPanel>
    </div>
  );
}
