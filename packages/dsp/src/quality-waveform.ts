/**
 * The sample-level detectors behind the quality verdict: one pass for range, rails, stuck
 * runs and moments; isolated spikes; flat tops below the rails; drift over the capture.
 * All work in ADC counts (`toCounts` scales float32 volts to counts).
 */

/** A spike deviates from the mean by more than this many standard deviations… */
export const SPIKE_SIGMA_MULTIPLE = 10;
/** …while every other sample within ±{@link SPIKE_NEIGHBOUR_SPAN} deviates by less than this fraction of it. */
export const SPIKE_NEIGHBOUR_RATIO = 0.3;
/**
 * Samples each side that must stay quiet for an impulse to count as a spike. An impact
 * that rings a structural resonance below 0.45·fs (damping ratio ≤ 0.1) puts another
 * sample of at least a third of its largest one within 3 samples of it, so it is never an
 * isolated sample; a single-sample electrical spike is. (Damped-sine definition; the span
 * and ratio are engineering judgement, no source.)
 */
export const SPIKE_NEIGHBOUR_SPAN = 3;
/**
 * Flat tops away from the rails (a saturated sensor or amplifier): a run of at least
 * {@link FLAT_TOP_MIN_RUN} samples within this fraction of the peak-to-peak of the
 * extreme value…
 */
export const FLAT_TOP_TOLERANCE = 0.002;
/** …at least this many consecutive samples (rules out the few samples of a fast tone's crest)… */
export const FLAT_TOP_MIN_RUN = 3;
/**
 * …where the samples within one tolerance of the extreme outnumber those in the next four
 * tolerances by this factor. A smooth crest cannot: a sine's values follow the arcsine law,
 * whose ratio tends to √2/(√10 − √2) = 0.81 near the crest; a held level is a pile-up.
 */
export const FLAT_TOP_PILE_UP_RATIO = 3;
/** …on more than this fraction of the samples (0.5 %) on either side. Engineering judgement. */
export const FLAT_TOP_MIN_FRACTION = 0.005;
/**
 * Drift/settling: a straight line fitted over the whole capture with an RMS above this
 * fraction of the RMS left around it. A stationary signal cannot get there: the line
 * explains little of a sine with k cycles in the capture (the projection of a sine onto a
 * line, ≈ 6/(πk)² of its variance): the ratio stays below 0.44 for any sine with 1.5
 * cycles or more in the capture, while a sensor settling after power-up (an exponential
 * over the capture) is mostly line. Engineering judgement for the value.
 */
export const DRIFT_LINE_RATIO = 0.5;

/** Range, rail and stuck-run counts and the moments of a capture, in counts. */
export interface CountScan {
  min: number;
  max: number;
  mean: number;
  sigma: number;
  railCount: number;
  longestRailRun: number;
  longestStuck: number;
}

/**
 * One pass over the capture. The moments are shifted by the first sample so a large offset
 * does not cost precision in the variance. Throws on a non-finite sample.
 */
export function scanCounts(
  samples: ArrayLike<number>,
  toCounts: number,
  upperRail: number,
  lowerRail: number,
): CountScan {
  const n = samples.length;
  const shift = samples[0]! * toCounts;
  let sum = 0;
  let sumOfSquares = 0;
  let min = Infinity;
  let max = -Infinity;
  let railCount = 0;
  let run = 0;
  let longestRailRun = 0;
  let stuckRun = 1;
  let longestStuck = 1;
  let previous = NaN;
  for (let i = 0; i < n; i++) {
    const c = samples[i]! * toCounts;
    const d = c - shift;
    sum += d;
    sumOfSquares += d * d;
    if (c < min) min = c;
    if (c > max) max = c;
    const onRail = c >= upperRail || c <= lowerRail;
    if (onRail) {
      railCount++;
      run++;
      if (run > longestRailRun) longestRailRun = run;
    } else {
      run = 0;
    }
    if (c === previous && !onRail) {
      stuckRun++;
      if (stuckRun > longestStuck) longestStuck = stuckRun;
    } else {
      stuckRun = 1;
    }
    previous = c;
  }
  if (!Number.isFinite(sumOfSquares)) {
    for (let i = 0; i < n; i++) {
      if (!Number.isFinite(samples[i]!)) throw new RangeError(`sample ${i} is not a finite number`);
    }
    throw new RangeError('samples are too large for a quality verdict');
  }
  const mean = shift + sum / n;
  const sigma = Math.sqrt(Math.max(0, sumOfSquares / n - (sum / n) ** 2));
  return { min, max, mean, sigma, railCount, longestRailRun, longestStuck };
}

/**
 * Isolated samples far outside the rest (electrical spikes). A real impact rings a resonance
 * for several samples (see {@link SPIKE_NEIGHBOUR_SPAN}); a single-sample jump does not.
 */
export function countSpikes(
  samples: ArrayLike<number>,
  toCounts: number,
  mean: number,
  sigma: number,
  min: number,
  max: number,
): number {
  const n = samples.length;
  let spikeCount = 0;
  const threshold = SPIKE_SIGMA_MULTIPLE * sigma;
  if (sigma > 0 && Math.max(max - mean, mean - min) > threshold) {
    for (let i = 0; i < n; i++) {
      const d = Math.abs(samples[i]! * toCounts - mean);
      if (d <= threshold) continue;
      let isolated = true;
      const from = Math.max(0, i - SPIKE_NEIGHBOUR_SPAN);
      const to = Math.min(n - 1, i + SPIKE_NEIGHBOUR_SPAN);
      for (let j = from; j <= to && isolated; j++) {
        if (j !== i && Math.abs(samples[j]! * toCounts - mean) >= SPIKE_NEIGHBOUR_RATIO * d)
          isolated = false;
      }
      if (isolated) spikeCount++;
    }
  }
  return spikeCount;
}

/**
 * Flat tops at either extreme that is not on a rail (see {@link FLAT_TOP_TOLERANCE} and
 * the constants after it). Returns the fraction of samples on flat tops, summed over the
 * sides that qualify, and the held level as a fraction of full scale.
 */
export function flatTops(
  samples: ArrayLike<number>,
  toCounts: number,
  min: number,
  max: number,
  half: number,
): { fraction: number; levelFraction: number } {
  const n = samples.length;
  const tol = Math.max(2, FLAT_TOP_TOLERANCE * (max - min));
  const upperRail = half - 2;
  const lowerRail = -half + 1;
  let fraction = 0;
  let levelFraction = 0;
  for (const side of [1, -1] as const) {
    const extreme = side === 1 ? max : -min;
    if (side === 1 ? max >= upperRail : min <= lowerRail) continue; // the rails: 'clipped'
    let top = 0;
    let near = 0;
    let inRuns = 0;
    let run = 0;
    for (let i = 0; i <= n; i++) {
      const x = i < n ? side * samples[i]! * toCounts : -Infinity;
      if (x >= extreme - tol) {
        top++;
        run++;
        continue;
      }
      if (run >= FLAT_TOP_MIN_RUN) inRuns += run;
      run = 0;
      if (x >= extreme - (1 + 4) * tol) near++;
    }
    if (top >= FLAT_TOP_PILE_UP_RATIO * Math.max(near, 1) && inRuns / n > FLAT_TOP_MIN_FRACTION) {
      fraction += inRuns / n;
      levelFraction = Math.max(levelFraction, extreme / half);
    }
  }
  return { fraction, levelFraction };
}

/** RMS of the least-squares line through the capture ÷ RMS of the rest (0 when flat). */
export function driftRatio(
  samples: ArrayLike<number>,
  toCounts: number,
  mean: number,
  sigma: number,
): number {
  const n = samples.length;
  const centre = (n - 1) / 2;
  let sxy = 0;
  for (let i = 0; i < n; i++) sxy += (i - centre) * (samples[i]! * toCounts - mean);
  const sxx = (n * (n * n - 1)) / 12; // Σ (i − centre)²
  const lineVariance = (sxy * sxy) / sxx / n;
  const rest = sigma * sigma - lineVariance;
  if (!(lineVariance > 0)) return 0;
  // A capture that is all line gets a large finite ratio (findings travel as JSON).
  return Math.sqrt(lineVariance / Math.max(rest, lineVariance * 1e-12));
}
