/**
 * The rules of the machine's other parts: blade/vane pass, electrical (2 × line frequency,
 * only when resolved from the shaft harmonics) and belts from the velocity content; gear mesh
 * with its sidebands from the acceleration spectrum. Common practice of vibration analysis,
 * no single source.
 */
import type { GearMesh } from '@turnstone/dsp';
import {
  amp,
  clamp01,
  fmt,
  LINE_TOLERANCE,
  readPeak,
  type DiagnosisContext,
  type Lines,
} from './diagnosis-peaks.ts';
import type { BeltDrive, DiagnosisEvidence, DiagnosisHint } from './diagnosis-types.ts';

/**
 * Blade/vane pass above its usual share: the blade-pass line holds at least this share of the
 * overall velocity (in a sound fan or pump 1× dominates and blade pass is a minor line).
 * Common practice, no source.
 */
export const BLADE_PASS_MIN_SHARE = 0.5;
/** Electrical: the 2 × line-frequency line holds at least this share of the overall velocity. Common practice, no source. */
export const ELECTRICAL_MIN_SHARE = 0.4;
/**
 * Lines between 2 × line frequency and the nearest shaft harmonic needed to tell them apart:
 * a Hann main lobe spans ±2 lines, so two tones 4 lines apart keep a dip between them.
 * Source: Harris 1978, Proc. IEEE 66(1):51–83 (Hann main-lobe width 4 bins).
 */
export const ELECTRICAL_RESOLVE_LINES = 4;
/**
 * Shaft harmonics up to this order are checked for coinciding with 2 × line frequency (2×
 * for a two-pole motor, 4× for a four-pole one: the classic confusions). Common practice, no source.
 */
export const ELECTRICAL_CHECK_HARMONICS = 4;
/** Gear mesh: a sideband counts when it is at least this fraction of the mesh line. Common practice, no source. */
export const GEAR_SIDEBAND_MIN_RATIO = 0.1;
/** Gear mesh: at least this many sidebands present (±1×, ±2×, ±3× of either gear's shaft). Common practice, no source. */
export const GEAR_MIN_SIDEBANDS = 2;
/** Belt: belt-frequency lines (1…4 × belt frequency) together hold at least this share of the overall velocity. Common practice, no source. */
export const BELT_MIN_SHARE = 0.3;
/** Belt: at least this many belt-frequency harmonics present. Common practice, no source. */
export const BELT_MIN_LINES = 2;

/** Standard gravity, m/s² (ISO 80000-3). */
const STANDARD_GRAVITY = 9.80665;

/** Blade/vane pass above its usual share of the overall velocity. */
export function bladePassHints(ctx: DiagnosisContext, blades: number | undefined): DiagnosisHint[] {
  const { velocity, f1, overall, ev, at } = ctx;
  const hints: DiagnosisHint[] = [];
  if (blades !== undefined && blades >= 1) {
    const p = at(velocity, blades * f1);
    const a = amp(p);
    if (a > 0 && a >= BLADE_PASS_MIN_SHARE * overall) {
      hints.push({
        code: 'blade-pass',
        confidence: clamp01(a / overall),
        summary: `Blade/vane pass (${blades} × 1×) holds ${fmt((100 * a) / overall, 2)} % of the overall velocity: flow disturbance, a rub or a gap to the casing/cutwater is likely.`,
        evidence: [ev('velocity', p!, `blade pass (${blades}×)`)],
      });
    }
  }
  return hints;
}

/**
 * An electrical cause: the 2 × line-frequency line, read only when the lines resolve it from
 * the nearest shaft harmonic; otherwise a note says what resolution would.
 */
export function electricalHints(
  ctx: DiagnosisContext,
  lineHz: number | undefined,
  notes: string[],
): DiagnosisHint[] {
  const { velocity, f1, df, overall, ev } = ctx;
  const hints: DiagnosisHint[] = [];
  if (lineHz !== undefined) {
    const f2l = 2 * lineHz;
    const k = Math.max(1, Math.round(f2l / f1));
    const gapLines =
      k <= ELECTRICAL_CHECK_HARMONICS ? Math.abs(f2l - k * f1) / df : Number.POSITIVE_INFINITY;
    const p = readPeak(velocity, f2l, LINE_TOLERANCE * df);
    const a = amp(p);
    if (gapLines < ELECTRICAL_RESOLVE_LINES) {
      const needS = ELECTRICAL_RESOLVE_LINES / Math.max(Math.abs(f2l - k * f1), 1e-9);
      notes.push(
        `2 × line frequency (${fmt(f2l, 4)} Hz) and ${k}× running speed (${fmt(k * f1, 4)} Hz) are ${fmt(gapLines, 2)} lines apart at Δf ${fmt(df)} Hz: not resolved, so an electrical cause cannot be told from ${k}×${Math.abs(f2l - k * f1) > 1e-6 ? ` (Δf ≤ ${fmt(Math.abs(f2l - k * f1) / ELECTRICAL_RESOLVE_LINES)} Hz, segments ≥ ${fmt(needS)} s, would separate them)` : ' (they coincide)'}.`,
      );
    } else if (a > 0 && a >= ELECTRICAL_MIN_SHARE * overall) {
      hints.push({
        code: 'electrical',
        confidence: clamp01(a / overall),
        summary: `2 × line frequency (${fmt(f2l, 4)} Hz, resolved from ${k}× at ${fmt(k * f1, 4)} Hz) holds ${fmt((100 * a) / overall, 2)} % of the overall velocity: an electrical cause (stator, air gap, soft foot) is likely.`,
        evidence: [ev('velocity', p!, '2 × line')],
      });
    }
  }
  return hints;
}

/**
 * Belt-frequency lines, read from the acceleration spectrum turned into velocity
 * (v = a / 2πf), since belt frequencies often fall below the velocity spectrum's ISO cut-off
 * (10 Hz).
 */
export function beltHints(ctx: DiagnosisContext, belts: readonly BeltDrive[]): DiagnosisHint[] {
  const { acceleration: acc, f1, df, overall, ev, at } = ctx;
  const hints: DiagnosisHint[] = [];
  if (belts.length === 0) return hints;
  const beltLines: Lines = {
    values: Float64Array.from(acc.values, (a, k) =>
      k === 0 ? 0 : (a * STANDARD_GRAVITY * 1000) / (2 * Math.PI * k * acc.dfHz),
    ),
    dfHz: acc.dfHz,
    enbwBins: acc.enbwBins,
    firstLine: 1,
  };
  for (const belt of belts) {
    if (!(belt.pulleyDiameterMm > 0) || !(belt.lengthMm > belt.pulleyDiameterMm)) {
      throw new RangeError(`belt "${belt.name}": give a pulley diameter and a longer belt length`);
    }
    const fb = (f1 * Math.PI * belt.pulleyDiameterMm) / belt.lengthMm;
    const found = [1, 2, 3, 4]
      .map((k) => ({ k, p: at(beltLines, k * fb, 0.01) }))
      .filter((x) => amp(x.p) > 0 && Math.abs(x.k * fb - f1) > 3 * df);
    const total = Math.sqrt(found.reduce((s, x) => s + amp(x.p) ** 2, 0));
    if (found.length >= BELT_MIN_LINES && total >= BELT_MIN_SHARE * overall) {
      hints.push({
        code: 'belt',
        confidence: clamp01(total / overall + 0.1 * found.length),
        summary: `${found.length} lines at the belt frequency of "${belt.name}" (${fmt(fb)} Hz) and its harmonics, ${fmt((100 * total) / overall, 2)} % of overall: belt wear, tension or a pulley problem is likely.`,
        // mm/s RMS from the acceleration lines (may lie below the velocity spectrum's cut-off)
        evidence: found.map((x) => ev('velocity', x.p!, `${belt.name} belt ×${x.k}`)),
      });
    }
  }
  return hints;
}

/** Gear mesh with sidebands at the gear's shaft speed (acceleration spectrum). */
export function gearHints(ctx: DiagnosisContext, gears: readonly GearMesh[]): DiagnosisHint[] {
  const { acceleration, f1, ev, at } = ctx;
  const hints: DiagnosisHint[] = [];
  for (const gear of gears) {
    const ratio = gear.speedRatio ?? 1;
    const fShaft = ratio * f1;
    const gmf = gear.teeth * fShaft;
    const p = at(acceleration, gmf);
    if (!p?.present) continue;
    // The gear's own shaft; the mating gear's speed is not known from one gear's record.
    const shafts = [{ name: gear.name, hz: fShaft }];
    const sb: DiagnosisEvidence[] = [];
    for (const s of shafts) {
      for (const m of [1, 2, 3]) {
        for (const sign of [-1, 1]) {
          const q = readPeak(
            acceleration,
            p.hz + sign * m * s.hz,
            LINE_TOLERANCE * acceleration.dfHz,
          );
          if (q?.present && q.amplitude >= GEAR_SIDEBAND_MIN_RATIO * p.amplitude) {
            sb.push(ev('acceleration', q, `${gear.name} GMF${sign < 0 ? '−' : '+'}${m}×`));
          }
        }
      }
    }
    if (sb.length < GEAR_MIN_SIDEBANDS) continue;
    const harmonics: DiagnosisEvidence[] = [];
    for (const k of [2, 3]) {
      const q = at(acceleration, k * p.hz);
      if (q?.present) harmonics.push(ev('acceleration', q, `${gear.name} GMF ×${k}`));
    }
    const sbSum = Math.sqrt(sb.reduce((s, e) => s + e.amplitude ** 2, 0));
    hints.push({
      code: 'gear-mesh',
      confidence: clamp01(0.3 + 0.08 * sb.length + sbSum / p.amplitude / 2),
      summary: `Mesh frequency of "${gear.name}" (${fmt(p.hz)} Hz) with ${sb.length} sidebands at its shaft speed (${fmt(fShaft)} Hz): a gear problem (wear, eccentricity, a damaged tooth) is likely.`,
      evidence: [ev('acceleration', p, `${gear.name} GMF`), ...harmonics, ...sb],
    });
  }
  return hints;
}
