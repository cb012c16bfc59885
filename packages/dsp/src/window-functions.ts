/** Names of the supported data windows. */
export type WindowName = 'rect' | 'hann' | 'hamming' | 'flattop';

/** The window names accepted by {@link getWindow}. */
export const WINDOW_NAMES: readonly WindowName[] = ['rect', 'hann', 'hamming', 'flattop'];

/**
 * Cosine-sum coefficients a_k of w[n] = Σ (−1)^k a_k cos(2πkn/N).
 * Hann and Hamming: Harris 1978, Proc. IEEE 66(1):51–83. Flat-top: the five-term
 * coefficients of scipy.signal.windows.flattop (D'Antona & Ferrero 2006, "Digital
 * Signal Processing for Measurement Systems", p. 91).
 */
const COSINE_SUM: Record<WindowName, readonly number[]> = {
  rect: [1],
  hann: [0.5, 0.5],
  hamming: [0.54, 0.46],
  flattop: [0.21557895, 0.41663158, 0.277263158, 0.083578947, 0.006947368],
};

/** A window with the figures that scale spectra read through it. */
export interface DataWindow {
  name: WindowName;
  /** The window samples (periodic form). Shared and cached: do not modify. */
  values: Float64Array;
  /** Σ w[n]. */
  sum: number;
  /** Σ w[n]². */
  sumOfSquares: number;
  /** Coherent gain Σw/N: the amplitude a bin-centred tone reads through the window. */
  coherentGain: number;
  /** Equivalent noise bandwidth in bins, N·Σw²/(Σw)². */
  enbwBins: number;
}

const cache = new Map<string, DataWindow>();

/** Options for {@link getWindow}. */
export interface WindowOptions {
  /**
   * Periodic ("DFT-even", as for spectral analysis and scipy's `fftbins=True`) or
   * symmetric form.
   * @default true
   */
  periodic?: boolean;
}

/**
 * Returns a cosine-sum data window of length `n` with its coherent gain and equivalent
 * noise bandwidth (ENBW), cached per name, length and form.
 *
 * Source: Harris, "On the use of windows for harmonic analysis with the discrete Fourier
 * transform", Proc. IEEE 66(1):51–83, 1978 (definitions of coherent gain and ENBW;
 * Hann 0.50/1.50 bins, Hamming 0.54/1.36 bins); flat-top coefficients as in scipy.
 */
export function getWindow(name: WindowName, n: number, options: WindowOptions = {}): DataWindow {
  const coefficients = COSINE_SUM[name];
  if (!coefficients) {
    throw new TypeError(`unknown window "${String(name)}"; use one of ${WINDOW_NAMES.join(', ')}`);
  }
  if (!Number.isInteger(n) || n < 1) {
    throw new RangeError(`window length must be a positive integer, got ${n}`);
  }
  const periodic = options.periodic ?? true;
  const key = `${name}:${n}:${periodic ? 'p' : 's'}`;
  const hit = cache.get(key);
  if (hit) return hit;

  const values = new Float64Array(n);
  const denominator = periodic ? n : n - 1;
  let sum = 0;
  let sumOfSquares = 0;
  for (let i = 0; i < n; i++) {
    let w = 0;
    if (denominator === 0) {
      w = 1;
    } else {
      for (let k = 0; k < coefficients.length; k++) {
        const sign = k % 2 === 0 ? 1 : -1;
        w += sign * coefficients[k]! * Math.cos((2 * Math.PI * k * i) / denominator);
      }
    }
    values[i] = w;
    sum += w;
    sumOfSquares += w * w;
  }
  const window: DataWindow = {
    name,
    values,
    sum,
    sumOfSquares,
    coherentGain: sum / n,
    enbwBins: (n * sumOfSquares) / (sum * sum),
  };
  cache.set(key, window);
  return window;
}

/** Cosine-sum coefficients a_k of a window, w[n] = Σ (−1)^k a_k cos(2πkn/N). */
export function windowCoefficients(name: WindowName): readonly number[] {
  const c = COSINE_SUM[name];
  if (!c) throw new TypeError(`unknown window "${String(name)}"`);
  return c;
}

/**
 * Magnitude of a periodic cosine-sum window's spectrum at a fractional bin offset
 * `delta`, normalised to 1 at delta = 0: |Σ w[n] e^(−2πi·n·delta/N)| / Σ w[n], evaluated
 * in closed form from the Dirichlet kernel (exact, O(terms)). Used to correct the
 * amplitude of a tone read between bins (scalloping loss).
 *
 * Source: Harris 1978, Proc. IEEE 66(1), sections IV and V (scalloping loss, cosine-sum
 * windows as sums of shifted Dirichlet kernels).
 */
export function windowResponse(window: DataWindow, delta: number): number {
  const n = window.values.length;
  const a = COSINE_SUM[window.name];
  let re = 0;
  let im = 0;
  const addKernel = (scale: number, x: number): void => {
    // Σ_{m<N} e^(2πi·m·x/N) = e^(iπx(N−1)/N) · sin(πx) / sin(πx/N)
    const s = Math.sin((Math.PI * x) / n);
    const magnitude = Math.abs(s) < 1e-15 ? n : Math.sin(Math.PI * x) / s;
    const phase = (Math.PI * x * (n - 1)) / n;
    re += scale * magnitude * Math.cos(phase);
    im += scale * magnitude * Math.sin(phase);
  };
  addKernel(a[0]!, -delta);
  for (let k = 1; k < a.length; k++) {
    const c = ((k % 2 === 0 ? 1 : -1) * a[k]!) / 2;
    addKernel(c, k - delta);
    addKernel(c, -k - delta);
  }
  return Math.sqrt(re * re + im * im) / (a[0]! * n);
}

/** Returns `value` as a window name, or throws a `TypeError` naming the accepted ones. */
export function parseWindowName(value: string): WindowName {
  if ((WINDOW_NAMES as readonly string[]).includes(value)) return value as WindowName;
  throw new TypeError(`unknown window "${value}"; use one of ${WINDOW_NAMES.join(', ')}`);
}
