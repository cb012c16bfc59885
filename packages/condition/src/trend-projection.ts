import type { AlertLevel } from './band-evaluation.ts';
import { fitLine, rSquared } from './least-squares.ts';
import type { QualityVerdict } from './quality.ts';

const DAY_MS = 86_400_000;

/** One trend value of a band. */
export interface TrendPoint {
  /** Epoch milliseconds (UTC). */
  readonly takenAt: number;
  readonly value: number;
  /** When given, `unusable` points are left out of the fits. */
  readonly quality?: QualityVerdict;
}

/** Linear fit value(t) = intercept + slopePerDay · days since the first point. */
export interface LinearTrendFit {
  readonly model: 'linear';
  /** Value at the first point's time. */
  readonly intercept: number;
  /** Change per day, in the band's unit. */
  readonly slopePerDay: number;
  /** R² in value space. */
  readonly r2: number;
}

/** Exponential fit value(t) = amplitude · e^(ratePerDay · days since the first point). */
export interface ExponentialTrendFit {
  readonly model: 'exponential';
  /** Value at the first point's time. */
  readonly amplitude: number;
  /** Growth rate per day (ln units); doubling time = ln 2 / rate. */
  readonly ratePerDay: number;
  /** R² in value space (not of the logarithms), so it compares with the linear fit's. */
  readonly r2: number;
  /** R² of the straight line through ln(value), for reference. */
  readonly r2Log: number;
}

/** Either fit. */
export type TrendFit = LinearTrendFit | ExponentialTrendFit;

/** Why a projection gives no crossing date, or `projected` when it gives one. */
export type ProjectionOutcome =
  'projected' | 'too-few-points' | 'above-danger' | 'not-rising' | 'beyond-horizon';

/** Result of {@link projectTrend}. */
export interface TrendProjection {
  readonly outcome: ProjectionOutcome;
  /** The better fit (by R²), or null with too few points. */
  readonly fit: TrendFit | null;
  readonly linear: LinearTrendFit | null;
  /** Null when too few points or any value ≤ 0 (a logarithm is needed). */
  readonly exponential: ExponentialTrendFit | null;
  /** The next level above the latest value, or null when the latest is at/above danger. */
  readonly target: { readonly level: AlertLevel; readonly value: number } | null;
  /** When the fit reaches the target (epoch ms), when `outcome` is `projected`. */
  readonly crossingAt: number | null;
  /** Points used. */
  readonly points: number;
}

/** Options of {@link projectTrend}. */
export interface ProjectionOptions {
  /**
   * Fewest points a projection needs. Common practice, no source.
   * @default 5
   */
  readonly minPoints?: number;
  /**
   * Furthest a crossing may lie after the latest point and still be reported, in days.
   * Common practice, no source.
   * @default 365
   */
  readonly horizonDays?: number;
}

/**
 * Projects a band's recent trend to the date it crosses the next level.
 *
 * Method: least-squares straight line through (t, value) (linear), and through (t, ln value)
 * (exponential, only when every value is > 0; it fits ln, i.e. weights relative errors, the
 * usual log-linear fit). The better fit is the one with the higher R² **computed in value
 * space for both**, so the two are compared on the same footing; a tie goes to the linear
 * fit (the simpler model). `unusable` points are left out.
 *
 * The next level is alert when the latest value is below alert, else danger when it is below
 * danger, else there is none (`above-danger`). The crossing is where the chosen fit reaches
 * that level after the latest point; when the fit is already above it at the latest point,
 * the crossing is the latest point's time (the level is due now). No crossing when the
 * chosen fit is flat or falling (`not-rising`), when it lies more than `horizonDays` after
 * the latest point (`beyond-horizon`), or with fewer than `minPoints` points or no spread in
 * time (`too-few-points`).
 *
 * Source: least squares — normal equations of simple linear regression (e.g. Montgomery &
 * Runger, ch. 11), checked against numpy.polyfit live; the choice and bounds are Turnstone's,
 * common practice, no source.
 */
export function projectTrend(
  trend: readonly TrendPoint[],
  levels: { readonly alertLevel: number; readonly dangerLevel: number },
  options: ProjectionOptions = {},
): TrendProjection {
  const minPoints = Math.max(2, options.minPoints ?? 5);
  const horizonDays = options.horizonDays ?? 365;
  const points = trend
    .filter((p) => p.quality !== 'unusable' && Number.isFinite(p.value))
    .sort((a, b) => a.takenAt - b.takenAt);
  const none = (
    outcome: ProjectionOutcome,
    rest: Partial<TrendProjection> = {},
  ): TrendProjection => ({
    outcome,
    fit: null,
    linear: null,
    exponential: null,
    target: null,
    crossingAt: null,
    points: points.length,
    ...rest,
  });

  const first = points[0];
  const latest = points[points.length - 1];
  if (first === undefined || latest === undefined || points.length < minPoints) {
    return none('too-few-points');
  }
  const days = points.map((p) => (p.takenAt - first.takenAt) / DAY_MS);
  const values = points.map((p) => p.value);
  const line = fitLine(days, values);
  if (line === null) return none('too-few-points');
  const linear: LinearTrendFit = {
    model: 'linear',
    intercept: line.intercept,
    slopePerDay: line.slope,
    r2: line.r2,
  };

  let exponential: ExponentialTrendFit | null = null;
  if (values.every((v) => v > 0)) {
    const logLine = fitLine(
      days,
      values.map((v) => Math.log(v)),
    );
    if (logLine !== null) {
      const amplitude = Math.exp(logLine.intercept);
      const rate = logLine.slope;
      exponential = {
        model: 'exponential',
        amplitude,
        ratePerDay: rate,
        r2: rSquared(values, (i) => amplitude * Math.exp(rate * (days[i] ?? 0))),
        r2Log: logLine.r2,
      };
    }
  }
  const fit: TrendFit = exponential !== null && exponential.r2 > linear.r2 ? exponential : linear;
  const fits = { fit, linear, exponential };

  const target =
    latest.value < levels.alertLevel
      ? { level: 'alert' as const, value: levels.alertLevel }
      : latest.value < levels.dangerLevel
        ? { level: 'danger' as const, value: levels.dangerLevel }
        : null;
  if (target === null) return none('above-danger', fits);

  const latestDay = days[days.length - 1] ?? 0;
  let crossingDay: number;
  if (fit.model === 'linear') {
    if (!(fit.slopePerDay > 0)) return none('not-rising', { ...fits, target });
    crossingDay = (target.value - fit.intercept) / fit.slopePerDay;
  } else {
    if (!(fit.ratePerDay > 0)) return none('not-rising', { ...fits, target });
    crossingDay = Math.log(target.value / fit.amplitude) / fit.ratePerDay;
  }
  crossingDay = Math.max(crossingDay, latestDay);
  if (crossingDay - latestDay > horizonDays) return none('beyond-horizon', { ...fits, target });
  return {
    outcome: 'projected',
    ...fits,
    target,
    crossingAt: first.takenAt + Math.round(crossingDay * DAY_MS),
    points: points.length,
  };
}
