import FFT from 'fft.js';
import { fftKernel } from './fft-kernel.ts';

/**
 * A cached FFT plan for one transform size. Buffers are interleaved complex
 * (`[re0, im0, re1, im1, …]`) of length `2 · size`, as in fft.js.
 *
 * Power-of-two sizes run in the package's WebAssembly kernel (radix-4 Stockham with SIMD,
 * wasm/fft-kernel.c), or in fft.js (radix-4, Cooley & Tukey 1965) where the runtime has no
 * WebAssembly SIMD; other sizes use Bluestein's chirp-z algorithm (Bluestein 1970, IEEE
 * Trans. Audio Electroacoust. 18(4)) on top of a power-of-two plan, so any length is exact
 * to rounding.
 */
export interface FftPlan {
  /** Transform length. */
  readonly size: number;
  /** Forward complex DFT, X_k = Σ x_n e^(−2πikn/N). `out` and `input` must differ. */
  forward(out: Float64Array, input: Float64Array): void;
  /** Inverse complex DFT including the 1/N factor. `out` and `input` must differ. */
  inverse(out: Float64Array, input: Float64Array): void;
  /** Inverse complex DFT without the 1/N factor (fold it into your own scaling). */
  inverseUnscaled(out: Float64Array, input: Float64Array): void;
  /**
   * Forward DFT of a real input of length `size`. Fills bins 0 … ⌊size/2⌋ of `out`
   * (interleaved, `out.length ≥ 2 · size`); the upper half is left unspecified.
   */
  realForward(out: Float64Array, input: Float64Array): void;
}

const plans = new Map<number, FftPlan>();
/**
 * Bluestein plans kept at most: recordings of many different lengths (uploads) would
 * otherwise each keep ~8·m doubles (m ≥ 2n) for the life of the process. Power-of-two plans
 * are few (one per size) and all kept.
 */
const MAX_ODD_PLANS = 8;
const oddSizes: number[] = [];

/** True when `n` is a power of two (1, 2, 4, …). */
export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n > 0 && (n & (n - 1)) === 0;
}

/** Smallest power of two ≥ `n`. */
export function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/**
 * Returns the FFT plan for `size`, creating it on first use and caching it per size
 * (twiddle tables and scratch buffers are built once).
 */
export function getFftPlan(size: number): FftPlan {
  if (!Number.isInteger(size) || size < 1) {
    throw new RangeError(`FFT size must be a positive integer, got ${size}`);
  }
  let plan = plans.get(size);
  if (!plan) {
    plan = size === 1 ? trivialPlan() : isPowerOfTwo(size) ? radixPlan(size) : bluesteinPlan(size);
    plans.set(size, plan);
    if (size > 1 && !isPowerOfTwo(size)) {
      oddSizes.push(size);
      if (oddSizes.length > MAX_ODD_PLANS) plans.delete(oddSizes.shift()!);
    }
  }
  return plan;
}

function trivialPlan(): FftPlan {
  const copy = (out: Float64Array, input: Float64Array): void => {
    out[0] = input[0] ?? 0;
    out[1] = input[1] ?? 0;
  };
  return {
    size: 1,
    forward: copy,
    inverse: copy,
    inverseUnscaled: copy,
    realForward(out, input) {
      out[0] = input[0] ?? 0;
      out[1] = 0;
    },
  };
}

function radixPlan(size: number): FftPlan {
  const kernel = fftKernel();
  if (kernel) {
    const complex = kernel.complexPlan(size);
    const real = size >= 8 ? kernel.realPlan(size) : null;
    const plan: FftPlan = {
      size,
      forward: (out, input) => complex.forward(out, input),
      inverse(out, input) {
        complex.inverseUnscaled(out, input);
        const scale = 1 / size;
        for (let i = 0; i < 2 * size; i++) out[i] = out[i]! * scale;
      },
      inverseUnscaled: (out, input) => complex.inverseUnscaled(out, input),
      realForward: real
        ? (out, input) => real.realForward(out, input)
        : (out, input) => {
            const z = new Float64Array(2 * size);
            for (let i = 0; i < size; i++) z[2 * i] = input[i]!;
            complex.forward(out, z);
          },
    };
    return plan;
  }
  return fftJsPlan(size);
}

/** The same plan on fft.js alone (runtimes without WebAssembly SIMD; tests compare both). */
export function fftJsPlan(size: number): FftPlan {
  const fft = new FFT(size);
  const plan: FftPlan = {
    size,
    forward: (out, input) => fft.transform(out, input),
    inverse: (out, input) => fft.inverseTransform(out, input),
    inverseUnscaled: unscaledInverse(fft),
    realForward: (out, input) => fft.realTransform(out, input),
  };
  if (size >= 8) plan.realForward = packedRealForward(size);
  return plan;
}

/** fft.js 4.0.x internals used to run its inverse pass without the trailing 1/N loop. */
interface FftInternals {
  _out: Float64Array | null;
  _data: Float64Array | null;
  _inv: number;
  _transform4(): void;
}

/**
 * fft.js's inverseTransform is its forward kernel with `_inv = 1` followed by a division
 * of every output by N; callers that scale anyway skip that pass (fft.js ^4.0.4 pinned).
 */
function unscaledInverse(fft: FFT): (out: Float64Array, input: Float64Array) => void {
  const internals = fft as unknown as FftInternals;
  if (typeof internals._transform4 !== 'function') {
    return (out, input) => {
      fft.inverseTransform(out, input);
      const size = fft.size;
      for (let i = 0; i < out.length; i++) out[i] = out[i]! * size;
    };
  }
  return (out, input) => {
    if (out === input) throw new Error('Input and output buffers must be different');
    internals._out = out;
    internals._data = input;
    internals._inv = 1;
    internals._transform4();
    internals._out = null;
    internals._data = null;
  };
}

/**
 * Real forward DFT of a power-of-two length n through one complex DFT of n/2 points: the
 * real input read as interleaved complex z[m] = x[2m] + i·x[2m+1] (no copy), then
 * X_k = E_k + e^(−2πik/n)·O_k with E_k = (Z_k + conj Z_{n/2−k})/2 and
 * O_k = (Z_k − conj Z_{n/2−k})/(2i). About a third faster than fft.js's realTransform.
 *
 * Source: Brigham, "The Fast Fourier Transform and its Applications", 1988, ch. 9;
 * Press et al., Numerical Recipes, §12.3.
 */
function packedRealForward(n: number): (out: Float64Array, input: Float64Array) => void {
  const h = n / 2;
  const half = new FFT(h);
  const z = new Float64Array(n);
  const twiddle = new Float64Array(h + 2);
  for (let k = 0; k <= h / 2; k++) {
    twiddle[2 * k] = Math.cos((2 * Math.PI * k) / n);
    twiddle[2 * k + 1] = -Math.sin((2 * Math.PI * k) / n);
  }
  return (out, input) => {
    half.transform(z, input.length === n ? input : input.subarray(0, n));
    // k = 0 and k = n/2 from Z_0
    const z0r = z[0]!;
    const z0i = z[1]!;
    out[0] = z0r + z0i;
    out[1] = 0;
    out[2 * h] = z0r - z0i;
    out[2 * h + 1] = 0;
    // pairs k and h − k share Z_k and Z_{h−k}
    for (let k = 1; k <= h / 2; k++) {
      const j = h - k;
      const ar = z[2 * k]!;
      const ai = z[2 * k + 1]!;
      const br = z[2 * j]!;
      const bi = z[2 * j + 1]!;
      const er = 0.5 * (ar + br);
      const ei = 0.5 * (ai - bi);
      const or = 0.5 * (ai + bi);
      const oi = -0.5 * (ar - br);
      const wr = twiddle[2 * k]!;
      const wi = twiddle[2 * k + 1]!;
      const tr = wr * or - wi * oi;
      const ti = wr * oi + wi * or;
      out[2 * k] = er + tr;
      out[2 * k + 1] = ei + ti;
      // X_{h−k} = conj(E_k) − conj(W^k·O_k)·(−1)… via W^(h−k) = −conj(W^k)
      out[2 * j] = er - tr;
      out[2 * j + 1] = -ei + ti;
    }
  };
}

/** out_k = x_k · y_k for k < count (interleaved complex values); `out` may be `x`. */
function multiplyInto(out: Float64Array, x: Float64Array, y: Float64Array, count: number): void {
  for (let k = 0; k < count; k++) {
    const xr = x[2 * k]!;
    const xi = x[2 * k + 1]!;
    const yr = y[2 * k]!;
    const yi = y[2 * k + 1]!;
    out[2 * k] = xr * yr - xi * yi;
    out[2 * k + 1] = xr * yi + xi * yr;
  }
}

function bluesteinPlan(n: number): FftPlan {
  const m = nextPowerOfTwo(2 * n - 1);
  const inner = radixPlan(m);
  // chirp w_k = exp(−iπk²/n); k² is reduced mod 2n so the angle stays exact for large k.
  const chirp = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    const angle = (Math.PI * ((k * k) % (2 * n))) / n;
    chirp[2 * k] = Math.cos(angle);
    chirp[2 * k + 1] = -Math.sin(angle);
  }
  const b = new Float64Array(2 * m);
  for (let k = 0; k < n; k++) {
    const re = chirp[2 * k]!;
    const im = -chirp[2 * k + 1]!;
    b[2 * k] = re;
    b[2 * k + 1] = im;
    if (k > 0) {
      b[2 * (m - k)] = re;
      b[2 * (m - k) + 1] = im;
    }
  }
  const bHat = new Float64Array(2 * m);
  inner.forward(bHat, b);
  const a = new Float64Array(2 * m);
  const aHat = new Float64Array(2 * m);

  const forward = (out: Float64Array, input: Float64Array): void => {
    a.fill(0);
    multiplyInto(a, input, chirp, n);
    inner.forward(aHat, a);
    multiplyInto(aHat, aHat, bHat, m);
    inner.inverse(a, aHat);
    multiplyInto(out, a, chirp, n);
  };
  const conj = new Float64Array(2 * n);
  const complexInput = new Float64Array(2 * n);
  return {
    size: n,
    forward,
    inverse(out, input) {
      for (let k = 0; k < n; k++) {
        conj[2 * k] = input[2 * k]!;
        conj[2 * k + 1] = -input[2 * k + 1]!;
      }
      forward(out, conj);
      for (let k = 0; k < n; k++) {
        out[2 * k] = out[2 * k]! / n;
        out[2 * k + 1] = -out[2 * k + 1]! / n;
      }
    },
    inverseUnscaled(out, input) {
      for (let k = 0; k < n; k++) {
        conj[2 * k] = input[2 * k]!;
        conj[2 * k + 1] = -input[2 * k + 1]!;
      }
      forward(out, conj);
      for (let k = 0; k < n; k++) out[2 * k + 1] = -out[2 * k + 1]!;
    },
    realForward(out, input) {
      for (let k = 0; k < n; k++) {
        complexInput[2 * k] = input[k]!;
        complexInput[2 * k + 1] = 0;
      }
      forward(out, complexInput);
    },
  };
}
