import { useEffect, useRef } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { paths } from '../../../config/paths.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { preloadRoute } from '../../../lib/route-preload.ts';
import { useAlert } from '../api/get-alert.ts';
import { HINTS_CAUTION, HintList } from '../../points/components/diagnosis-hints.tsx';
import { AcknowledgeForm } from './acknowledge-form.tsx';
import {
  AlertStateMark,
  alertEventLabels,
  alertStateSentences,
  isoZoneMeanings,
} from './alert-labels.tsx';
import { BandSparkline } from './band-sparkline.tsx';
import { useUnits } from '../../account/api/use-units.ts';

/**
 * One alert: what it is and every change of its state, oldest first; a raised alert can be
 * acknowledged here. Opening it moves the focus to its title (so it is announced and next in
 * Tab order); Escape closes it.
 */
export function AlertHistory({
  id,
  onClose,
  acknowledge,
}: {
  id: number;
  onClose: () => void;
  /** Given to those who may acknowledge. */
  acknowledge?: { userName: string; onDone: (message: string) => void };
}) {
  const units = useUnits();
  const alert = useAlert(id);
  const title = useRef<HTMLHeadingElement>(null);
  const loaded = alert.data !== undefined;
  useEffect(() => {
    if (loaded) title.current?.focus();
  }, [id, loaded]);
  // The alert's point is where an engineer goes next: its page loads meanwhile.
  const pointId = alert.data?.pointId;
  useEffect(() => {
    if (pointId) preloadRoute(paths.app.point.getHref(pointId));
  }, [pointId]);
  if (alert.isPending) return <LoadingPanel label="Loading the alert…" />;
  if (alert.isError)
    return (
      <ErrorState
        title="Could not load the alert"
        error={alert.error}
        onRetry={() => void alert.refetch()}
      />
    );
  const a = alert.data;
  return (
    <section
      aria-labelledby="alert-history-title"
      className="flex flex-col gap-4 p-4"
      onKeyDown={(e) => {
        if (e.key === 'Escape') {
          e.preventDefault();
          onClose();
        }
      }}
    >
      <div className="flex items-start justify-between gap-3">
        <div>
          <h2
            id="alert-history-title"
            ref={title}
            tabIndex={-1}
            className="text-base font-semibold text-ink focus-visible:outline-none"
          >
            {a.bandName}
          </h2>
          <p className="text-sm text-ink-muted">
            {a.machineName} · <span className="font-mono">{a.pointTag}</span> · {a.siteCode}
          </p>
        </div>
        <Button size="sm" variant="ghost" onClick={onClose} aria-label="Close the alert history">
          Close
        </Button>
      </div>
      <dl className="grid grid-cols-2 gap-x-4 gap-y-2 text-sm">
        <dt className="text-ink-muted">Level</dt>
        <dd>
          <StatusMark status={a.level} />
        </dd>
        <dt className="text-ink-muted">State</dt>
        <dd>
          <AlertStateMark state={a.state} />
        </dd>
        <dt className="text-ink-muted">Last value</dt>
        <dd className="font-mono">{units.format(a.value, a.unit)}</dd>
        <dt className="text-ink-muted">Highest while open</dt>
        <dd className="font-mono">{units.format(a.peakValue, a.unit)}</dd>
        <dt className="text-ink-muted">Level exceeded</dt>
        <dd className="font-mono">{units.format(a.limit, a.unit)}</dd>
        <dt className="text-ink-muted">Machine ISO 20816</dt>
        <dd data-testid="alert-machine-zone">
          {a.machineZone ? (
            <>
              Zone {a.machineZone}
              <span className="block text-xs text-ink-muted">{isoZoneMeanings[a.machineZone]}</span>
            </>
          ) : (
            <span className="text-ink-faint">no zone yet</span>
          )}
        </dd>
      </dl>
      <BandSparkline alert={a} />
      {a.bandMeaning && (
        <p className="text-sm text-ink-muted" data-testid="alert-band-meaning">
          {a.bandMeaning}
        </p>
      )}
      <p className="text-sm text-ink" data-testid="alert-state-explained">
        {alertStateSentences(a, units.system).join(' ')}
      </p>
      <nav aria-label="Where to look next" className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
        <Link className="text-accent underline" to={paths.app.point.getHref(a.pointId)}>
          Point {a.pointTag}
        </Link>
        <Link
          className="text-accent underline"
          to={paths.app.point.getHref(a.pointId, a.bandKey, undefined, a.id)}
        >
          Trend of {a.bandName}
        </Link>
        <Link
          className="text-accent underline"
          to={paths.app.point.getHref(a.pointId, a.bandKey, 'spectrum', a.id)}
        >
          Spectrum of {a.bandName}
        </Link>
      </nav>
      {acknowledge && a.state === 'raised' && (
        <AcknowledgeForm
          ids={[a.id]}
          label="Note for this alert"
          userName={acknowledge.userName}
          onDone={(m) => {
            acknowledge.onDone(m);
            // The form goes once the alert is acknowledged: keep the focus in the panel.
            title.current?.focus();
          }}
        />
      )}
      <div>
        <h3 className="text-xs font-semibold tracking-wide text-ink-muted uppercase">
          Current diagnosis hints
        </h3>
        <p className="mb-2 text-xs text-ink-muted">
          {a.currentDiagnosis
            ? `From the point's latest capture, ${formatDateTime(a.currentDiagnosis.takenAt)}. `
            : ''}
          {HINTS_CAUTION}
        </p>
        <HintList diagnosis={a.currentDiagnosis?.diagnosis ?? null} headingLevel={4} />
      </div>
      <div>
        <h3 className="mb-2 text-xs font-semibold tracking-wide text-ink-muted uppercase">
          History
        </h3>
        <ol className="flex flex-col gap-3 border-l border-line pl-4">
          {a.history.map((h) => (
            <li key={h.id} className="relative text-sm">
              <span
                aria-hidden="true"
                className="absolute top-1.5 -left-[21px] size-2 rounded-full bg-line-strong"
              />
              <p className="font-medium text-ink">
                {alertEventLabels[h.kind]}
                {h.value !== null && (
                  <span className="ml-2 font-mono text-[13px] text-ink-muted">
                    {units.format(h.value, a.unit)}
                  </span>
                )}
              </p>
              <p className="text-xs text-ink-muted">
                <time dateTime={h.at}>{formatDateTime(h.at)}</time>
                {h.userName && <> · {h.userName}</>}
              </p>
              {h.note && <p className="mt-1 text-[13px] text-ink">“{h.note}”</p>}
            </li>
          ))}
        </ol>
      </div>
    </section>
  );
}
