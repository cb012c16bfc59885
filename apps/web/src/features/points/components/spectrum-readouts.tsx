/**
 * What the spectrum's cursors read and its real peaks, as tables: each harmonic's or
 * sideband's frequency, order and amplitude, the difference between cursors A and B, and
 * the peaks above the stated noise floor with the fault frequency each matches.
 */
import { formatValue } from '../../../components/charts/chart-theme.ts';
import {
  NOISE_FLOOR_MARGIN_DB,
  type CursorLine,
  type SpectrumPeak,
} from '../../../components/charts/spectrum-math.ts';
import type { Axis } from '../lib/spectrum-view.ts';

/** Hz and order of a position on the axis shown (order needs the running speed). */
export function hzAndOrder(x: number, axis: Axis, shaftHz: number | null) {
  return axis === 'hz'
    ? { hz: x, order: shaftHz ? x / shaftHz : null }
    : { hz: shaftHz ? x * shaftHz : null, order: x };
}

const cell = 'py-1 pr-4 text-right';
const head = 'py-1 pr-4 text-right font-medium';
const fmtHz = (v: number | null) => (v === null ? '—' : v.toFixed(2));
const fmtOrder = (v: number | null) => (v === null ? '—' : v.toFixed(3));

function LinesTable({
  caption,
  lines,
  axis,
  shaftHz,
  unit,
  name,
}: {
  caption: string;
  lines: readonly CursorLine[];
  axis: Axis;
  shaftHz: number | null;
  unit: string;
  name: (n: number) => string;
}) {
  if (lines.length === 0) return null;
  return (
    <table className="text-left text-sm">
      <caption className="mb-1 text-left text-sm font-semibold text-ink">{caption}</caption>
      <thead className="text-xs text-ink-muted">
        <tr className="border-b border-line">
          <th className="py-1 pr-4 font-medium">Line</th>
          <th className={head}>Frequency (Hz)</th>
          <th className={head}>Order</th>
          <th className={head}>Amplitude ({unit})</th>
        </tr>
      </thead>
      <tbody className="font-mono text-[13px]">
        {lines.map((l) => {
          const p = hzAndOrder(l.x, axis, shaftHz);
          return (
            <tr key={l.n} className="border-b border-line/60">
              <td className="py-1 pr-4">{name(l.n)}</td>
              <td className={cell}>{fmtHz(p.hz)}</td>
              <td className={cell}>{fmtOrder(p.order)}</td>
              <td className={cell}>{l.amplitude === null ? '—' : formatValue(l.amplitude, 4)}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

export function CursorReadouts({
  harmonic,
  sideband,
  points,
  axis,
  shaftHz,
  unit,
}: {
  harmonic: readonly CursorLine[];
  sideband: readonly CursorLine[];
  points: readonly { name: 'A' | 'B'; x: number; amplitude: number | null }[];
  axis: Axis;
  shaftHz: number | null;
  unit: string;
}) {
  const lineTables = [
    { caption: 'Harmonic cursor', lines: harmonic, name: (n: number) => `${n}×` },
    {
      caption: 'Sideband cursor',
      lines: sideband,
      name: (n: number) => (n === 0 ? 'carrier' : n > 0 ? `+${n}` : `−${-n}`),
    },
  ];
  const a = points.find((p) => p.name === 'A');
  const b = points.find((p) => p.name === 'B');
  return (
    <div className="flex flex-wrap items-start gap-6 overflow-x-auto">
      {lineTables.map((t) => (
        <LinesTable key={t.caption} {...t} axis={axis} shaftHz={shaftHz} unit={unit} />
      ))}
      {a && (
        <dl
          aria-label="Cursors A and B"
          className="grid grid-cols-[auto_auto] gap-x-4 gap-y-1 text-sm"
        >
          {[a, b].map((p) => {
            if (!p) return null;
            const f = hzAndOrder(p.x, axis, shaftHz);
            return (
              <div key={p.name} className="contents">
                <dt className="text-ink-muted">Cursor {p.name}</dt>
                <dd className="font-mono">
                  {fmtHz(f.hz)} Hz · {fmtOrder(f.order)} order ·{' '}
                  {p.amplitude === null ? '—' : formatValue(p.amplitude, 4)} {unit}
                </dd>
              </div>
            );
          })}
          {b && (
            <>
              <dt className="text-ink-muted">B − A</dt>
              <dd className="font-mono" data-testid="cursor-delta">
                {deltaText(a, b, axis, shaftHz, unit)}
              </dd>
            </>
          )}
        </dl>
      )}
    </div>
  );
}

function deltaText(
  a: { x: number; amplitude: number | null },
  b: { x: number; amplitude: number | null },
  axis: Axis,
  shaftHz: number | null,
  unit: string,
) {
  const fa = hzAndOrder(a.x, axis, shaftHz);
  const fb = hzAndOrder(b.x, axis, shaftHz);
  const dHz = fa.hz !== null && fb.hz !== null ? `${(fb.hz - fa.hz).toFixed(2)} Hz` : '— Hz';
  const dOrder =
    fa.order !== null && fb.order !== null ? `${(fb.order - fa.order).toFixed(3)} order` : '';
  const amp =
    a.amplitude !== null && b.amplitude !== null && a.amplitude > 0 && b.amplitude > 0
      ? `${formatValue(b.amplitude - a.amplitude, 4)} ${unit} (${(20 * Math.log10(b.amplitude / a.amplitude)).toFixed(1)} dB)`
      : '';
  return [dHz, dOrder, amp].filter(Boolean).join(' · ');
}

export function PeakTable({
  peaks,
  floor,
  unit,
  axis,
  shaftHz,
}: {
  peaks: readonly SpectrumPeak[];
  floor: number;
  unit: string;
  axis: Axis;
  shaftHz: number | null;
}) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full max-w-2xl text-left text-sm">
        <caption className="mb-1 text-left text-sm font-semibold text-ink">
          Largest peaks in view
          <span className="block text-xs font-normal text-ink-muted">
            Local maxima at or above the noise floor — the median line of the range shown +{' '}
            {NOISE_FLOOR_MARGIN_DB} dB, here {formatValue(floor, 3)} {unit}. A fault frequency is
            named when it lies within one line spacing of the peak.
          </span>
        </caption>
        <thead className="text-xs text-ink-muted">
          <tr className="border-b border-line">
            <th className="py-1 pr-4 font-medium">#</th>
            <th className={head}>Frequency (Hz)</th>
            <th className={head}>Order</th>
            <th className={head}>Amplitude ({unit})</th>
            <th className="py-1 font-medium">Matches</th>
          </tr>
        </thead>
        <tbody className="font-mono text-[13px]">
          {peaks.length === 0 && (
            <tr>
              <td colSpan={5} className="py-2 font-sans text-ink-muted">
                No line rises above the noise floor in this range.
              </td>
            </tr>
          )}
          {peaks.map((p, i) => {
            const f = hzAndOrder(p.x, axis, shaftHz);
            return (
              <tr key={p.x} className="border-b border-line/60">
                <td className="py-1 pr-4 text-ink-muted">{i + 1}</td>
                <td className={cell}>{fmtHz(f.hz)}</td>
                <td className={cell}>{fmtOrder(f.order)}</td>
                <td className={cell}>{formatValue(p.value, 4)}</td>
                <td className="py-1 font-sans">{p.match?.name ?? ''}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
