import { MIN_BASELINE, type BaselineSource, type BaselineStats } from './band-definition.ts';
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
  /**
   * The same sums over ln(value) of the values above 0 (a level is set in the log domain).
   * Absent in accumulators stored before they were kept.
   */
  readonly logCount?: number;
  readonly logMean?: number;
  readonly logM2?: number;
  /** takenAt (epoch ms) of the first and latest value taken; absent before they were kept. */
  readonly firstAt?: number;
  readonly lastAt?: number;
}

/** An accumulator holding no values. */
export const EMPTY_BASELINE: BaselineAccumulator = {
  count: 0,
  mean: 0,
  m2: 0,
  logCount: 0,
  logMean: 0,
  logM2: 0,
};

const DAY_MS = 86_400_000;

/**
 * Smallest σ of ln(value) a statistical level is set with: 0.1, about 10 % scatter. A
 * baseline of near-equal values (σ ≈ 0) would otherwise put the level at the mean, and the
 * next ordinary value would alarm; repeat overall readings of a running machine seldom agree
 * better than that. Common practice, no source.
 */
export const LOG_SIGMA_FLOOR = 0.1;

/**
 * Adds one value to a baseline accumulator (Welford 1962), in value and, for values above 0,
 * in ln(value). Pure: returns a new accumulator.
 */
export function addToBaseline(
  acc: BaselineAccumulator,
  value: number,
  takenAt?: number,
): BaselineAccumulator {
  if (!Number.isFinite(value)) throw new RangeError(`baseline value must be finite, got ${value}`);
  const count = acc.count + 1;
  const delta = value - acc.mean;
  const mean = acc.mean + delta / count;
  let logCount = acc.logCount ?? 0;
  let logMean = acc.logMean ?? 0;
  let logM2 = acc.logM2 ?? 0;
  if (value > 0 && acc.logCount !== undefined) {
    const x = Math.log(value);
    logCount += 1;
    const d = x - logMean;
    logMean += d / logCount;
    logM2 += d * (x - logMean);
  }
  const logs = acc.logCount === undefined ? {} : { logCount, logMean, logM2 };
  const times =
    takenAt === undefined
      ? {}
      : { firstAt: acc.firstAt ?? takenAt, lastAt: Math.max(acc.lastAt ?? takenAt, takenAt) };
  return { count, mean, m2: acc.m2 + delta * (value - mean), ...logs, ...times };
}

/** Days covered by an accumulator's values, when it knows their times. */
function spanDaysOf(acc: BaselineAccumulator): number | undefined {
  return acc.firstAt === undefined || acc.lastAt === undefined
    ? undefined
    : (acc.lastAt - acc.firstAt) / DAY_MS;
}

/**
 * Whether an accumulator meets {@link MIN_BASELINE}: at least 30 values (above 0, when it
 * keeps ln sums) over at least 7 days (when it knows their times).
 */
export function baselineLargeEnough(acc: BaselineAccumulator): boolean {
  const n = acc.logCount ?? acc.count;
  const span = spanDaysOf(acc);
  return n >= MIN_BASELINE.count && (span === undefined || span >= MIN_BASELINE.days);
}

/**
 * Why a baseline is too small for a statistical level, in words for the engineer; null when
 * it is large enough. Source: Turnstone rule ({@link MIN_BASELINE}), common practice.
 */
export function baselineShortfall(stats: BaselineStats | null): string | null {
  const need = `A statistical level needs a baseline of at least ${MIN_BASELINE.count} usable values over at least ${MIN_BASELINE.days} days`;
  if (stats === null) return `${need}; there are fewer than 2.`;
  if (stats.count < MIN_BASELINE.count) return `${need}; there are ${stats.count}.`;
  if (stats.spanDays !== undefined && stats.spanDays < MIN_BASELINE.days)
    return `${need}; these ${stats.count} span ${stats.spanDays.toFixed(1)} days.`;
  return null;
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
  const logCount = acc.logCount ?? 0;
  const logs =
    logCount >= 2
      ? { logMean: acc.logMean ?? 0, logSigma: Math.sqrt((acc.logM2 ?? 0) / (logCount - 1)) }
      : {};
  const span = spanDaysOf(acc);
  return {
    count: acc.count,
    mean: acc.mean,
    sigma: Math.sqrt(acc.m2 / (acc.count - 1)),
    ...logs,
    ...(span === undefined ? {} : { spanDays: span }),
  };
}

/**
 * Mean and σ of ln(value) of a baseline: as kept, or — for a baseline stored with the value
 * mean m and σ alone — from the log-normal moments, s² = ln(1 + σ²/m²), μ = ln m − s²/2.
 * Null when the mean is not above 0.
 *
 * Source: moments of the log-normal distribution (e.g. Johnson, Kotz & Balakrishnan,
 * "Continuous Univariate Distributions", vol. 1, ch. 14).
 */
export function logStatsOf(stats: BaselineStats): { mean: number; sigma: number } | null {
  if (stats.logMean !== undefined && stats.logSigma !== undefined)
    return { mean: stats.logMean, sigma: stats.logSigma };
  if (!(stats.mean > 0)) return null;
  const s2 = Math.log(1 + (stats.sigma / stats.mean) ** 2);
  return { mean: Math.log(stats.mean) - s2 / 2, sigma: Math.sqrt(s2) };
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
 * (nor when `suspect` and `includeSuspect` is false); for `first-n`, until `count` values
 * have been taken and the baseline is large enough ({@link baselineLargeEnough}: 30 values
 * over 7 days); for `period`, when `fromAt ≤ takenAt < toAt`.
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
  if (source.from === 'first-n') return acc.count < source.count || !baselineLargeEnough(acc);
  return sample.takenAt >= source.fromAt && sample.takenAt < source.toAt;
}

/**
 * Whether a baseline is complete, so its statistical level applies: `first-n` once `count`
 * values are in; `period` once a sample at or after `toAt` has been seen (`latestAt`); both
 * only when the baseline is large enough ({@link MIN_BASELINE}: 30 values over 7 days). A
 * period that ends with fewer never completes, and the fixed levels stay in force.
 *
 * Source: Turnstone rule, no external source.
 */
export function baselineComplete(
  source: BaselineSource,
  acc: BaselineAccumulator,
  latestAt: number,
): boolean {
  if (!baselineLargeEnough(acc)) return false;
  if (source.from === 'first-n') return acc.count >= source.count;
  return latestAt >= source.toAt;
}

/**
 * Baseline of a stored history: mean and sample σ (n − 1) over the values that
 * {@link baselineTakes} admits, in time order, with σ of ln(value) and the days spanned.
 * `null` when fewer than 2 values qualify, or when a `first-n` baseline has fewer values than
 * it asks for; a smaller baseline than {@link MIN_BASELINE} is returned as it is (the caller
 * shows {@link baselineShortfall}).
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
      acc = addToBaseline(acc, sample.value, sample.takenAt);
    }
  }
  if (source.from === 'first-n' && acc.count < source.count) return null;
  return baselineStats(acc);
}

/**
 * Statistical level exp(μ + k·max(s, 0.1)), with μ and s the mean and σ of ln(value) of the
 * baseline: the k-sigma level in the log domain, where vibration amplitudes scatter roughly
 * normally (they are roughly log-normal). σ is floored at {@link LOG_SIGMA_FLOOR}. A baseline
 * whose mean is not above 0 (no logarithm) keeps mean + k·σ.
 *
 * Source: a k-sigma alarm is common practice, no source; log-normal scatter of vibration
 * amplitudes is common practice, no source; the floor is Turnstone's, no source.
 */
export function statisticalLevel(stats: BaselineStats, k: number): number {
  const logs = logStatsOf(stats);
  if (logs === null) return stats.mean + k * stats.sigma;
  return Math.exp(logs.mean + k * Math.max(logs.sigma, LOG_SIGMA_FLOOR));
}
