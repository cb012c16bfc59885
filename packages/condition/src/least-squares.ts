/** Straight line y = intercept + slope·x fitted by ordinary least squares. */
export interface LineFit {
  readonly slope: number;
  readonly intercept: number;
  /** Coefficient of determination 1 − SS_res/SS_tot of the fit (1 when SS_tot = 0). */
  readonly r2: number;
  /** Number of points fitted. */
  readonly n: number;
}

/**
 * Ordinary least-squares straight line through (x, y): slope = Sxy/Sxx, intercept =
 * ȳ − slope·x̄, computed on deviations from the means (better conditioned than the raw
 * normal equations when x is large, e.g. epoch times). Returns `null` for fewer than 2 points
 * or when every x is the same.
 *
 * Source: the normal equations of simple linear regression (any statistics text, e.g.
 * Montgomery & Runger, "Applied Statistics and Probability for Engineers", ch. 11); checked
 * against numpy.polyfit(x, y, 1) run live in the tests.
 */
export function fitLine(xs: readonly number[], ys: readonly number[]): LineFit | null {
  if (xs.length !== ys.length) throw new RangeError('x and y must have the same length');
  const n = xs.length;
  if (n < 2) return null;
  let sumX = 0;
  let sumY = 0;
  for (let i = 0; i < n; i += 1) {
    sumX += xs[i] ?? 0;
    sumY += ys[i] ?? 0;
  }
  const meanX = sumX / n;
  const meanY = sumY / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i += 1) {
    const dx = (xs[i] ?? 0) - meanX;
    sxx += dx * dx;
    sxy += dx * ((ys[i] ?? 0) - meanY);
  }
  if (sxx === 0) return null;
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  return { slope, intercept, r2: rSquared(ys, (i) => intercept + slope * (xs[i] ?? 0)), n };
}

/**
 * Coefficient of determination R² = 1 − SS_res/SS_tot of predictions against observations,
 * in the observations' own space. When SS_tot is zero (all observations equal, to rounding) it
 * is 1 if the predictions match them, else 0.
 *
 * Source: definition of R² (any statistics text, e.g. Montgomery & Runger, ch. 11).
 */
export function rSquared(ys: readonly number[], predict: (index: number) => number): number {
  const n = ys.length;
  let mean = 0;
  for (const y of ys) mean += y;
  mean /= n;
  let ssTot = 0;
  let ssRes = 0;
  let scale = 0;
  for (let i = 0; i < n; i += 1) {
    const y = ys[i] ?? 0;
    ssTot += (y - mean) ** 2;
    ssRes += (y - predict(i)) ** 2;
    scale += y * y;
  }
  // "zero" relative to the data, so rounding in the mean does not make a constant series noisy
  const tiny = 1e-24 * scale;
  if (ssTot <= tiny) return ssRes <= tiny ? 1 : 0;
  return 1 - ssRes / ssTot;
}
