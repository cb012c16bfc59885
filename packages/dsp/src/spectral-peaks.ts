import { getWindow, windowResponse, type WindowName } from './window-functions.ts';

/** A spectral peak, interpolated between bins. */
export interface SpectralPeak {
  /** Interpolated frequency (Hz, or orders on an order axis). */
  hz: number;
  /** Interpolated amplitude in the spectrum's RMS unit (the tone's RMS). */
  amplitude: number;
  /** Index of the highest line. */
  bin: number;
}

/** Options for {@link findPeaks}. */
export interface FindPeaksOptions {
  /** How many peaks, largest first. @default 10 */
  count?: number;
  /** Window the spectrum was computed with (for the interpolation). @default 'hann' */
  window?: WindowName;
  /** Segment length the spectrum was computed with. @default 2 · (lines − 1) */
  nperseg?: number;
  /** Lowest frequency searched. @default dfHz (skip DC) */
  minHz?: number;
  /** Highest frequency searched. @default the last line */
  maxHz?: number;
}

/**
 * The largest local maxima of a one-sided power spectrum (unit² per line, tone on a line
 * reads RMS²), each interpolated to sub-bin frequency and amplitude: the offset δ solves
 * |W(1−δ)| / |W(δ)| = (larger neighbour) / (peak line) exactly for the window's kernel,
 * and the amplitude is the peak line divided by |W(δ)|. For Hann this is the closed form
 * δ = (2r − 1)/(r + 1).
 *
 * Source: Harris 1978, Proc. IEEE 66(1) (window kernels, scalloping loss); ratio
 * interpolation as in Grandke, IEEE Trans. Instrum. Meas. 32(2):350–355, 1983.
 */
export function findPeaks(
  power: ArrayLike<number>,
  dfHz: number,
  options: FindPeaksOptions = {},
): SpectralPeak[] {
  if (!(dfHz > 0)) throw new RangeError(`dfHz must be positive, got ${dfHz}`);
  const count = options.count ?? 10;
  if (!Number.isInteger(count) || count < 0)
    throw new RangeError(`count must be a whole number, got ${count}`);
  const lines = power.length;
  if (lines < 3) return [];
  const nperseg = options.nperseg ?? 2 * (lines - 1);
  const window = getWindow(options.window ?? 'hann', nperseg);
  const first = Math.max(1, Math.ceil((options.minHz ?? dfHz) / dfHz - 1e-9));
  const last = Math.min(lines - 2, Math.floor((options.maxHz ?? (lines - 1) * dfHz) / dfHz + 1e-9));

  // Keep the `count` largest local maxima in a small sorted list.
  const top: number[] = [];
  for (let k = first; k <= last; k++) {
    const p = power[k]!;
    if (!(p > power[k - 1]! && p >= power[k + 1]!)) continue;
    if (top.length === count && p <= power[top[count - 1]!]!) continue;
    let i = top.length;
    if (top.length === count) top.pop();
    i = top.length;
    while (i > 0 && power[top[i - 1]!]! < p) i--;
    top.splice(i, 0, k);
  }

  const edge = windowResponse(window, 1);
  const peaks = top.map((k) => {
    const m = Math.sqrt(power[k]!);
    const left = Math.sqrt(power[k - 1]!);
    const right = Math.sqrt(power[k + 1]!);
    const towardsRight = right >= left;
    const ratio = Math.min(1, (towardsRight ? right : left) / m);
    let delta = 0;
    if (window.name === 'hann') {
      // Closed form for Hann's kernel: r = (1 + δ)/(2 − δ)  ⇒  δ = (2r − 1)/(r + 1).
      delta = Math.min(0.5, Math.max(0, (2 * ratio - 1) / (ratio + 1)));
    } else if (ratio > edge) {
      // ratio(δ) = W(1−δ)/W(δ) rises monotonically from W(1) at δ = 0 to 1 at δ = ½.
      let lo = 0;
      let hi = 0.5;
      for (let it = 0; it < 32; it++) {
        const mid = 0.5 * (lo + hi);
        const r = windowResponse(window, 1 - mid) / windowResponse(window, mid);
        if (r < ratio) lo = mid;
        else hi = mid;
      }
      delta = 0.5 * (lo + hi);
    }
    const signed = towardsRight ? delta : -delta;
    return { hz: (k + signed) * dfHz, amplitude: m / windowResponse(window, delta), bin: k };
  });
  return peaks.sort((a, b) => b.amplitude - a.amplitude);
}
