import { getFftPlan } from './fft-plan.ts';
import { realInverseInto } from './real-fft.ts';
import { integrationGain, type VibrationUnit } from './units.ts';

/** Options for {@link integrateWaveform}. */
export interface IntegrateWaveformOptions {
  /** Sample rate in Hz. Required. */
  sampleRateHz: number;
  /** Unit of the input. @default 'g' */
  from?: VibrationUnit;
  /** Unit of the output (one or two integrations lower, or the same). @default 'um' */
  to?: VibrationUnit;
  /**
   * Low cutoff: components below lowCutoffHz/2 are removed, full gain from lowCutoffHz up,
   * a raised-cosine rise in between (a smooth edge keeps the filter's ringing short).
   * @default 10
   */
  lowCutoffHz?: number;
  /** Components above this are removed. @default Nyquist */
  highCutoffHz?: number;
  /**
   * Fraction of the record at each end tapered to zero (raised cosine) before the FFT, so
   * the record's wrap-around step does not leak into the integrated waveform.
   * @default 0.05
   */
  taperFraction?: number;
  /**
   * One-sided spectrum (interleaved, unnormalised rfft) of the input *after*
   * {@link taperEnds} with the same taperFraction, to reuse instead of computing it.
   * @default computed
   */
  spectrum?: Float64Array;
  /**
   * Length of the output, a power of two: when the band ends well below Nyquist, the
   * integrated waveform can be synthesised at the reduced rate fs · outputLength / n
   * (band-limited, so nothing is lost but the sample grid). Must hold the band:
   * outputLength ≥ 2 · (highCutoffHz / Δf) + 2.
   * @default n (same rate as the input)
   */
  outputLength?: number;
}

/**
 * Multiplies the first and last `fraction` of a waveform by a raised-cosine ramp, in
 * place (a Tukey window). Source: Harris 1978, Proc. IEEE 66(1) (Tukey window).
 */
export function taperEnds(data: Float64Array, fraction: number): Float64Array {
  if (!(fraction >= 0 && fraction < 0.5))
    throw new RangeError(`taper fraction must be in [0, 0.5), got ${fraction}`);
  const n = data.length;
  const m = Math.floor(fraction * n);
  let ramp = ramps.get(m);
  if (!ramp) {
    ramp = Float64Array.from({ length: m }, (_, i) => 0.5 - 0.5 * Math.cos((Math.PI * i) / m));
    ramps.set(m, ramp);
  }
  for (let i = 0; i < m; i++) {
    const w = ramp[i]!;
    data[i] = data[i]! * w;
    data[n - 1 - i] = data[n - 1 - i]! * w;
  }
  return data;
}

const ramps = new Map<number, Float64Array>();

/**
 * Frequency-domain integration of a waveform: taper the ends, FFT, divide line k by
 * (2πi·f_k)^p with the unit factors, apply the band (smooth low cutoff, sharp high
 * cutoff), inverse FFT. The tapered ends are not valid output: measure on the middle
 * (see {@link trimmedPeakToPeak}, which skips 10 % at each end by default).
 * For a sine of a whole or fractional number of cycles above the cutoff, the middle's
 * peak-to-peak is within about 0.2 % of a/(2πf)².
 *
 * Source: v = a/(iω), d = a/(iω)² per Fourier component (e.g. Brandt, "Noise and
 * Vibration Analysis", Wiley 2011, ch. 10); Tukey taper (Harris 1978); cutoff: common
 * practice, no source.
 */
export function integrateWaveform(
  input: ArrayLike<number>,
  options: IntegrateWaveformOptions,
): Float64Array {
  const n = input.length;
  if (n < 4) throw new RangeError(`integration needs at least 4 samples, got ${n}`);
  const fs = options.sampleRateHz;
  if (!(fs > 0)) throw new RangeError(`sampleRateHz must be positive, got ${fs}`);
  const from = options.from ?? 'g';
  const to = options.to ?? 'um';
  const lo = options.lowCutoffHz ?? 10;
  const hi = options.highCutoffHz ?? fs / 2;
  if (!(lo > 0) || !(hi > lo))
    throw new RangeError(`integration band must satisfy 0 < lo < hi, got [${lo}, ${hi}]`);
  let spectrum = options.spectrum;
  if (!spectrum) {
    const data = taperEnds(
      input instanceof Float64Array ? input.slice() : Float64Array.from(input),
      options.taperFraction ?? 0.05,
    );
    spectrum = new Float64Array(2 * n);
    getFftPlan(n).realForward(spectrum, data);
  }
  const df = fs / n;
  const m = options.outputLength ?? n;
  const bins = Math.min(Math.floor(n / 2), Math.floor(m / 2)) + 1;
  if (m !== n) {
    if (!Number.isInteger(Math.log2(m)) || m > n || m < 4) {
      throw new RangeError(`outputLength must be a power of two in 4 … ${n}, got ${m}`);
    }
    if (hi / df > m / 2 - 1) {
      throw new RangeError(
        `outputLength ${m} cannot hold the band up to ${hi} Hz (needs ≥ ${2 * Math.ceil(hi / df) + 2})`,
      );
    }
  }
  const rescale = m / n;
  const g1 = integrationGain(1, from, to);
  const p = Math.round(Math.log2(g1 / integrationGain(2, from, to)));
  const scaled = new Float64Array(2 * (Math.floor(m / 2) + 1));
  const start = lo / 2;
  for (let k = 1; k < bins; k++) {
    const f = k * df;
    if (f <= start || f > hi + 1e-9 * df) continue;
    const edge = f >= lo ? 1 : 0.5 - 0.5 * Math.cos((Math.PI * (f - start)) / (lo - start));
    const re = spectrum[2 * k]!;
    const im = spectrum[2 * k + 1]!;
    const gain = (rescale * edge * g1) / f ** p;
    // 1/i = −i (one integration), 1/i² = −1 (two).
    if (p === 0) {
      scaled[2 * k] = re * gain;
      scaled[2 * k + 1] = im * gain;
    } else if (p === 1) {
      scaled[2 * k] = im * gain;
      scaled[2 * k + 1] = -re * gain;
    } else {
      scaled[2 * k] = -re * gain;
      scaled[2 * k + 1] = -im * gain;
    }
  }
  const out = new Float64Array(m);
  realInverseInto(out, scaled, m);
  return out;
}

/**
 * max − min over the waveform without `edgeFraction` of it at each end.
 * Source: common practice, no source.
 */
export function trimmedPeakToPeak(input: ArrayLike<number>, edgeFraction = 0.1): number {
  if (!(edgeFraction >= 0 && edgeFraction < 0.5))
    throw new RangeError(`edgeFraction must be in [0, 0.5)`);
  const skip = Math.floor(input.length * edgeFraction);
  let min = Infinity;
  let max = -Infinity;
  for (let i = skip; i < input.length - skip; i++) {
    const v = input[i]!;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return max - min;
}
