/**
 * Where a trend's recent regime starts: change points (two-line split, BIC) and the hinge fit
 * (flat, then rising from a break) that the projection uses for a young rise.
 */

/** Least-squares line sums of a run of points, so a line's residual is O(1) per range. */
interface Prefix {
  readonly n: Float64Array;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly xx: Float64Array;
  readonly xy: Float64Array;
  readonly yy: Float64Array;
}

function prefixSums(xs: readonly number[], ys: readonly number[]): Prefix {
  const len = xs.length + 1;
  const p = {
    n: new Float64Array(len),
    x: new Float64Array(len),
    y: new Float64Array(len),
    xx: new Float64Array(len),
    xy: new Float64Array(len),
    yy: new Float64Array(len),
  };
  for (let i = 0; i < xs.length; i += 1) {
    const x = xs[i] ?? 0;
    const y = ys[i] ?? 0;
    p.n[i + 1] = i + 1;
    p.x[i + 1] = (p.x[i] ?? 0) + x;
    p.y[i + 1] = (p.y[i] ?? 0) + y;
    p.xx[i + 1] = (p.xx[i] ?? 0) + x * x;
    p.xy[i + 1] = (p.xy[i] ?? 0) + x * y;
    p.yy[i + 1] = (p.yy[i] ?? 0) + y * y;
  }
  return p;
}

/** Residual sum of squares of the least-squares line through points [from, to). */
function lineSse(p: Prefix, from: number, to: number): number {
  // No closure here: the search calls this for every candidate break of every series, and
  // a function made per call costs more than the arithmetic.
  const n = to - from;
  const sx = (p.x[to] ?? 0) - (p.x[from] ?? 0);
  const sy = (p.y[to] ?? 0) - (p.y[from] ?? 0);
  const sxx = (p.xx[to] ?? 0) - (p.xx[from] ?? 0) - (sx * sx) / n;
  const sxy = (p.xy[to] ?? 0) - (p.xy[from] ?? 0) - (sx * sy) / n;
  const syy = (p.yy[to] ?? 0) - (p.yy[from] ?? 0) - (sy * sy) / n;
  const sse = sxx > 0 ? syy - (sxy * sxy) / sxx : syy;
  return Math.max(0, sse);
}

/** BIC parameter count of two lines and their break (see {@link recentRegimeStart}). */
const BREAK_PENALTY = 8;

/**
 * Index of the first point of the recent regime: binary segmentation with two separate
 * straight lines (a step, a turn or both at the break) against one line, accepted by the
 * Bayesian information criterion n·ln(SSE/n) + p·ln n (one line p = 2; two lines and the
 * break p = 5, with the 3 added parameters counted twice, p = 8, so that scatter alone seldom
 * makes a break when the search repeats on ever shorter later parts); repeated on the later
 * part until no break is accepted. Each part keeps at least `minPoints` points. Residual
 * scatter below `noise` (RMS, in y's unit) counts as `noise`: a curve smoother than the
 * measurement repeats is not split into regimes.
 *
 * Source: change-point detection by binary segmentation (Scott & Knott 1974) with BIC
 * (Schwarz 1978); the use here is Turnstone's, no source.
 */
export function recentRegimeStart(
  xs: readonly number[],
  ys: readonly number[],
  minPoints: number,
  noise = 0,
): number {
  const p = prefixSums(xs, ys);
  let start = 0;
  const end = xs.length;
  for (;;) {
    const n = end - start;
    if (n < 2 * minPoints) return start;
    const scale = (lineSse(p, start, end) + 1e-12 * ((p.yy[end] ?? 0) - (p.yy[start] ?? 0))) / n;
    const floor = Math.max(noise * noise, 1e-9 * scale) + Number.MIN_VALUE;
    const one = n * Math.log(Math.max(lineSse(p, start, end) / n, floor)) + 2 * Math.log(n);
    // the break with the least residual, then whether it beats one line once scatter finer
    // than `noise` counts as `noise`
    let best = -1;
    let bestSse = Number.POSITIVE_INFINITY;
    for (let k = start + minPoints; k <= end - minPoints; k += 1) {
      if ((xs[k] ?? 0) === (xs[k - 1] ?? 0)) continue;
      const sse = lineSse(p, start, k) + lineSse(p, k, end);
      if (sse < bestSse) {
        bestSse = sse;
        best = k;
      }
    }
    const two = n * Math.log(Math.max(bestSse / n, floor)) + BREAK_PENALTY * Math.log(n);
    if (best < 0 || !(two < one)) return start;
    start = best;
  }
}

/** Least-squares hinge y = a + b·max(0, x − x[k]) with its break at point k. */
export interface HingeFit {
  /** Index of the break (the first point of the rising part). */
  readonly k: number;
  /** Level before the break (and at it). */
  readonly a: number;
  /** Slope after the break, per unit of x. */
  readonly b: number;
  /** Residual sum of squares. */
  readonly sse: number;
}

/**
 * The continuous hinge ("broken stick") y = a + b·max(0, x − x[k]) of least squared residual
 * over every break k with at least `minPoints` points from it to the end (k = 0 is the plain
 * straight line). A flat history that turns upward is fitted as one curve: the flat part pins
 * the level the rise starts from, so a young rise is not extrapolated from its few points
 * alone. `xs` ascending. O(n) with suffix sums. Null with fewer than `minPoints` points.
 *
 * Source: segmented (piecewise linear) regression with a continuous break, fitted by a grid
 * over the break and least squares for the rest (Hudson 1966; Muggeo 2003); the use here is
 * Turnstone's, no source.
 */
export function fitHinge(
  xs: readonly number[],
  ys: readonly number[],
  minPoints: number,
): HingeFit | null {
  const n = xs.length;
  if (n < Math.max(2, minPoints)) return null;
  let sy = 0;
  let syy = 0;
  for (let i = 0; i < n; i += 1) {
    const y = ys[i] ?? 0;
    sy += y;
    syy += y * y;
  }
  // suffix sums of x, x², x·y, y from point k to the end
  let tx = 0;
  let txx = 0;
  let txy = 0;
  let ty = 0;
  let best: HingeFit | null = null;
  const syyc = syy - (sy * sy) / n;
  for (let k = n - 1; k >= 0; k -= 1) {
    const x = xs[k] ?? 0;
    const y = ys[k] ?? 0;
    tx += x;
    txx += x * x;
    txy += x * y;
    ty += y;
    const m = n - k;
    if (m < minPoints || (k > 0 && x === (xs[k - 1] ?? 0))) continue;
    // z = max(0, x − x_k): Σz, Σz², Σz·y over the points from k
    const sz = tx - m * x;
    const szz = txx - 2 * x * tx + m * x * x;
    const szy = txy - x * ty;
    const czz = szz - (sz * sz) / n;
    if (!(czz > 0)) continue;
    const czy = szy - (sz * sy) / n;
    const b = czy / czz;
    const a = (sy - b * sz) / n;
    const sse = Math.max(0, syyc - b * czy);
    if (best === null || sse < best.sse) best = { k, a, b, sse };
  }
  return best;
}

/**
 * Where a regime that is flat and then turns upward turns: the break of the best
 * {@link fitHinge}, accepted when it beats one straight line by the Bayesian information
 * criterion (hinge: level, slope and break, p = 3; line: p = 2), else 0. Scatter below `noise`
 * counts as `noise`. A young rise is found before the two-line test of
 * {@link recentRegimeStart} can see it, because the flat part is not given a slope of its own.
 *
 * Source: Hudson (1966) segmented regression; BIC (Schwarz 1978); use here Turnstone's.
 */
export function turnWithin(
  xs: readonly number[],
  ys: readonly number[],
  minPoints: number,
  noise = 0,
): number {
  const n = xs.length;
  const hinge = fitHinge(xs, ys, minPoints);
  if (hinge === null || hinge.k === 0 || !(hinge.b > 0)) return 0;
  const p = prefixSums(xs, ys);
  const floor = Math.max(noise * noise, Number.MIN_VALUE);
  const one = n * Math.log(Math.max(lineSse(p, 0, n) / n, floor)) + 2 * Math.log(n);
  const bent = n * Math.log(Math.max(hinge.sse / n, floor)) + 3 * Math.log(n);
  return bent < one ? hinge.k : 0;
}
