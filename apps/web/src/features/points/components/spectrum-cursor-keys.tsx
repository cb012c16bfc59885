/**
 * The spectrum's cursors from the keyboard: a slider (WAI-ARIA slider pattern) whose value is
 * a position on the axis shown. Arrow keys move it from peak to peak in view (with Shift one
 * line), Home and End to the first and last peak; Enter (or Space) sets the cursor the mode
 * names — the harmonic cursor's fundamental, the sideband carrier, or cursor A then B — just as
 * a click on the chart does. While it has the focus its position is drawn on the chart and
 * read out as frequency, order and amplitude, to screen readers too.
 */
import { useId, useMemo, useState, type KeyboardEvent } from 'react';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import { harmonicLines, realPeaks } from '../../../components/charts/spectrum-math.ts';
import { cursorMoveOf, moveCursor } from '../lib/cursor-keys.ts';
import type { Axis } from '../lib/spectrum-view.ts';
import { hzAndOrder } from './spectrum-readouts.tsx';

export function SpectrumCursorKeys({
  values,
  step,
  view,
  lowCut,
  axis,
  shaftHz,
  unit,
  target,
  start,
  probe,
  onProbe,
  onSet,
}: {
  values: ArrayLike<number>;
  step: number;
  view: readonly [number, number];
  lowCut: number;
  axis: Axis;
  shaftHz: number | null;
  /** Amplitude unit as shown, e.g. "in/s RMS". */
  unit: string;
  /** What Enter sets, e.g. "harmonic cursor", "cursor B". */
  target: string;
  /** Where the cursor starts when it takes the focus (the target's own position, if set). */
  start: number | null;
  probe: number | null;
  onProbe: (x: number | null) => void;
  onSet: (x: number) => void;
}) {
  const id = useId();
  const [said, setSaid] = useState('');
  const peaks = useMemo(
    () =>
      realPeaks(values, step, view[0], view[1], { lowCut, count: Number.POSITIVE_INFINITY }).peaks,
    [values, step, view, lowCut],
  );
  const xName = axis === 'hz' ? 'Hz' : 'order';
  const read = (x: number) => {
    const p = hzAndOrder(x, axis, shaftHz);
    const amplitude = harmonicLines(values, step, x, 1)[0]?.amplitude ?? null;
    return [
      p.hz === null ? '— Hz' : `${p.hz.toFixed(2)} Hz`,
      p.order === null ? 'order —' : `${p.order.toFixed(3)}×`,
      amplitude === null ? '—' : `${formatValue(amplitude, 4)} ${unit}`,
    ].join(' · ');
  };
  const track = { peaks: peaks.map((p) => p.x), step, from: view[0], to: view[1] };
  const onKeyDown = (e: KeyboardEvent<HTMLDivElement>) => {
    if (e.key === 'Enter' || e.key === ' ') {
      e.preventDefault();
      if (probe === null) return;
      onSet(probe);
      setSaid(`${target[0]!.toUpperCase()}${target.slice(1)} set at ${read(probe)}.`);
      return;
    }
    if (e.key === 'Escape') {
      onProbe(null);
      return;
    }
    const move = cursorMoveOf(e.key, e.shiftKey);
    if (!move) return;
    e.preventDefault();
    onProbe(moveCursor(probe, move, track));
  };
  const inView = (x: number | null) => x !== null && x >= view[0] && x <= view[1];
  return (
    <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
      <span id={`${id}-label`} className="font-medium text-ink">
        Keyboard cursor
      </span>
      <div
        role="slider"
        tabIndex={0}
        aria-labelledby={`${id}-label`}
        aria-describedby={`${id}-help`}
        aria-orientation="horizontal"
        aria-valuemin={view[0]}
        aria-valuemax={view[1]}
        aria-valuenow={probe ?? view[0]}
        aria-valuetext={probe === null ? 'not placed' : read(probe)}
        data-testid="cursor-keys"
        className="min-w-[18rem] rounded-md border border-line-strong bg-surface px-2 py-1 font-mono text-[13px] text-ink"
        onFocus={() => {
          if (probe === null) onProbe(inView(start) ? start : (peaks[0]?.x ?? null));
        }}
        onBlur={() => onProbe(null)}
        onKeyDown={onKeyDown}
      >
        {probe === null ? `— ${xName}` : read(probe)}
      </div>
      <span id={`${id}-help`} className="text-xs text-ink-muted">
        ← → next peak in view, Shift one line, Home/End first/last peak; Enter sets the {target}.
      </span>
      <span role="status" className="text-xs text-ink" data-testid="cursor-keys-status">
        {said}
      </span>
    </div>
  );
}
