/**
 * Diagnosis hints: likely causes of a capture's vibration, each with the spectral peaks that
 * support it. Hints, never verdicts — the rules are the well-known spectral patterns of
 * vibration analysis (common practice, no single source; see each constant), and they name
 * only what the stored spectra can show.
 *
 * Every hint needs its evidence above a stated noise floor ({@link NOISE_FLOOR_RATIO} × the
 * local median line) *and* a level that matters: hints read from the velocity spectrum need
 * the overall velocity at or above the caller's severity (the CLI passes the ISO 20816-3 zone
 * A/B boundary) — every healthy machine has a dominant 1×, so 1× alone says nothing; bearing
 * hints need envelope lines at the defect frequency and a harmonic; gear hints need sidebands
 * of a stated share around the mesh.
 *
 * This file locates 1× and runs the rules in order; the rules and their thresholds live
 * beside it: diagnosis-shaft.ts (unbalance, misalignment, looseness), diagnosis-bearings.ts,
 * diagnosis-components.ts (blade pass, electrical, belts, gears), peak reading and the noise
 * floor in diagnosis-peaks.ts, the shapes in diagnosis-types.ts.
 */
import { bearingHints } from './diagnosis-bearings.ts';
import { beltHints, bladePassHints, electricalHints, gearHints } from './diagnosis-components.ts';
import {
  fmt,
  HARMONIC_TOLERANCE,
  LINE_TOLERANCE,
  readPeak,
  type DiagnosisContext,
  type Lines,
  type Peak,
} from './diagnosis-peaks.ts';
import { shaftHints } from './diagnosis-shaft.ts';
import type {
  DiagnosisEvidence,
  DiagnosisHint,
  DiagnosisInput,
  DiagnosisResult,
  EvidenceSpectrum,
} from './diagnosis-types.ts';

export type * from './diagnosis-types.ts';
export {
  HARMONIC_TOLERANCE,
  LINE_TOLERANCE,
  NOISE_FLOOR_GAP_LINES,
  NOISE_FLOOR_HALF_WIDTH_LINES,
  NOISE_FLOOR_QUARTILE_TO_MEDIAN,
  NOISE_FLOOR_RATIO,
} from './diagnosis-peaks.ts';
export {
  LOOSENESS_HALF_ORDER_MIN_RATIO,
  LOOSENESS_HARMONIC_MIN_RATIO,
  LOOSENESS_MIN_HALF_ORDERS,
  LOOSENESS_MIN_HARMONICS,
  MISALIGNMENT_2X_OVER_SERIES,
  MISALIGNMENT_2X_RATIO,
  MISALIGNMENT_AXIAL_SHARE,
  UNBALANCE_MAX_HARMONIC_RATIO,
  UNBALANCE_MIN_1X_SHARE,
} from './diagnosis-shaft.ts';
export {
  BEARING_HARMONICS,
  BEARING_MIN_LINES,
  BEARING_SLIP_ABOVE,
  BEARING_SLIP_BELOW,
  CAGE_FAMILY_DOMINANCE,
} from './diagnosis-bearings.ts';
export {
  BELT_MIN_LINES,
  BELT_MIN_SHARE,
  BLADE_PASS_MIN_SHARE,
  ELECTRICAL_CHECK_HARMONICS,
  ELECTRICAL_MIN_SHARE,
  ELECTRICAL_RESOLVE_LINES,
  GEAR_MIN_SIDEBANDS,
  GEAR_SIDEBAND_MIN_RATIO,
} from './diagnosis-components.ts';

/**
 * Search half-width around the nominal 1× when the speed was given or estimated, fraction of
 * 1× (an induction motor's slip moves 1× by up to ~1–3 % from a nameplate or typed speed).
 * With a tach the speed is measured and only {@link LINE_TOLERANCE} applies. Common practice, no source.
 */
export const SPEED_TOLERANCE = 0.02;

/**
 * Diagnosis hints for one analysed capture: unbalance, misalignment, looseness (velocity
 * spectrum, shaft harmonics); bearing outer race, inner race, rolling element, cage
 * (envelope spectrum at BPFO, BPFI, 2 × BSF, FTF and harmonics, with slip); gear mesh (mesh
 * frequency with sidebands at either gear's shaft speed, acceleration spectrum); blade pass,
 * electrical (2 × line frequency, only when resolved from the shaft harmonics) and belt
 * (velocity spectrum). Highest confidence first; nothing for a healthy capture.
 *
 * Patterns: common practice of vibration analysis (no single source); bearing frequencies
 * and slip from Randall & Antoni 2011 (MSSP 25:485–520).
 */
export function diagnose(input: DiagnosisInput): DiagnosisResult {
  const { analysis } = input;
  const notes: string[] = [];
  const hints: DiagnosisHint[] = [];
  if (!(input.severityMmS > 0) || !Number.isFinite(input.severityMmS)) {
    throw new RangeError(`severityMmS must be a positive number, got ${input.severityMmS}`);
  }
  const nominalHz = analysis.speed.hz;
  if (nominalHz === null || !(nominalHz > 0)) {
    notes.push('No running speed: no diagnosis (give the speed or a tach).');
    return { diagnosis: [], notes };
  }
  const components = input.components ?? {};
  const acc = analysis.spectra.acceleration;
  const vel = analysis.spectra.velocity;
  const velocity: Lines = {
    values: vel.values,
    dfHz: vel.dfHz,
    enbwBins: acc.enbwBins,
    firstLine: Math.ceil(vel.lowCutoffHz / vel.dfHz),
  };
  const acceleration: Lines = {
    values: acc.values,
    dfHz: acc.dfHz,
    enbwBins: acc.enbwBins,
    firstLine: 1,
  };
  const df = vel.dfHz;
  const overall = analysis.overall.velocityRmsMmS;
  const severe = overall >= input.severityMmS;
  const severityText = `${fmt(input.severityMmS)} mm/s${input.severitySource ? ` (${input.severitySource})` : ''}`;
  if (!severe) {
    notes.push(
      `Overall velocity ${fmt(overall)} mm/s is below ${severityText}: no hints from the velocity spectrum.`,
    );
  }

  // Locate 1× near the known speed (refines a typed or estimated speed).
  const speedTol = analysis.speed.source === 'tach' ? 0 : SPEED_TOLERANCE * nominalHz;
  const p1 = readPeak(velocity, nominalHz, speedTol + LINE_TOLERANCE * df);
  const f1 = p1?.present ? p1.hz : nominalHz;
  const ctx: DiagnosisContext = {
    velocity,
    acceleration,
    p1,
    f1,
    df,
    overall,
    ev: (s: EvidenceSpectrum, p: Peak, label: string): DiagnosisEvidence => ({
      hz: p.hz,
      order: p.hz / f1,
      amplitude: p.amplitude,
      label,
      spectrum: s,
    }),
    at: (s: Lines, hz: number, tolFraction = HARMONIC_TOLERANCE): Peak | null =>
      readPeak(s, hz, tolFraction * hz + LINE_TOLERANCE * s.dfHz),
  };

  // Velocity-spectrum hints only when the overall velocity matters.
  if (severe) {
    hints.push(
      ...shaftHints(ctx, input.direction, components.lineHz),
      ...bladePassHints(ctx, components.blades),
      ...electricalHints(ctx, components.lineHz, notes),
      ...beltHints(ctx, components.belts ?? []),
    );
  }
  hints.push(
    ...bearingHints(ctx, analysis.spectra.envelope, components.bearings ?? [], notes),
    ...gearHints(ctx, components.gears ?? []),
  );

  hints.sort((a, b) => b.confidence - a.confidence);
  return { diagnosis: hints, notes };
}
