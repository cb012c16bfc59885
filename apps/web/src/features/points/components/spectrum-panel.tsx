import { useMemo, useState } from 'react';
import type { AnalysisSummary, DiagnosisHintItem, PointBand } from '@turnstone/contracts/points';
import { useUnits } from '../../account/api/use-units.ts';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import {
  SpectrumChart,
  type SpectrumHighlight,
} from '../../../components/charts/spectrum-chart.tsx';
import { MarkerKey } from '../../../components/charts/spectrum-marker-key.tsx';
import {
  amplitudeScaleLabel,
  decibelUnit,
  differenceDb,
  harmonicLines,
  lowCutoff,
  realPeaks,
  sidebandLines,
  snapToPeak,
  type AmplitudeScale,
} from '../../../components/charts/spectrum-math.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import type { ApiError } from '../../../lib/api-client.ts';
import { MARK_HARMONICS, useSpectrumMarks } from '../lib/use-spectrum-marks.ts';
import { useSpectrumTrace } from '../lib/use-spectrum-trace.ts';
import { rememberedView } from '../lib/spectrum-opening.ts';
import {
  spanOnAxis,
  spectrumStart,
  writeRemembered,
  type Axis,
  type Measure,
} from '../lib/spectrum-view.ts';
import { SnapshotCard, SnapshotPicker } from './snapshot-picker.tsx';
import { HintsSidePanel } from './diagnosis-hints.tsx';
import { CaptureQuality } from './capture-quality.tsx';
import { CursorReadouts, PeakTable } from './spectrum-readouts.tsx';
import { SpectrumCursorKeys } from './spectrum-cursor-keys.tsx';
import { measureLabels, SpectrumToolbar, type CursorSettings } from './spectrum-toolbar.tsx';
import { ThinnedSpectrum, thinnedSpectrum } from './thinned-spectrum.tsx';

/** The evidence window runs from 0 to this many times the highest evidence peak. */
const EVIDENCE_ZOOM = 2;

const storage = (): Storage | null => (typeof localStorage === 'undefined' ? null : localStorage);

export function SpectrumPanel({
  analyses,
  selectedId,
  onSelect,
  bearing,
  band,
  userId,
}: {
  /** The bearing the point sits on: its defect frequencies are marked by default. */
  bearing: string | null;
  analyses: readonly AnalysisSummary[];
  selectedId: number | null;
  onSelect: (id: number | null) => void;
  /** The band the page was opened on (an alert's `?band=`): the view opens on it. */
  band: PointBand | null;
  /** Whose last measure and span are remembered (null: nothing remembered). */
  userId: number | null;
}) {
  const units = useUnits();
  const [remembered] = useState(() => rememberedView(userId));
  const first = spectrumStart(band, [], remembered);
  const [measure, setMeasure] = useState<Measure>(first.measure);
  const [axis, setAxis] = useState<Axis>('hz');
  const [scale, setScale] = useState<AmplitudeScale | null>(null);
  const [decibels, setDecibels] = useState(false);
  const [view, setView] = useState<[number, number] | null>(null);
  const [reason, setReason] = useState<string | null>(null);
  const [compareId, setCompareId] = useState<number | null>(null);
  const [cursor, setCursor] = useState<CursorSettings>({
    mode: 'harmonic',
    harmonics: 10,
    spacing: null,
    sidebands: 3,
  });
  const [fundamental, setFundamental] = useState<number | null>(null);
  const [carrier, setCarrier] = useState<number | null>(null);
  const [points, setPoints] = useState<{ name: 'A' | 'B'; x: number }[]>([]);
  const [probe, setProbe] = useState<number | null>(null);
  const [hintPick, setHintPick] = useState<{ analysisId: number | null; index: number | null }>({
    analysisId: null,
    index: null,
  });

  const main = useSpectrumTrace(selectedId, measure, axis, 'main', scale);
  const compare = useSpectrumTrace(compareId, measure, axis, 'compare', scale);
  const selected = analyses.find((a) => a.id === selectedId) ?? null;
  const ordersPossible = selected ? selected.speedRpm !== null : true;
  const s = main.query.data;
  const mt = main.trace;
  const shaftHz = s?.speed.hz ?? null;
  const xMax = mt ? (mt.values.length - 1) * mt.step : 0;

  // The opening window, once the first spectrum (its speed and fault frequencies) is here.
  if (view === null && mt && s) {
    const start = spectrumStart(band, s.faultFrequencies, remembered);
    setView(spanOnAxis(start.span, axis, shaftHz, xMax) ?? [0, xMax]);
    setReason(start.reason);
  }
  const shownView = useMemo((): [number, number] => {
    if (!view) return [0, xMax];
    const lo = Math.min(Math.max(0, view[0]), xMax);
    const hi = Math.min(view[1], xMax);
    return hi > lo ? [lo, hi] : [0, xMax];
  }, [view, xMax]);

  const remember = (m: Measure, v: readonly [number, number] | null) => {
    const st = storage();
    if (!st || userId === null || !v) return;
    const to = axis === 'order' ? v[1] : shaftHz ? v[1] / shaftHz : null;
    if (to !== null) writeRemembered(st, userId, { measure: m, spanOrders: to });
  };
  const onView = (v: [number, number]) => {
    setView(v);
    remember(measure, v);
  };

  const traces = useMemo(
    () => [mt, compare.trace].filter((t): t is NonNullable<typeof t> => t !== null),
    [mt, compare.trace],
  );
  const fm = useSpectrumMarks({ faults: s?.faultFrequencies, axis, bearing, band, xMax });

  const diagnosis = selected?.diagnosis ?? null;
  const hintIndex = hintPick.analysisId === selectedId ? hintPick.index : null;
  const hint: DiagnosisHintItem | null =
    hintIndex !== null ? (diagnosis?.hints[hintIndex] ?? null) : null;
  const highlights = useMemo((): SpectrumHighlight[] => {
    if (!hint || !mt) return [];
    const out: SpectrumHighlight[] = [];
    for (const e of hint.evidence) {
      if (e.spectrum !== measure) continue;
      const x = axis === 'order' ? e.order : e.hz;
      // On the drawn line's own peak (within ±2 lines of the evidence frequency).
      const k = Math.round(x / mt.step);
      let y = 0;
      for (let j = Math.max(0, k - 2); j <= Math.min(mt.values.length - 1, k + 2); j++)
        y = Math.max(y, mt.values[j]!);
      if (Number.isFinite(x) && y > 0) out.push({ x, y, label: e.label });
    }
    return out;
  }, [hint, mt, measure, axis]);
  const elsewhere = hint ? hint.evidence.filter((e) => e.spectrum !== measure) : [];

  const lowCut = mt ? lowCutoff(mt.step, axis, shaftHz) : 0;
  const spacing = cursor.spacing ?? (axis === 'order' ? 1 : shaftHz);
  const cursors = useMemo(() => {
    if (!mt) return { harmonic: [], sideband: [], points: [], probe };
    return {
      probe,
      harmonic: fundamental ? harmonicLines(mt.values, mt.step, fundamental, cursor.harmonics) : [],
      sideband:
        carrier && spacing
          ? sidebandLines(mt.values, mt.step, carrier, spacing, cursor.sidebands)
          : [],
      points: points.map((p) => ({
        ...p,
        amplitude: harmonicLines(mt.values, mt.step, p.x, 1)[0]?.amplitude ?? null,
      })),
    };
  }, [mt, fundamental, carrier, spacing, cursor.harmonics, cursor.sidebands, points, probe]);
  const found = useMemo(
    () =>
      mt
        ? realPeaks(mt.values, mt.step, shownView[0], shownView[1], { lowCut, marks: fm.allMarks })
        : null,
    [mt, shownView, lowCut, fm.allMarks],
  );
  const ct = compare.trace;
  const difference = useMemo(
    () =>
      mt && ct
        ? { values: differenceDb(mt.values, mt.step, ct.values, ct.step), step: mt.step }
        : null,
    [mt, ct],
  );

  const onPick = (x: number) => {
    if (!mt) return;
    const at = snapToPeak(mt.values, mt.step, x);
    if (cursor.mode === 'harmonic') setFundamental(at);
    else if (cursor.mode === 'sideband') setCarrier(at);
    else
      setPoints((ps) =>
        ps.length === 1 ? [ps[0]!, { name: 'B', x: at }] : [{ name: 'A', x: at }],
      );
  };
  const clearCursors = () => {
    setFundamental(null);
    setCarrier(null);
    setPoints([]);
  };

  const axisName = axis === 'hz' ? 'Hz' : 'order';
  const unit = s ? units.unit(s.unit) : '';
  const shownScale: AmplitudeScale = scale ?? s?.scale ?? 'rms';
  const dbUnit = decibelUnit(unit);
  const dbOn = decibels && dbUnit !== null;
  const linearName = `${unit} ${amplitudeScaleLabel[shownScale]}`;
  const yName = dbOn ? `dB re ISO 1683 (${linearName})` : linearName;
  // How every readout under the chart states a position and an amplitude.
  const readout = { axis, shaftHz, unit: linearName };

  return (
    <SnapshotCard
      analyses={analyses}
      selectedId={selectedId}
      onSelect={onSelect}
      beside={
        <SnapshotPicker
          label="Compare with"
          analyses={analyses.filter((a) => a.id !== selectedId)}
          value={compareId}
          onChange={setCompareId}
          allowNone
        />
      }
    >
      {selected && <CaptureQuality analysis={selected} where="spectrum" />}
      <SpectrumToolbar
        measure={measure}
        onMeasure={(m) => {
          setMeasure(m);
          remember(m, view);
        }}
        axis={axis}
        onAxis={(a) => {
          if (a === axis) return;
          // The same window on the other axis.
          if (view && shaftHz) {
            const f = a === 'order' ? 1 / shaftHz : shaftHz;
            setView([view[0] * f, view[1] * f]);
          } else setView(null);
          setAxis(a);
          clearCursors();
        }}
        ordersPossible={ordersPossible}
        scale={shownScale}
        onScale={setScale}
        decibels={dbOn}
        decibelsPossible={dbUnit !== null}
        onDecibels={setDecibels}
        view={mt ? shownView : null}
        onView={onView}
        cursor={cursor}
        onCursor={setCursor}
        onClearCursors={clearCursors}
        hasCursors={fundamental !== null || carrier !== null || points.length > 0}
      />

      <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="flex min-w-0 flex-col gap-4">
          {selectedId === null ? (
            <EmptyState title="No snapshot chosen" description="Pick a snapshot above." />
          ) : main.query.isPending ? (
            <LoadingPanel label="Loading spectrum…" />
          ) : main.query.isError && thinnedSpectrum(main.query.error) ? (
            <ThinnedSpectrum
              error={main.query.error as ApiError}
              onOpen={(id) => {
                setCompareId(null);
                onSelect(id);
              }}
            />
          ) : main.query.isError ? (
            <ErrorState
              title="Could not load the spectrum"
              error={main.query.error}
              onRetry={() => void main.query.refetch()}
            />
          ) : !mt ? (
            <EmptyState
              title="No order axis for this capture"
              description="Its running speed is not known, so the spectrum cannot be drawn in orders."
            />
          ) : (
            <>
              <SpectrumChart
                traces={traces}
                axis={axis}
                yName={yName}
                unit={unit}
                decibels={dbOn ? dbUnit : null}
                view={shownView}
                onView={onView}
                lowCut={lowCut}
                marks={fm.marks}
                cursors={cursors}
                highlights={highlights}
                difference={difference}
                onPick={onPick}
                ariaLabel={`${measureLabels[measure]} spectrum in ${yName} against ${axisName}${compare.trace ? ', with a second snapshot for comparison and the change in dB per line' : ''}${highlights.length ? `, with ${highlights.length} evidence peaks of the ${hint ? hint.code : ''} hint marked` : ''}`}
              />
              <SpectrumCursorKeys
                values={mt.values}
                step={mt.step}
                view={shownView}
                lowCut={lowCut}
                {...readout}
                {...(cursor.mode === 'harmonic'
                  ? { target: 'harmonic cursor', start: fundamental }
                  : cursor.mode === 'sideband'
                    ? { target: 'sideband carrier', start: carrier }
                    : { target: `cursor ${points.length === 1 ? 'B' : 'A'}`, start: null })}
                probe={probe}
                onProbe={setProbe}
                onSet={onPick}
              />
              <MarkerKey
                families={fm.families}
                shown={fm.shown}
                unit={axisName}
                harmonics={MARK_HARMONICS}
                onToggle={fm.toggle}
                onOnly={fm.only}
              />
              <p className="text-xs text-ink-muted" data-testid="spectrum-notes">
                {reason ? `${reason}. ` : ''}Scroll, drag or type a range to zoom; the y axis
                follows the lines in view above {formatValue(lowCut, 3)} {axisName} (the 0 Hz line
                and its leakage never set it). A click puts the chosen cursor on the nearest peak.
                Speed{' '}
                <span className="font-mono text-ink">
                  {s?.speed.rpm ? `${formatValue(s.speed.rpm, 4)} r/min` : 'unknown'}
                </span>
                {s?.speed.source && s.speed.source !== 'none' ? ` (${s.speed.source})` : ''}.
                {dbOn &&
                  ` dB re ISO 1683:2015 reference values: acceleration 1 µm/s², velocity 1 nm/s, displacement 1 pm.`}
                {compareId !== null &&
                  compare.query.isError &&
                  ' The compared snapshot could not be loaded.'}
              </p>
              {hint && elsewhere.length > 0 && (
                <p className="text-xs text-ink-muted" role="status">
                  {elsewhere.length} evidence peak{elsewhere.length > 1 ? 's' : ''} of this hint{' '}
                  {elsewhere.length > 1 ? 'are' : 'is'} in the {elsewhere[0]!.spectrum} spectrum
                  {new Set(elsewhere.map((e) => e.spectrum)).size > 1 ? ' and others' : ''}.{' '}
                  <button
                    type="button"
                    className="font-medium text-accent underline"
                    onClick={() => setMeasure(elsewhere[0]!.spectrum)}
                  >
                    Show {measureLabels[elsewhere[0]!.spectrum].toLowerCase()}
                  </button>
                </p>
              )}
              <CursorReadouts
                harmonic={cursors.harmonic}
                sideband={cursors.sideband}
                points={cursors.points}
                {...readout}
              />
              {found && <PeakTable peaks={found.peaks} floor={found.floor} {...readout} />}
            </>
          )}
        </div>
        <HintsSidePanel
          diagnosis={diagnosis}
          selected={hintIndex}
          onSelect={(index, h) => {
            setHintPick({ analysisId: selectedId, index });
            const ev = h?.evidence ?? [];
            const firstEv = ev[0];
            if (firstEv) setMeasure(firstEv.spectrum);
            // Open the window on the evidence (0 to twice its highest peak).
            const top = Math.max(0, ...ev.map((e) => (axis === 'order' ? e.order : e.hz)));
            if (top > 0) setView([0, EVIDENCE_ZOOM * top]);
          }}
        />
      </div>
    </SnapshotCard>
  );
}
