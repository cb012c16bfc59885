/** Time-domain statistics of a waveform. */
export interface WaveformStatistics {
  /** Arithmetic mean (the DC part). */
  mean: number;
  /** RMS about the mean (standard deviation, population form). */
  rms: number;
  /** Largest |x − mean|. */
  peak: number;
  /** max − min. */
  peakToPeak: number;
  min: number;
  max: number;
  /** peak / rms (a sine reads √2 ≈ 1.414). 0 for a constant signal. */
  crestFactor: number;
  /**
   * Kurtosis m₄/m₂² about the mean (Pearson's, not excess): a sine reads 1.5, Gaussian
   * noise 3. 0 for a constant signal.
   */
  kurtosis: number;
}

/** Options for {@link waveformStatistics}. */
export interface WaveformStatisticsOptions {
  /**
   * Subtract the mean from `input` in place during the second pass (input must then be a
   * Float64Array): saves the caller a pass over a long record.
   * @default false
   */
  centerInPlace?: boolean;
}

/**
 * Mean, RMS, peak, peak-to-peak, crest factor and kurtosis of a waveform in two passes.
 *
 * Source: moment definitions (Pearson kurtosis β₂ = m₄/m₂²); crest factor = peak/RMS as
 * used for impulsive bearing signals (Randall & Antoni 2011, MSSP 25:485–520).
 */
export function waveformStatistics(
  input: ArrayLike<number>,
  options: WaveformStatisticsOptions = {},
): WaveformStatistics {
  const n = input.length;
  if (n < 1) throw new RangeError('waveform statistics need at least one sample');
  let sum = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = input[i]!;
    sum += v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (!Number.isFinite(sum)) {
    // NaN or ±Infinity anywhere poisons the sum; find it only then (keeps the loop tight).
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(input[i]!))
        throw new RangeError(`sample ${i} is not a finite number (${input[i]})`);
    }
    throw new RangeError('samples are too large to sum');
  }
  const mean = sum / n;
  let m2 = 0;
  let m4 = 0;
  if (options.centerInPlace) {
    if (!(input instanceof Float64Array))
      throw new TypeError('centerInPlace needs a Float64Array input');
    for (let i = 0; i < n; i++) {
      const d = input[i]! - mean;
      input[i] = d;
      const d2 = d * d;
      m2 += d2;
      m4 += d2 * d2;
    }
  } else {
    for (let i = 0; i < n; i++) {
      const d = input[i]! - mean;
      const d2 = d * d;
      m2 += d2;
      m4 += d2 * d2;
    }
  }
  m2 /= n;
  m4 /= n;
  const rms = Math.sqrt(m2);
  const peak = Math.max(max - mean, mean - min);
  return {
    mean,
    rms,
    peak,
    peakToPeak: max - min,
    min,
    max,
    crestFactor: rms > 0 ? peak / rms : 0,
    kurtosis: m2 > 0 ? m4 / (m2 * m2) : 0,
  };
}
