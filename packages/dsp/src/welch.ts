import { fftKernel } from './fft-kernel.ts';
import { getFftPlan, isPowerOfTwo } from './fft-plan.ts';
import { getWindow, type WindowName } from './window-functions.ts';

/** Options for {@link welch}. */
export interface WelchOptions {
  /**
   * Sample rate in Hz.
   * @default 1
   */
  sampleRateHz?: number;
  /**
   * Segment length in samples (any length; powers of two are fastest).
   * @default min(8192, input length)
   */
  nperseg?: number;
  /**
   * Samples shared by successive segments.
   * @default floor(nperseg / 2)
   */
  noverlap?: number;
  /**
   * Data window.
   * @default 'hann'
   */
  window?: WindowName;
  /**
   * `'density'`: power spectral density in unit²/Hz; `'spectrum'`: power spectrum in
   * unit² (a tone on a bin reads its mean square, RMS²).
   * @default 'density'
   */
  scaling?: 'density' | 'spectrum';
  /**
   * `'constant'` removes each segment's mean before windowing; `'none'` keeps it.
   * @default 'constant'
   */
  detrend?: 'constant' | 'none';
}

/** Result of {@link welch}. */
export interface WelchResult {
  /** One-sided power, bins 0 … ⌊nperseg/2⌋ at frequencies k · dfHz. */
  power: Float64Array;
  /** Bin spacing in Hz, sampleRateHz / nperseg. */
  dfHz: number;
  scaling: 'density' | 'spectrum';
  nperseg: number;
  noverlap: number;
  /** Number of averaged segments. */
  segments: number;
  window: WindowName;
  /** Equivalent noise bandwidth of the window in bins. */
  enbwBins: number;
}

const windowSpectra = new Map<string, { lines: Int32Array; re: Float64Array; im: Float64Array }>();

/** The lines (0 … ⌊n/2⌋) where the window's DFT is not negligible, with their values. */
function windowSpectrum(
  name: WindowName,
  n: number,
): { lines: Int32Array; re: Float64Array; im: Float64Array } {
  const key = `${name}:${n}`;
  let hit = windowSpectra.get(key);
  if (!hit) {
    const w = getWindow(name, n);
    const out = new Float64Array(2 * n);
    getFftPlan(n).realForward(out, Float64Array.from(w.values));
    const lines: number[] = [];
    for (let k = 0; k <= Math.floor(n / 2); k++) {
      if (Math.hypot(out[2 * k]!, out[2 * k + 1]!) > 1e-13 * w.sum) lines.push(k);
    }
    hit = {
      lines: Int32Array.from(lines),
      re: Float64Array.from(lines, (k) => out[2 * k]!),
      im: Float64Array.from(lines, (k) => out[2 * k + 1]!),
    };
    windowSpectra.set(key, hit);
  }
  return hit;
}

const scratch = new Map<number, { frame: Float64Array; out: Float64Array }>();

function scratchFor(n: number): { frame: Float64Array; out: Float64Array } {
  let s = scratch.get(n);
  if (!s) {
    s = { frame: new Float64Array(n), out: new Float64Array(2 * n) };
    scratch.set(n, s);
  }
  return s;
}

/**
 * Welch's averaged, modified periodogram: overlapping segments, each detrended and
 * windowed, power spectra averaged (mean), one-sided. Scaling and conventions are those
 * of `scipy.signal.welch` (periodic window, `average='mean'`, no padding), so results
 * agree with scipy to rounding.
 *
 * Source: Welch, "The use of fast Fourier transform for the estimation of power
 * spectra", IEEE Trans. Audio Electroacoust. 15(2):70–73, 1967; checked live against
 * scipy.signal.welch.
 */
export function welch(input: ArrayLike<number>, options: WelchOptions = {}): WelchResult {
  const n = input.length;
  if (n < 2) throw new RangeError(`welch needs at least 2 samples, got ${n}`);
  const fs = options.sampleRateHz ?? 1;
  if (!(fs > 0) || !Number.isFinite(fs)) {
    throw new RangeError(`sampleRateHz must be a positive number, got ${fs}`);
  }
  const nperseg = options.nperseg ?? Math.min(8192, n);
  if (!Number.isInteger(nperseg) || nperseg < 2 || nperseg > n) {
    throw new RangeError(
      `nperseg must be an integer in 2 … ${n} (the input length), got ${nperseg}`,
    );
  }
  const noverlap = options.noverlap ?? Math.floor(nperseg / 2);
  if (!Number.isInteger(noverlap) || noverlap < 0 || noverlap >= nperseg) {
    throw new RangeError(`noverlap must be an integer in 0 … ${nperseg - 1}, got ${noverlap}`);
  }
  const scaling = options.scaling ?? 'density';
  if (scaling !== 'density' && scaling !== 'spectrum') {
    throw new TypeError(`scaling must be 'density' or 'spectrum', got ${String(scaling)}`);
  }
  const detrend = options.detrend ?? 'constant';
  const windowName = options.window ?? 'hann';
  const window = getWindow(windowName, nperseg);
  const w = window.values;

  const bins = Math.floor(nperseg / 2) + 1;
  const power = new Float64Array(bins);
  const step = nperseg - noverlap;
  const segments = Math.floor((n - nperseg) / step) + 1;

  const data = input instanceof Float64Array ? input : Float64Array.from(input);
  const kernel = isPowerOfTwo(nperseg) && nperseg >= 8 ? fftKernel() : null;
  if (kernel) {
    const used = (segments - 1) * step + nperseg;
    kernel.welchSum(data.subarray(0, used), segments, step, w, detrend === 'constant', power);
  } else {
    sumPeriodograms(data, segments, step, windowName, w, detrend === 'constant', power);
  }

  const norm = scaling === 'density' ? fs * window.sumOfSquares : window.sum * window.sum;
  const scale = 1 / (norm * segments);
  const lastDoubled = nperseg % 2 === 0 ? bins - 2 : bins - 1;
  for (let k = 0; k < bins; k++) {
    const doubling = k >= 1 && k <= lastDoubled ? 2 : 1;
    power[k] = power[k]! * scale * doubling;
  }

  return {
    power,
    dfHz: fs / nperseg,
    scaling,
    nperseg,
    noverlap,
    segments,
    window: windowName,
    enbwBins: window.enbwBins,
  };
}

/**
 * Σ over segments of |DFT{(x − mean)·w}|² into `power`, on the FftPlan (fft.js or Bluestein):
 * the path for runtimes without the WebAssembly kernel and for segment lengths that are not
 * powers of two.
 */
function sumPeriodograms(
  data: Float64Array,
  segments: number,
  step: number,
  windowName: WindowName,
  w: Float64Array,
  detrend: boolean,
  power: Float64Array,
): void {
  const nperseg = w.length;
  const bins = power.length;
  const plan = getFftPlan(nperseg);
  const { frame, out } = scratchFor(nperseg);
  // The mean is removed after the FFT: DFT{(x − m)·w} = DFT{x·w} − m·DFT{w}, and the
  // window's DFT is nonzero on only a few lines (2 for Hann), so one pass over the
  // segment does both the sum and the windowing.
  const { lines: fixLines, re: fixRe, im: fixIm } = windowSpectrum(windowName, nperseg);
  for (let s = 0; s < segments; s++) {
    const start = s * step;
    let sum = 0;
    for (let i = 0; i < nperseg; i++) {
      const v = data[start + i]!;
      sum += v;
      frame[i] = v * w[i]!;
    }
    plan.realForward(out, frame);
    if (detrend) {
      const mean = sum / nperseg;
      for (let j = 0; j < fixLines.length; j++) {
        const k = fixLines[j]!;
        out[2 * k] = out[2 * k]! - mean * fixRe[j]!;
        out[2 * k + 1] = out[2 * k + 1]! - mean * fixIm[j]!;
      }
    }
    for (let k = 0; k < bins; k++) {
      const re = out[2 * k]!;
      const im = out[2 * k + 1]!;
      power[k] = power[k]! + re * re + im * im;
    }
  }
}
