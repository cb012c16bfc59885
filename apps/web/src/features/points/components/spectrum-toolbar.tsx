/**
 * The spectrum's controls: measure, x axis, amplitude (RMS / peak / peak-to-peak, linear or
 * dB), the x range typed in, and the cursors (what a click on the chart sets, the harmonic
 * count, the sideband spacing and count).
 */
import { useState } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { Input } from '../../../components/ui/field.tsx';
import { Segmented } from '../../../components/ui/segmented.tsx';
import type { AmplitudeScale } from '../../../components/charts/spectrum-math.ts';
import type { Axis, Measure } from '../lib/spectrum-view.ts';

export const measureLabels: Record<Measure, string> = {
  acceleration: 'Acceleration',
  velocity: 'Velocity',
  envelope: 'Envelope',
};

const axisLabels: Record<Axis, string> = { hz: 'Hz', order: 'Orders' };
const scaleLabels: Record<AmplitudeScale, string> = {
  rms: 'RMS',
  peak: 'Peak',
  'peak-to-peak': 'Pk-pk',
};
const yScaleLabels = { linear: 'Linear', db: 'dB' } as const;
const cursorModeLabels = {
  harmonic: 'Harmonic cursor',
  sideband: 'Sideband carrier',
  points: 'Cursors A/B',
} as const;

/** A segmented control's options from their labels, in order; `off` names those not on offer. */
function choices<T extends string>(labels: Record<T, string>, off: readonly T[] = []) {
  return (Object.entries(labels) as [T, string][]).map(([value, label]) => ({
    value,
    label,
    disabled: off.includes(value),
  }));
}

export type CursorMode = keyof typeof cursorModeLabels;

export interface CursorSettings {
  mode: CursorMode;
  harmonics: number;
  /** Sideband spacing on the axis shown; null: not set. */
  spacing: number | null;
  sidebands: number;
}

function NumberBox({
  label,
  value,
  onChange,
  width = 'w-28',
  min,
  max,
  placeholder,
}: {
  label: string;
  value: number | null;
  onChange: (v: number | null) => void;
  width?: string;
  min?: number;
  max?: number;
  placeholder?: string;
}) {
  return (
    <label className={`flex ${width} flex-col gap-1.5 text-sm font-medium text-ink`}>
      {label}
      <Input
        type="number"
        min={min}
        max={max}
        step="any"
        controlSize="sm"
        className="font-mono"
        value={value ?? ''}
        placeholder={placeholder}
        onChange={(e) => onChange(e.target.value === '' ? null : Number(e.target.value))}
      />
    </label>
  );
}

/** A count from 1 to `max`: what is typed is held to that range (empty counts as 1). */
function CountBox({
  max,
  onChange,
  ...box
}: {
  label: string;
  value: number;
  max: number;
  width: string;
  onChange: (n: number) => void;
}) {
  return (
    <NumberBox
      {...box}
      min={1}
      max={max}
      onChange={(v) => onChange(Math.max(1, Math.min(max, v ?? 1)))}
    />
  );
}

/** The x range typed in: applied on Enter or with the button (not on every key). */
function RangeForm({
  view,
  unit,
  onView,
}: {
  view: readonly [number, number];
  unit: string;
  onView: (v: [number, number]) => void;
}) {
  const [draft, setDraft] = useState<{ from: string; to: string; seen: readonly [number, number] }>(
    { from: '', to: '', seen: view },
  );
  const shown = draft.seen === view ? draft : { from: '', to: '', seen: view };
  const num = (s: string, fallback: number) => (s.trim() === '' ? fallback : Number(s));
  const from = num(shown.from, view[0]);
  const to = num(shown.to, view[1]);
  const valid = Number.isFinite(from) && Number.isFinite(to) && from >= 0 && to > from;
  return (
    <form
      aria-label="X range"
      className="flex items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (valid) onView([from, to]);
      }}
    >
      {(['from', 'to'] as const).map((k) => (
        <label key={k} className="flex w-24 flex-col gap-1.5 text-sm font-medium text-ink">
          {k === 'from' ? `From (${unit})` : `To (${unit})`}
          <Input
            type="number"
            min={0}
            step="any"
            controlSize="sm"
            className="font-mono"
            value={shown[k]}
            placeholder={String(Number((k === 'from' ? view[0] : view[1]).toPrecision(5)))}
            onChange={(e) => setDraft({ ...shown, [k]: e.target.value, seen: view })}
          />
        </label>
      ))}
      <Button size="sm" type="submit" disabled={!valid}>
        Show range
      </Button>
    </form>
  );
}

export function SpectrumToolbar(p: {
  measure: Measure;
  onMeasure: (m: Measure) => void;
  axis: Axis;
  onAxis: (a: Axis) => void;
  ordersPossible: boolean;
  scale: AmplitudeScale;
  onScale: (s: AmplitudeScale) => void;
  decibels: boolean;
  decibelsPossible: boolean;
  onDecibels: (on: boolean) => void;
  view: readonly [number, number] | null;
  onView: (v: [number, number]) => void;
  cursor: CursorSettings;
  onCursor: (c: CursorSettings) => void;
  onClearCursors: () => void;
  hasCursors: boolean;
}) {
  const unit = p.axis === 'hz' ? 'Hz' : 'order';
  const c = p.cursor;
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-4">
        <Segmented
          label="Measure"
          value={p.measure}
          onChange={p.onMeasure}
          options={choices(measureLabels)}
        />
        <Segmented
          label="X axis"
          value={p.axis}
          onChange={p.onAxis}
          options={choices(axisLabels, p.ordersPossible ? [] : ['order'])}
        />
        <Segmented
          label="Amplitude"
          value={p.scale}
          onChange={p.onScale}
          options={choices(scaleLabels)}
        />
        <Segmented
          label="Y scale"
          value={p.decibels ? 'db' : 'linear'}
          onChange={(v) => p.onDecibels(v === 'db')}
          options={choices(yScaleLabels, p.decibelsPossible ? [] : ['db'])}
        />
        {p.view && <RangeForm view={p.view} unit={unit} onView={p.onView} />}
      </div>
      <div className="flex flex-wrap items-end gap-4">
        <Segmented
          label="A click on the chart sets"
          value={c.mode}
          onChange={(mode) => p.onCursor({ ...c, mode })}
          options={choices(cursorModeLabels)}
        />
        <CountBox
          label="Harmonics"
          value={c.harmonics}
          max={40}
          width="w-20"
          onChange={(harmonics) => p.onCursor({ ...c, harmonics })}
        />
        <NumberBox
          label={`Sideband spacing (${unit})`}
          width="w-44"
          value={c.spacing}
          min={0}
          placeholder="1× speed"
          onChange={(v) => p.onCursor({ ...c, spacing: v !== null && v > 0 ? v : null })}
        />
        <CountBox
          label="Sidebands each side"
          value={c.sidebands}
          max={10}
          width="w-40"
          onChange={(sidebands) => p.onCursor({ ...c, sidebands })}
        />
        {p.hasCursors && (
          <Button size="sm" variant="ghost" onClick={p.onClearCursors}>
            Clear cursors
          </Button>
        )}
      </div>
    </div>
  );
}
