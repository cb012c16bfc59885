import { fftKernel } from './fft-kernel.ts';
import { getFftPlan, isPowerOfTwo } from './fft-plan.ts';
import { scratch } from './scratch.ts';

/** One-sided spectrum of a real signal, bins 0 … ⌊N/2⌋. */
export interface ComplexSpectrum {
  re: Float64Array;
  im: Float64Array;
}

/**
 * Discrete Fourier transform of a real sequence, returning bins 0 … ⌊N/2⌋ with the
 * same convention and scaling as `numpy.fft.rfft` / `scipy.fft.rfft` (no normalisation).
 *
 * Source: the DFT definition, X_k = Σ x_n e^(−2πikn/N) (Oppenheim & Schafer,
 * Discrete-Time Signal Processing); checked live against scipy.fft.rfft.
 */
export function rfft(input: ArrayLike<number>): ComplexSpectrum {
  const n = input.length;
  if (n < 1) throw new RangeError('rfft needs at least one sample');
  const plan = getFftPlan(n);
  const data = input instanceof Float64Array ? input : Float64Array.from(input);
  const out = scratch('rfft-out', 2 * n);
  plan.realForward(out, data);
  const bins = Math.floor(n / 2) + 1;
  const re = new Float64Array(bins);
  const im = new Float64Array(bins);
  let bad = 0;
  for (let k = 0; k < bins; k++) {
    const r = out[2 * k]!;
    const i = out[2 * k + 1]!;
    bad += r - r + (i - i); // NaN once any bin is NaN or ±Infinity
    re[k] = r;
    im[k] = i;
  }
  // A NaN or ±Infinity sample reaches every bin; only then look for where it is.
  if (bad !== 0) {
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(data[i]!))
        throw new RangeError(`rfft input has a non-finite value at ${i}`);
    }
    throw new RangeError('rfft input is too large: its transform overflows');
  }
  return { re, im };
}

const halfScratch = new Map<
  number,
  { z: Float64Array; out: Float64Array; twiddle: Float64Array }
>();

/**
 * Real inverse DFT into `out` (length n): the real sequence whose one-sided spectrum is
 * `spectrum` (interleaved, bins 0 … ⌊n/2⌋; Hermitian symmetry assumed, imaginary parts of
 * DC and Nyquist ignored), including the 1/n factor. Even n uses one complex transform of
 * n/2 points (even and odd samples packed as real and imaginary parts); odd n a full
 * complex transform.
 *
 * Source: the "two-for-one" real-FFT packing (Brigham, "The Fast Fourier Transform and
 * its Applications", 1988, ch. 9; Press et al., Numerical Recipes, §12.3).
 */
export function realInverseInto(out: Float64Array, spectrum: Float64Array, n: number): void {
  const kernel = n >= 8 && isPowerOfTwo(n) ? fftKernel() : null;
  if (kernel) {
    kernel.realPlan(n).realInverse(out, spectrum);
    return;
  }
  if (n % 2 !== 0 || n < 4) {
    const full = new Float64Array(2 * n);
    const bins = Math.floor(n / 2) + 1;
    for (let k = 0; k < bins; k++) {
      full[2 * k] = spectrum[2 * k]!;
      full[2 * k + 1] = k === 0 || 2 * k === n ? 0 : spectrum[2 * k + 1]!;
    }
    for (let k = bins; k < n; k++) {
      full[2 * k] = spectrum[2 * (n - k)]!;
      full[2 * k + 1] = -spectrum[2 * (n - k) + 1]!;
    }
    const res = new Float64Array(2 * n);
    getFftPlan(n).inverse(res, full);
    for (let i = 0; i < n; i++) out[i] = res[2 * i]!;
    return;
  }
  const h = n / 2;
  let s = halfScratch.get(n);
  if (!s) {
    const twiddle = new Float64Array(2 * h);
    for (let k = 0; k < h; k++) {
      twiddle[2 * k] = Math.cos((2 * Math.PI * k) / n);
      twiddle[2 * k + 1] = Math.sin((2 * Math.PI * k) / n);
    }
    s = { z: new Float64Array(2 * h), out: new Float64Array(2 * h), twiddle };
    if (halfScratch.size >= 8) halfScratch.clear(); // records of many lengths: keep a few
    halfScratch.set(n, s);
  }
  const { z, twiddle } = s;
  const c = 0.5 / h;
  for (let k = 0; k < h; k++) {
    const ar = spectrum[2 * k]!;
    const ai = k === 0 ? 0 : spectrum[2 * k + 1]!;
    const br = spectrum[2 * (h - k)]!;
    const bi = k === 0 ? 0 : -spectrum[2 * (h - k) + 1]!; // conj(X_{h−k}); X_h is real
    // E = (X_k + conj X_{h−k}) / 2 ; O = (X_k − conj X_{h−k}) / 2 · e^(+2πik/n)
    // 0.5 from E and O, 1/h from the inverse transform, folded into one factor
    const er = c * (ar + br);
    const ei = c * (ai + bi);
    const dr = c * (ar - br);
    const di = c * (ai - bi);
    const wr = twiddle[2 * k]!;
    const wi = twiddle[2 * k + 1]!;
    const or = dr * wr - di * wi;
    const oi = dr * wi + di * wr;
    // Z = E + i·O
    z[2 * k] = er - oi;
    z[2 * k + 1] = ei + or;
  }
  getFftPlan(h).inverseUnscaled(s.out, z);
  const res = s.out;
  for (let i = 0; i < h; i++) {
    out[2 * i] = res[2 * i]!;
    out[2 * i + 1] = res[2 * i + 1]!;
  }
}

/**
 * Inverse of {@link rfft}: the real sequence of length `n` whose one-sided spectrum is
 * given (Hermitian symmetry assumed; imaginary parts of DC and Nyquist ignored), as
 * `numpy.fft.irfft(X, n)`.
 *
 * Source: the inverse DFT definition (Oppenheim & Schafer).
 */
export function irfft(spectrum: ComplexSpectrum, n: number): Float64Array {
  if (!Number.isInteger(n) || n < 1)
    throw new RangeError(`irfft length must be a positive integer`);
  const bins = Math.floor(n / 2) + 1;
  if (spectrum.re.length < bins || spectrum.im.length < bins) {
    throw new RangeError(`irfft of length ${n} needs ${bins} bins`);
  }
  const packed = new Float64Array(2 * bins);
  for (let k = 0; k < bins; k++) {
    packed[2 * k] = spectrum.re[k]!;
    packed[2 * k + 1] = spectrum.im[k]!;
  }
  const x = new Float64Array(n);
  if (n === 1) {
    x[0] = packed[0]!;
    return x;
  }
  realInverseInto(x, packed, n);
  return x;
}
