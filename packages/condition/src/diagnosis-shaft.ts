/**
 * The shaft-harmonic rules, read from the velocity spectrum: unbalance (1× radial dominant,
 * little harmonic content), misalignment (2× large against 1×, or high axial 1×/2×) and
 * looseness (a long series of harmonics, half orders). Common practice of vibration analysis,
 * no single source.
 */
import {
  amp,
  clamp01,
  fmt,
  orderLabel,
  type DiagnosisContext,
  type Peak,
} from './diagnosis-peaks.ts';
import { ELECTRICAL_RESOLVE_LINES } from './diagnosis-components.ts';
import type { DiagnosisHint, DiagnosisInput } from './diagnosis-types.ts';

/**
 * Unbalance: 1× holds at least this share of the overall velocity (1× RMS / overall RMS ≥ 0.5,
 * i.e. a quarter of the energy) and is the largest shaft harmonic. Common practice
 * ("1× radial dominant"), no source.
 */
export const UNBALANCE_MIN_1X_SHARE = 0.5;
/**
 * Unbalance: the 3×…10× content (root-sum-square) stays below this fraction of 1× ("little
 * harmonic content"). Common practice, no source.
 */
export const UNBALANCE_MAX_HARMONIC_RATIO = 0.5;
/**
 * Misalignment: 2× at or above half of 1× in a radial direction. Common practice (2× above
 * 50 % of 1× is the usual flag for angular/parallel misalignment), no source.
 */
export const MISALIGNMENT_2X_RATIO = 0.5;
/**
 * Misalignment: 2× stands out from the higher harmonics — at least this many times the
 * largest of 3×…6× — otherwise a long even series points to looseness instead. Common
 * practice, no source.
 */
export const MISALIGNMENT_2X_OVER_SERIES = 2;
/**
 * Axial misalignment: on an axial point, 1× and 2× together hold at least this share of the
 * overall velocity (high axial 1×/2×). Common practice, no source.
 */
export const MISALIGNMENT_AXIAL_SHARE = 0.5;
/** Looseness: harmonics 2×…10× each at least this fraction of 1× count towards the series. Common practice, no source. */
export const LOOSENESS_HARMONIC_MIN_RATIO = 0.08;
/** Looseness: at least this many of 3×…10× present ("a long series"). Common practice, no source. */
export const LOOSENESS_MIN_HARMONICS = 4;
/** Looseness: half orders (0.5×, 1.5×, 2.5×, 3.5×) each at least this fraction of 1× count. Common practice, no source. */
export const LOOSENESS_HALF_ORDER_MIN_RATIO = 0.05;
/** Looseness: at least this many half orders present. Common practice, no source. */
export const LOOSENESS_MIN_HALF_ORDERS = 2;

/** Unbalance, misalignment and looseness hints; call only when the overall velocity matters. */
export function shaftHints(
  ctx: DiagnosisContext,
  direction: DiagnosisInput['direction'],
  lineHz: number | undefined,
): DiagnosisHint[] {
  const { velocity, p1, f1, df, overall, ev, at } = ctx;
  const hints: DiagnosisHint[] = [];
  const h: (Peak | null)[] = [null, p1?.present ? p1 : null];
  for (let k = 2; k <= 10; k++) h.push(at(velocity, k * f1));
  const half = [0.5, 1.5, 2.5, 3.5].map((k) => ({ k, p: at(velocity, k * f1) }));
  const a1 = amp(h[1]!);
  const a2 = amp(h[2]!);
  const series = [3, 4, 5, 6, 7, 8, 9, 10].filter(
    (k) => amp(h[k]!) >= LOOSENESS_HARMONIC_MIN_RATIO * a1 && amp(h[k]!) > 0,
  );
  const halves = half.filter(
    (x) => amp(x.p) > 0 && amp(x.p) >= LOOSENESS_HALF_ORDER_MIN_RATIO * a1,
  );
  let higher = 0;
  for (let k = 3; k <= 10; k++) higher += amp(h[k]!) ** 2;
  higher = Math.sqrt(higher);
  const maxMid = Math.max(...[3, 4, 5, 6].map((k) => amp(h[k]!)));
  const share1 = a1 / overall;
  const axial = direction === 'A';
  const looseness =
    a1 > 0 &&
    (series.length >= LOOSENESS_MIN_HARMONICS || halves.length >= LOOSENESS_MIN_HALF_ORDERS);

  if (
    !axial &&
    a1 > 0 &&
    share1 >= UNBALANCE_MIN_1X_SHARE &&
    a2 < a1 &&
    higher < UNBALANCE_MAX_HARMONIC_RATIO * a1 &&
    !looseness
  ) {
    hints.push({
      code: 'unbalance',
      confidence: clamp01(share1 * (1 - 0.5 * (a2 / a1))),
      summary: `1× dominant (${fmt(a1)} mm/s, ${fmt(100 * share1 ** 2, 2)} % of the energy) with little harmonic content${direction ? ` in ${direction}` : ''}: unbalance is likely; check the 1× phase and the axial level.`,
      evidence: [ev('velocity', h[1]!, '1×'), ...(a2 > 0 ? [ev('velocity', h[2]!, '2×')] : [])],
    });
  }
  const radialMis =
    !axial &&
    a1 > 0 &&
    a2 >= MISALIGNMENT_2X_RATIO * a1 &&
    a2 >= MISALIGNMENT_2X_OVER_SERIES * maxMid;
  const axialMis = axial && Math.hypot(a1, a2) >= MISALIGNMENT_AXIAL_SHARE * overall;
  const twoXUnresolved =
    lineHz !== undefined && Math.abs(2 * lineHz - 2 * f1) / df < ELECTRICAL_RESOLVE_LINES;
  if (radialMis || axialMis) {
    const evidence = [
      ...(a1 > 0 ? [ev('velocity', h[1]!, '1×')] : []),
      ...(a2 > 0 ? [ev('velocity', h[2]!, '2×')] : []),
      ...(amp(h[3]!) > 0 ? [ev('velocity', h[3]!, '3×')] : []),
    ];
    hints.push({
      code: 'misalignment',
      confidence: axialMis ? clamp01(Math.hypot(a1, a2) / overall) : clamp01(0.6 * (a2 / a1)),
      summary: axialMis
        ? `High axial 1×/2× (${fmt(a1)} / ${fmt(a2)} mm/s, ${fmt((100 * Math.hypot(a1, a2)) / overall, 2)} % of overall): misalignment is likely.`
        : `2× at ${fmt((100 * a2) / a1, 2)} % of 1× (${fmt(a2)} vs ${fmt(a1)} mm/s): misalignment is likely; confirm with an axial reading${twoXUnresolved ? `. At this resolution 2× cannot be told from 2 × line frequency (${fmt(2 * lineHz!, 4)} Hz)` : ''}.`,
      evidence,
    });
  }
  if (looseness) {
    const evidence = [
      ev('velocity', h[1]!, '1×'),
      ...series.map((k) => ev('velocity', h[k]!, `${k}×`)),
      ...halves.map((x) => ev('velocity', x.p!, orderLabel(x.k))),
    ];
    hints.push({
      code: 'looseness',
      confidence: clamp01(0.3 + 0.07 * series.length + 0.15 * halves.length),
      summary: `A series of ${series.length} harmonics from 3× to 10×${halves.length ? ` and ${halves.length} half orders` : ''}: mechanical looseness is likely (mounting, fit, bearing clearance).`,
      evidence,
    });
  }
  return hints;
}
