import { useMemo, useState } from 'react';
import type {
  AnalysisSummary,
  DiagnosisHintItem,
  FaultFrequencyItem,
} from '@turnstone/contracts/points';
import { useUnits } from '../../account/api/use-units.ts';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import {
  SpectrumChart,
  type SpectrumHighlight,
  type SpectrumMarker,
  type SpectrumTrace,
} from '../../../components/charts/spectrum-chart.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Field, Input, Select } from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { Segmented } from '../../../components/ui/segmented.tsx';
import { type ApiError, isApiError } from '../../../lib/api-client.ts';
import { cn } from '../../../lib/cn.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useSpectrum } from '../api/get-spectrum.ts';
import { SnapshotPicker } from './snapshot-picker.tsx';
import { HintsSidePanel } from './diagnosis-hints.tsx';

type Measure = 'acceleration' | 'velocity' | 'envelope';
type Axis = 'hz' | 'order';

const measureLabels: Record<Measure, string> = {
  acceleration: 'Acceleration',
  velocity: 'Velocity',
  envelope: 'Envelope',
};

/** The spectrum to fetch for a measure on an axis: acceleration in orders is the stored order spectrum. */
function kindFor(measure: Measure, axis: Axis) {
  return measure === 'acceleration' && axis === 'order' ? 'order' : measure;
}

function useTrace(
  analysisId: number | null,
  measure: Measure,
  axis: Axis,
  role: SpectrumTrace['role'],
) {
  const q = useSpectrum(analysisId, kindFor(measure, axis));
  const units = useUnits();
  const trace = useMemo((): (SpectrumTrace & { shaftHz: number | null }) | null => {
    const s = q.data;
    if (!s) return null;
    // Lines in the user's unit system (velocity in in/s for imperial; g stays g).
    const k = units.value(1, s.unit);
    const values = k === 1 ? s.decoded : s.decoded.map((v) => v * k);
    const shaftHz = s.speed.hz;
    let step = s.axis === 'order' ? s.dOrder! : s.dfHz!;
    // Velocity and envelope in orders: the Hz axis divided by the running speed.
    if (axis === 'order' && s.axis === 'hz') {
      if (!shaftHz) return null;
      step = step / shaftHz;
    }
    return { label: formatDateTime(s.takenAt), values, step, role, shaftHz };
  }, [q.data, axis, role, units]);
  return { query: q, trace };
}

export function SpectrumPanel({
  analyses,
  selectedId,
  onSelect,
  bearing,
}: {
  /** The bearing the point sits on: its defect frequencies are marked by default. */
  bearing: string | null;
  analyses: readonly AnalysisSummary[];
  selectedId: number | null;
  onSelect: (id: number | null) => void;
}) {
  const [measure, setMeasure] = useState<Measure>('acceleration');
  const [axis, setAxis] = useState<Axis>('hz');
  const [compareId, setCompareId] = useState<number | null>(null);
  const [markerSet, setMarkerSet] = useState<'point' | 'all' | 'none'>(bearing ? 'point' : 'all');
  const [cursor, setCursor] = useState<number | null>(null);
  const [cursorCount, setCursorCount] = useState(10);
  // The hint whose evidence is marked, per snapshot (a new snapshot starts with none).
  const [hintPick, setHintPick] = useState<{ analysisId: number | null; index: number | null }>({
    analysisId: null,
    index: null,
  });

  const main = useTrace(selectedId, measure, axis, 'main');
  const compare = useTrace(compareId, measure, axis, 'compare');
  const selected = analyses.find((a) => a.id === selectedId) ?? null;
  const ordersPossible = selected ? selected.speedRpm !== null : true;

  const traces = useMemo(
    () => [main.trace, compare.trace].filter((t): t is NonNullable<typeof t> => t !== null),
    [main.trace, compare.trace],
  );
  const s = main.query.data;
  const markers = useMemo((): SpectrumMarker[] => {
    if (!s || markerSet === 'none') return [];
    const bearingKinds = new Set(['bpfo', 'bpfi', 'bsf', 'ftf']);
    return s.faultFrequencies
      .filter(
        (f) =>
          markerSet === 'all' ||
          !bearingKinds.has(f.kind) ||
          (bearing !== null && f.name.startsWith(`${bearing} `)),
      )
      .map((f: FaultFrequencyItem) => ({
        name: f.name,
        kind: f.kind,
        x: axis === 'order' ? f.order : (f.hz ?? NaN),
      }))
      .filter((m) => Number.isFinite(m.x));
  }, [s, markerSet, axis, bearing]);
  const diagnosis = selected?.diagnosis ?? null;
  const hintIndex = hintPick.analysisId === selectedId ? hintPick.index : null;
  const hint: DiagnosisHintItem | null =
    hintIndex !== null ? (diagnosis?.hints[hintIndex] ?? null) : null;
  const mainTrace = main.trace;
  const highlights = useMemo((): SpectrumHighlight[] => {
    if (!hint || !mainTrace) return [];
    const out: SpectrumHighlight[] = [];
    for (const e of hint.evidence) {
      if (e.spectrum !== measure) continue;
      const x = axis === 'order' ? e.order : e.hz;
      // On the drawn line's own peak (within ±2 lines of the evidence frequency).
      const k = Math.round(x / mainTrace.step);
      let y = 0;
      for (let j = Math.max(0, k - 2); j <= Math.min(mainTrace.values.length - 1, k + 2); j++)
        y = Math.max(y, mainTrace.values[j]!);
      if (Number.isFinite(x) && y > 0) out.push({ x, y, label: e.label });
    }
    return out;
  }, [hint, mainTrace, measure, axis]);
  const elsewhere = hint ? hint.evidence.filter((e) => e.spectrum !== measure) : [];
  const cursorOpt = useMemo(
    () => (cursor ? { fundamental: cursor, count: cursorCount } : null),
    [cursor, cursorCount],
  );

  const axisName = axis === 'hz' ? 'Hz' : 'order';
  const units = useUnits();
  const unit = s ? units.unit(s.unit) : '';
  const yName = s ? `${unit} ${s.scale === 'rms' ? 'RMS' : 'peak'}` : '';

  return (
    <Card className="flex flex-col gap-4 p-4">
      <div className="flex flex-wrap items-end gap-4">
        <SnapshotPicker
          label="Snapshot"
          analyses={analyses}
          value={selectedId}
          onChange={onSelect}
        />
        <SnapshotPicker
          label="Compare with"
          analyses={analyses.filter((a) => a.id !== selectedId)}
          value={compareId}
          onChange={setCompareId}
          allowNone
        />
      </div>
      <div className="flex flex-wrap items-end gap-4">
        <Segmented
          label="Measure"
          value={measure}
          onChange={setMeasure}
          options={(['acceleration', 'velocity', 'envelope'] as const).map((m) => ({
            value: m,
            label: measureLabels[m],
          }))}
        />
        <Segmented
          label="X axis"
          value={axis}
          onChange={(v) => {
            setAxis(v);
            setCursor(null);
          }}
          options={[
            { value: 'hz', label: 'Hz' },
            { value: 'order', label: 'Orders', disabled: !ordersPossible },
          ]}
        />
        <Field label="Fault-frequency markers">
          {(c) => (
            <Select
              id={c.id}
              value={markerSet}
              onChange={(e) => setMarkerSet(e.target.value as typeof markerSet)}
            >
              {bearing && <option value="point">Shaft, gears, blades, {bearing}</option>}
              <option value="all">All components</option>
              <option value="none">None</option>
            </Select>
          )}
        </Field>
        <div className="flex items-end gap-2">
          <label className="flex flex-col gap-1.5 text-sm font-medium text-ink">
            Harmonic cursor ({axisName})
            <Input
              type="number"
              min={0}
              step="any"
              controlSize="sm"
              className="w-28 font-mono"
              value={cursor ?? ''}
              placeholder="click chart"
              onChange={(e) => setCursor(e.target.value === '' ? null : Number(e.target.value))}
            />
          </label>
          <label className="flex flex-col gap-1.5 text-sm font-medium text-ink">
            Harmonics
            <Input
              type="number"
              min={1}
              max={40}
              controlSize="sm"
              className="w-20 font-mono"
              value={cursorCount}
              onChange={(e) =>
                setCursorCount(Math.max(1, Math.min(40, Number(e.target.value) || 1)))
              }
            />
          </label>
          {cursor !== null && (
            <Button size="sm" variant="ghost" onClick={() => setCursor(null)}>
              Clear cursor
            </Button>
          )}
        </div>
      </div>

      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_20rem]">
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
          ) : !main.trace ? (
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
                markers={markers}
                highlights={highlights}
                cursor={cursorOpt}
                onPick={(x) => setCursor(Number(x.toPrecision(5)))}
                ariaLabel={`${measureLabels[measure]} spectrum in ${yName} against ${axisName}${compare.trace ? ', with a second snapshot for comparison' : ''}${highlights.length ? `, with ${highlights.length} evidence peaks of the ${hint ? hint.code : ''} hint marked` : ''}`}
              />
              <p className="text-xs text-ink-muted">
                Scroll or drag the slider to zoom. Click the chart to put the harmonic cursor&apos;s
                fundamental there. Speed{' '}
                <span className="font-mono text-ink">
                  {s?.speed.rpm ? `${formatValue(s.speed.rpm, 4)} r/min` : 'unknown'}
                </span>
                {s?.speed.source && s.speed.source !== 'none' ? ` (${s.speed.source})` : ''}.
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
              {s && (
                <PeakTable
                  peaks={s.peaks.map((p) => ({
                    ...p,
                    amplitude: units.value(p.amplitude, s.unit),
                  }))}
                  unit={unit}
                  axis={axis}
                />
              )}
            </>
          )}
        </div>
        <HintsSidePanel
          diagnosis={diagnosis}
          selected={hintIndex}
          onSelect={(index, h) => {
            setHintPick({ analysisId: selectedId, index });
            const first = h?.evidence[0];
            if (first) setMeasure(first.spectrum);
          }}
        />
      </div>
    </Card>
  );
}

/** The nearest capture with its spectra, as a 410 `spectrum_thinned` names it. */
interface ThinnedDetails {
  nearest: { analysisId: number; takenAt: string } | null;
}

function thinnedSpectrum(error: unknown): boolean {
  return isApiError(error) && error.code === 'spectrum_thinned';
}

/** A capture whose spectra retention thinned away: say so and offer the nearest whole one. */
function ThinnedSpectrum({ error, onOpen }: { error: ApiError; onOpen: (id: number) => void }) {
  const nearest = (error.details as ThinnedDetails | undefined)?.nearest ?? null;
  return (
    <div role="status">
      <EmptyState
        title="Spectrum no longer stored"
        description={
          <>
            Older captures keep their spectra only at a reduced rate (retention policy); this one
            keeps its overall and band values in the trend.
            {nearest
              ? ` The nearest capture of this point with its spectrum was taken ${formatDateTime(nearest.takenAt)}.`
              : ' No capture of this point still has its spectrum.'}
          </>
        }
        action={
          nearest ? (
            <Button onClick={() => onOpen(nearest.analysisId)}>
              Open the capture of {formatDateTime(nearest.takenAt)}
            </Button>
          ) : undefined
        }
      />
    </div>
  );
}

function PeakTable({
  peaks,
  unit,
  axis,
}: {
  peaks: { hz: number | null; order: number | null; amplitude: number }[];
  unit: string;
  axis: Axis;
}) {
  if (peaks.length === 0) return null;
  return (
    <div className="overflow-x-auto">
      <table className="w-full max-w-xl text-left text-sm">
        <caption className="mb-1 text-left text-sm font-semibold text-ink">Largest peaks</caption>
        <thead className="text-xs text-ink-muted">
          <tr className="border-b border-line">
            <th className="py-1 pr-4 font-medium">#</th>
            <th className="py-1 pr-4 text-right font-medium">Frequency (Hz)</th>
            <th className="py-1 pr-4 text-right font-medium">Order</th>
            <th className="py-1 text-right font-medium">Amplitude ({unit})</th>
          </tr>
        </thead>
        <tbody className="font-mono text-[13px]">
          {peaks.map((p, i) => (
            <tr key={i} className={cn('border-b border-line/60', axis === 'order' && 'order-row')}>
              <td className="py-1 pr-4 text-ink-muted">{i + 1}</td>
              <td className="py-1 pr-4 text-right">{p.hz === null ? '—' : p.hz.toFixed(2)}</td>
              <td className="py-1 pr-4 text-right">
                {p.order === null ? '—' : p.order.toFixed(3)}
              </td>
              <td className="py-1 text-right">{formatValue(p.amplitude, 4)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
