import { getFftPlan, realInverseInto } from './fft-plan.ts';
import { integrationGain, type VibrationUnit } from './units.ts';

/** Options for {@link integrateWaveform}. */
export interface IntegrateWaveformOptions {
  /** Sample rate in Hz. Required. */
  sampleRateHz: number;
  /** Unit of the input. @default 'g' */
  from?: VibrationUnit;
  /** Unit of the output (one or two integrations lower, or the same). @default 'um' */
  to?: VibrationUnit;
  /** Components below this are removed (keeps the 1/f² gain from blowing up). @default 10 */
  lowCutoffHz?: number;
  /** Components above this are removed. @default Nyquist */
  highCutoffHz?: number;
  /**
   * The input's one-sided spectrum (interleaved, unnormalised rfft of the whole input), to
   * reuse instead of computing it.
   * @default computed
   */
  spectrum?: Float64Array;
}

/**
 * Frequency-domain integration of a waveform: FFT, divide line k by (2πi·f_k)^p with the
 * unit factors, zero the lines outside [lowCutoffHz, highCutoffHz], inverse FFT. The
 * record is treated as periodic, so the first and last few percent carry wrap-around
 * error when the record does not hold whole cycles; {@link trimmedPeakToPeak} skips them.
 *
 * Source: v = a/(iω), d = a/(iω)² per Fourier component (e.g. Brandt, "Noise and
 * Vibration Analysis", Wiley 2011, §10.6); low cutoff: common practice.
 */
export function integrateWaveform(input: ArrayLike<number>, options: IntegrateWaveformOptions): Float64Array {
  const n = input.length;
  if (n < 4) throw new RangeError(`integration needs at least 4 samples, got ${n}`);
  const fs = options.sampleRateHz;
  if (!(fs > 0)) throw new RangeError(`sampleRateHz must be positive, got ${fs}`);
  const from = options.from ?? 'g';
  const to = options.to ?? 'um';
  const lo = options.lowCutoffHz ?? 10;
  const hi = options.highCutoffHz ?? fs / 2;
  if (!(lo > 0) || !(hi > lo)) throw new RangeError(`integration band must satisfy 0 < lo < hi, got [${lo}, ${hi}]`);
  let spectrum = options.spectrum;
  if (!spectrum) {
    const data = input instanceof Float64Array ? input : Float64Array.from(input);
    spectrum = new Float64Array(2 * n);
    getFftPlan(n).realForward(spectrum, data);
  }
  const bins = Math.floor(n / 2) + 1;
  const df = fs / n;
  const g1 = integrationGain(1, from, to);
  const p = Math.round(Math.log2(g1 / integrationGain(2, from, to)));
  const scaled = new Float64Array(2 * bins);
  for (let k = 0; k < bins; k++) {
    const f = k * df;
    if (f < lo - 1e-9 * df || f > hi + 1e-9 * df) continue;
    const re = spectrum[2 * k]!;
    const im = spectrum[2 * k + 1]!;
    const gain = g1 / f ** p;
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
  const out = new Float64Array(n);
  realInverseInto(out, scaled, n);
  return out;
}

/**
 * max − min over the waveform without `edgeFraction` of it at each end.
 * Source: common practice, no source.
 */
export function trimmedPeakToPeak(input: ArrayLike<number>, edgeFraction = 0.05): number {
  if (!(edgeFraction >= 0 && edgeFraction < 0.5)) throw new RangeError(`edgeFraction must be in [0, 0.5)`);
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
