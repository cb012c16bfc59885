import type { AlertLevel } from './band-evaluation.ts';
import { fitLine, rSquared } from './least-squares.ts';
import type { QualityVerdict } from './quality.ts';
import { fitHinge, recentRegimeStart, turnWithin } from './trend-regime.ts';

const DAY_MS = 86_400_000;

/** Projection fits the values of this many days before the latest (recent behaviour, not last year's). Common practice, no source. */
export const PROJECTION_WINDOW_DAYS = 60;

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
  /**
   * When the fit reaches the target (epoch ms), when `outcome` is `projected`; never before
   * `now` (a crossing the fit puts in the past is due now, see `overdue`).
   */
  readonly crossingAt: number | null;
  /** The fit already reached the target at or before `now`: the level is due now. */
  readonly overdue: boolean;
  /** Usable points given. */
  readonly points: number;
  /**
   * The span the fits ran over: the recent regime after the latest change point found
   * (`changed` true), else every usable point. Null with too few points.
   */
  readonly window: {
    readonly fromAt: number;
    readonly toAt: number;
    readonly points: number;
    readonly changed: boolean;
  } | null;
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
  /**
   * The present (epoch ms): a crossing is never reported before it.
   * @default the latest point's time
   */
  readonly now?: number;
  /**
   * Look for change points and fit only the recent regime. Turn off to fit every point.
   * @default true
   */
  readonly changePoints?: boolean;
}

/**
 * Projects a band's recent trend to the date it crosses the next level.
 *
 * Window: the recent regime only — the points after the latest change point
 * ({@link recentRegimeStart}, found on ln(value) when every value is above 0, else on the
 * values; scatter under 1 % — finer than repeat measurements agree, common practice, no
 * source — is not taken for a change), so a flat history that turns upward is projected from the turn, not averaged with
 * months of flat values. The window is reported.
 *
 * Method: least-squares straight line through (t, value) (linear), and through (t, ln value)
 * (exponential, only when every value is > 0; it fits ln, i.e. weights relative errors, the
 * usual log-linear fit). Each is fitted as a hinge (flat, then rising from a break;
 * {@link fitHinge}) when that beats the straight line by BIC ({@link turnWithin}): a young
 * rise is then fitted from the level its flat history pins, and the window starts at the
 * break. The better fit is chosen by residual in value space over the same points. The better fit is the one with the higher R² **computed in value
 * space for both**, so the two are compared on the same footing; a tie goes to the linear
 * fit (the simpler model). `unusable` points are left out.
 *
 * The next level is alert when the latest value is below alert, else danger when it is below
 * danger, else there is none (`above-danger`). The crossing is where the chosen fit reaches
 * that level after the latest point; when the fit is already above it at the latest point,
 * the crossing is due now. A crossing is never reported before `now` (default the latest
 * point's time): one the fit puts earlier is reported at `now` with `overdue`. No crossing when the
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
  const given = points.length;
  let window: TrendProjection['window'] = null;
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
    overdue: false,
    points: given,
    window,
    ...rest,
  });

  const head = points[0];
  const latest = points[points.length - 1];
  if (head === undefined || latest === undefined || points.length < minPoints) {
    return none('too-few-points');
  }
  let start = 0;
  if (options.changePoints ?? true) {
    const allDays = points.map((p) => (p.takenAt - head.takenAt) / DAY_MS);
    const positive = points.every((p) => p.value > 0);
    const ys = points.map((p) => (positive ? Math.log(p.value) : p.value));
    // 1 % repeatability: ln units when fitting ln(value), else 1 % of the mean magnitude
    const meanAbs = points.reduce((a, p) => a + Math.abs(p.value), 0) / points.length;
    start = recentRegimeStart(allDays, ys, minPoints, positive ? 0.01 : 0.01 * meanAbs);
  }
  // The fits run over the regime from `start`; each is a hinge (flat, then rising from its
  // break) accepted over a straight line by BIC, so a young rise is fitted from the level the
  // flat part pins instead of from its own few points.
  const regime = points.slice(start);
  const origin = (regime[0] ?? head).takenAt;
  const xs = regime.map((p) => (p.takenAt - origin) / DAY_MS);
  const vs = regime.map((p) => p.value);
  const positive = vs.every((v) => v > 0);
  const meanAbs = vs.reduce((acc, v) => acc + Math.abs(v), 0) / Math.max(1, vs.length);
  const hingeOf = (ys: readonly number[], noise: number) => {
    const line = fitLine(xs, ys);
    if (line === null) return null;
    const plain = { k: 0, a: line.intercept, b: line.slope };
    if (!(options.changePoints ?? true)) return plain;
    const k = turnWithin(xs, ys, minPoints, noise);
    if (k === 0) return plain;
    const hinge = fitHinge(xs, ys, minPoints);
    return hinge === null ? plain : { k: hinge.k, a: hinge.a, b: hinge.b };
  };
  const lin = hingeOf(vs, 0.01 * meanAbs);
  if (lin === null) return none('too-few-points');
  const exp = positive
    ? hingeOf(
        vs.map((v) => Math.log(v)),
        0.01,
      )
    : null;
  const x0 = (k: number) => xs[k] ?? 0;
  const linAt = (x: number) => lin.a + lin.b * Math.max(0, x - x0(lin.k));
  const expAt = (x: number) =>
    exp === null ? Number.NaN : Math.exp(exp.a + exp.b * Math.max(0, x - x0(exp.k)));
  const sseOf = (f: (x: number) => number) =>
    vs.reduce((acc, v, i) => acc + (v - f(xs[i] ?? 0)) ** 2, 0);
  const linSse = sseOf(linAt);
  const expSse = exp === null ? Number.POSITIVE_INFINITY : sseOf(expAt);
  const r2Over = (k: number, f: (x: number) => number) =>
    rSquared(vs.slice(k), (i) => f(xs[k + i] ?? 0));
  const linear: LinearTrendFit = {
    model: 'linear',
    intercept: lin.a,
    slopePerDay: lin.b,
    r2: r2Over(lin.k, linAt),
  };
  let exponential: ExponentialTrendFit | null = null;
  if (exp !== null) {
    const logs = vs.slice(exp.k).map((v) => Math.log(v));
    exponential = {
      model: 'exponential',
      amplitude: Math.exp(exp.a),
      ratePerDay: exp.b,
      r2: r2Over(exp.k, expAt),
      r2Log: rSquared(logs, (i) => exp.a + exp.b * (x0(exp.k + i) - x0(exp.k))),
    };
  }
  // the better fit by residual in value space over the same points; a tie goes to the line
  const useExp = exponential !== null && expSse < linSse;
  const fit: TrendFit = useExp && exponential !== null ? exponential : linear;
  const k = useExp && exp !== null ? exp.k : lin.k;
  const fits = { fit, linear, exponential };
  const first = regime[k] ?? head;
  window = {
    fromAt: first.takenAt,
    toAt: latest.takenAt,
    points: regime.length - k,
    changed: start + k > 0,
  };
  const days = regime.slice(k).map((p) => (p.takenAt - first.takenAt) / DAY_MS);

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
  const now = options.now ?? latest.takenAt;
  const nowDay = Math.max(latestDay, (now - first.takenAt) / DAY_MS);
  if (crossingDay - latestDay > horizonDays) return none('beyond-horizon', { ...fits, target });
  const overdue = crossingDay <= nowDay;
  crossingDay = Math.max(crossingDay, nowDay);
  return {
    outcome: 'projected',
    ...fits,
    target,
    crossingAt: first.takenAt + Math.round(crossingDay * DAY_MS),
    overdue,
    points: given,
    window,
  };
}
