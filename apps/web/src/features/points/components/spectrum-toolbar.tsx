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

export type CursorMode = 'harmonic' | 'sideband' | 'points';

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
          options={(['acceleration', 'velocity', 'envelope'] as const).map((m) => ({
            value: m,
            label: measureLabels[m],
          }))}
        />
        <Segmented
          label="X axis"
          value={p.axis}
          onChange={p.onAxis}
          options={[
            { value: 'hz', label: 'Hz' },
            { value: 'order', label: 'Orders', disabled: !p.ordersPossible },
          ]}
        />
        <Segmented
          label="Amplitude"
          value={p.scale}
          onChange={p.onScale}
          options={[
            { value: 'rms', label: 'RMS' },
            { value: 'peak', label: 'Peak' },
            { value: 'peak-to-peak', label: 'Pk-pk' },
          ]}
        />
        <Segmented
          label="Y scale"
          value={p.decibels ? 'db' : 'linear'}
          onChange={(v) => p.onDecibels(v === 'db')}
          options={[
            { value: 'linear', label: 'Linear' },
            { value: 'db', label: 'dB', disabled: !p.decibelsPossible },
          ]}
        />
        {p.view && <RangeForm view={p.view} unit={unit} onView={p.onView} />}
      </div>
      <div className="flex flex-wrap items-end gap-4">
        <Segmented
          label="A click on the chart sets"
          value={c.mode}
          onChange={(mode) => p.onCursor({ ...c, mode })}
          options={[
            { value: 'harmonic', label: 'Harmonic cursor' },
            { value: 'sideband', label: 'Sideband carrier' },
            { value: 'points', label: 'Cursors A/B' },
          ]}
        />
        <NumberBox
          label="Harmonics"
          value={c.harmonics}
          min={1}
          max={40}
          width="w-20"
          onChange={(v) => p.onCursor({ ...c, harmonics: Math.max(1, Math.min(40, v ?? 1)) })}
        />
        <NumberBox
          label={`Sideband spacing (${unit})`}
          width="w-44"
          value={c.spacing}
          min={0}
          placeholder="1× speed"
          onChange={(v) => p.onCursor({ ...c, spacing: v !== null && v > 0 ? v : null })}
        />
        <NumberBox
          label="Sidebands each side"
          value={c.sidebands}
          min={1}
          max={10}
          width="w-40"
          onChange={(v) => p.onCursor({ ...c, sidebands: Math.max(1, Math.min(10, v ?? 1)) })}
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
