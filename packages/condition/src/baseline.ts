import type { BaselineSource, BaselineStats } from './band-definition.ts';
import type { QualityVerdict } from './quality.ts';

/**
 * Running sums of a baseline being collected (Welford's online algorithm: count, mean and
 * the sum of squared deviations M2). Plain numbers, so it can be stored as JSON.
 *
 * Source: B. P. Welford, "Note on a method for calculating corrected sums of squares and
 * products", Technometrics 4(3):419–420, 1962.
 */
export interface BaselineAccumulator {
  readonly count: number;
  readonly mean: number;
  /** Sum of squared deviations from the running mean. */
  readonly m2: number;
}

/** An accumulator holding no values. */
export const EMPTY_BASELINE: BaselineAccumulator = { count: 0, mean: 0, m2: 0 };

/**
 * Adds one value to a baseline accumulator (Welford 1962). Pure: returns a new accumulator.
 */
export function addToBaseline(acc: BaselineAccumulator, value: number): BaselineAccumulator {
  if (!Number.isFinite(value)) throw new RangeError(`baseline value must be finite, got ${value}`);
  const count = acc.count + 1;
  const delta = value - acc.mean;
  const mean = acc.mean + delta / count;
  return { count, mean, m2: acc.m2 + delta * (value - mean) };
}

/**
 * Mean and **sample** standard deviation σ = √(M2 / (n − 1)) of an accumulator — the n − 1
 * (Bessel-corrected) form, because the baseline is a sample of the machine's normal
 * behaviour, not the whole population. Returns `null` for fewer than 2 values.
 *
 * Source: Bessel's correction, any statistics text (e.g. numpy.std with ddof=1).
 */
export function baselineStats(acc: BaselineAccumulator): BaselineStats | null {
  if (acc.count < 2) return null;
  return { count: acc.count, mean: acc.mean, sigma: Math.sqrt(acc.m2 / (acc.count - 1)) };
}

/** One value offered to a baseline. */
export interface BaselineSample {
  /** Epoch milliseconds (UTC). */
  readonly takenAt: number;
  readonly value: number;
  readonly quality: QualityVerdict;
}

/**
 * Whether a sample belongs to a baseline that currently holds `acc`: never when `unusable`
 * (nor when `suspect` and `includeSuspect` is false); for `first-n`, while fewer than `count`
 * values have been taken; for `period`, when `fromAt ≤ takenAt < toAt`.
 *
 * Source: Turnstone rule (issue 5), no external source.
 */
export function baselineTakes(
  source: BaselineSource,
  acc: BaselineAccumulator,
  sample: BaselineSample,
  includeSuspect = true,
): boolean {
  if (sample.quality === 'unusable') return false;
  if (sample.quality === 'suspect' && !includeSuspect) return false;
  if (source.from === 'first-n') return acc.count < source.count;
  return sample.takenAt >= source.fromAt && sample.takenAt < source.toAt;
}

/**
 * Whether a baseline is complete, so its statistical level applies: `first-n` once `count`
 * values are in; `period` once a sample at or after `toAt` has been seen (`latestAt`) and at
 * least 2 values are in.
 *
 * Source: Turnstone rule, no external source.
 */
export function baselineComplete(
  source: BaselineSource,
  acc: BaselineAccumulator,
  latestAt: number,
): boolean {
  if (source.from === 'first-n') return acc.count >= source.count;
  return latestAt >= source.toAt && acc.count >= 2;
}

/**
 * Baseline of a stored history: mean and sample σ (n − 1) over the values that
 * {@link baselineTakes} admits, in time order. `null` when fewer than 2 values qualify, or
 * when a `first-n` baseline has fewer values than it asks for.
 *
 * Source: Welford 1962 for the arithmetic; Bessel's correction for σ.
 */
export function computeBaseline(
  source: BaselineSource,
  samples: readonly BaselineSample[],
  options: { includeSuspect?: boolean } = {},
): BaselineStats | null {
  const ordered = [...samples].sort((a, b) => a.takenAt - b.takenAt);
  let acc = EMPTY_BASELINE;
  for (const sample of ordered) {
    if (baselineTakes(source, acc, sample, options.includeSuspect ?? true)) {
      acc = addToBaseline(acc, sample.value);
    }
  }
  if (source.from === 'first-n' && acc.count < source.count) return null;
  return baselineStats(acc);
}

/**
 * Statistical level mean + k·σ. Source: common practice (a "k-sigma" alarm), no source.
 */
export function statisticalLevel(stats: BaselineStats, k: number): number {
  return stats.mean + k * stats.sigma;
}
