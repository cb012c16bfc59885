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
 */
import {
  bearingOrders,
  getWindow,
  type BearingGeometry,
  type GearMesh,
  type SnapshotAnalysis,
} from '@turnstone/dsp';

/** Hint codes (trade terms). */
export type DiagnosisCode =
  | 'unbalance'
  | 'misalignment'
  | 'looseness'
  | 'bearing-outer-race'
  | 'bearing-inner-race'
  | 'bearing-rolling-element'
  | 'bearing-cage'
  | 'gear-mesh'
  | 'blade-pass'
  | 'electrical'
  | 'belt';

/** Which stored spectrum a piece of evidence was read from. */
export type EvidenceSpectrum = 'velocity' | 'acceleration' | 'envelope';

/** One peak that supports a hint. */
export interface DiagnosisEvidence {
  /** Frequency of the peak, Hz (interpolated between lines). */
  hz: number;
  /** The same in orders of the running speed. */
  order: number;
  /** Amplitude in the spectrum's unit and scale: mm/s RMS (velocity), g RMS (acceleration), g peak (envelope). */
  amplitude: number;
  /** What the peak is: "1×", "2×", "0.5×", "DE BPFO ×2", "GMF+1×", "2 × line". */
  label: string;
  spectrum: EvidenceSpectrum;
}

/** One hint. */
export interface DiagnosisHint {
  code: DiagnosisCode;
  /** A heuristic score in [0, 1] for ordering hints, not a probability. */
  confidence: number;
  summary: string;
  evidence: DiagnosisEvidence[];
}

/** A belt drive on the measured shaft. */
export interface BeltDrive {
  name: string;
  /** Pitch diameter of the pulley on the measured shaft, mm. */
  pulleyDiameterMm: number;
  /** Belt pitch length, mm. */
  lengthMm: number;
}

/** The machine's parts that make known frequencies. */
export interface DiagnosisComponents {
  bearings?: BearingGeometry[];
  gears?: GearMesh[];
  blades?: number;
  belts?: BeltDrive[];
  /** Electrical supply frequency of a motor on the shaft, Hz. */
  lineHz?: number;
}

/** What a diagnosis reads. */
export interface DiagnosisInput {
  analysis: Pick<SnapshotAnalysis, 'overall' | 'speed' | 'spectra'>;
  /** Measurement direction of the point; axial points are read for misalignment, not unbalance. */
  direction?: 'H' | 'V' | 'A' | null;
  components?: DiagnosisComponents;
  /**
   * Overall velocity (mm/s RMS, the analysis' ISO band) from which velocity-spectrum hints
   * count: the CLI passes the ISO 20816-3 zone A/B boundary of the machine's group; the
   * server a point's own alert level.
   */
  severityMmS: number;
  /** Where {@link severityMmS} comes from, for the notes ("ISO 20816-3 A/B, group 2 rigid"). */
  severitySource?: string;
}

/** Hints (highest confidence first) and notes on what could not be told. */
export interface DiagnosisResult {
  diagnosis: DiagnosisHint[];
  notes: string[];
}

// ---------------------------------------------------------------- thresholds

/**
 * A peak counts only when its line stands this far above the median of the lines around it
 * (12 dB). For one unaveraged line of Gaussian noise the chance of exceeding 4 × the median
 * is exp(−(4 · 1.177)²/2) ≈ 1.5·10⁻⁵ (Rayleigh amplitude); Welch-averaged lines scatter less.
 * Common practice (peaks 10–15 dB above the floor), no source.
 */
export const NOISE_FLOOR_RATIO = 4;
/** Lines each side over which the local noise floor is taken. Common practice, no source. */
export const NOISE_FLOOR_HALF_WIDTH_LINES = 60;
/**
 * The local floor is the lower quartile of the lines around a peak, scaled to a median
 * (× 1.55, the median/quartile ratio of a Rayleigh-distributed noise line: √(ln 2 / ln(4/3))),
 * so a long series of harmonics filling up to three quarters of the window does not lift it.
 * Source: the Rayleigh distribution's quantiles (definition); Welch-averaged lines scatter
 * less, which makes this floor slightly high (a conservative error).
 */
export const NOISE_FLOOR_QUARTILE_TO_MEDIAN = Math.sqrt(Math.LN2 / Math.log(4 / 3));
/** Lines each side of a peak left out of its own noise floor (Hann main lobe ±2 lines, plus one). */
export const NOISE_FLOOR_GAP_LINES = 3;
/**
 * Search half-width around the nominal 1× when the speed was given or estimated, fraction of
 * 1× (an induction motor's slip moves 1× by up to ~1–3 % from a nameplate or typed speed).
 * With a tach the speed is measured and only {@link LINE_TOLERANCE} applies. Common practice, no source.
 */
export const SPEED_TOLERANCE = 0.02;
/** Search half-width, in lines, around every expected frequency (interpolation and leakage). */
export const LINE_TOLERANCE = 1.5;
/** Search half-width around harmonics of the located 1×, fraction of the frequency. */
export const HARMONIC_TOLERANCE = 0.003;
/**
 * Bearings run 1–2 % below their kinematic frequencies (rolling elements slip): envelope lines
 * are searched from 2.5 % below to 0.5 % above each harmonic. Source: Randall & Antoni 2011,
 * MSSP 25:485–520, §2.1 (slip 1–2 %).
 */
export const BEARING_SLIP_BELOW = 0.025;
/** See {@link BEARING_SLIP_BELOW}. */
export const BEARING_SLIP_ABOVE = 0.005;
/** Harmonics of each defect frequency read in the envelope spectrum. */
export const BEARING_HARMONICS = 4;
/** A bearing hint needs this many of its harmonics (including the fundamental, or 2 × BSF for balls). Common practice, no source. */
export const BEARING_MIN_LINES = 2;
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
/**
 * A cage (FTF) series has harmonics at every multiple of FTF, and BPFO = n · FTF: another
 * defect family whose lines all sit on FTF multiples is kept only when its lines are at least
 * this many times the strongest cage line. Common practice, no source.
 */
export const CAGE_FAMILY_DOMINANCE = 2;
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

// ---------------------------------------------------------------- spectrum reading

interface Lines {
  values: ArrayLike<number>;
  dfHz: number;
  enbwBins: number;
  /** Lines below this index are not read (zeroed below the velocity cut-off, envelope mean). */
  firstLine: number;
}

interface Peak {
  hz: number;
  /** Tone amplitude: √(Σ of the main lobe's line powers / ENBW). */
  amplitude: number;
  /** Local noise floor per line (median-equivalent), in the spectrum's unit. */
  floor: number;
  /** The peak line clears {@link NOISE_FLOOR_RATIO} × the floor. */
  present: boolean;
}

/** Median-equivalent floor: the lower quartile × {@link NOISE_FLOOR_QUARTILE_TO_MEDIAN}. */
function noiseFloor(values: number[]): number {
  if (values.length === 0) return 0;
  values.sort((a, b) => a - b);
  return values[Math.floor(values.length / 4)]! * NOISE_FLOOR_QUARTILE_TO_MEDIAN;
}

/** The largest local maximum within ±tolHz of hz, or null when the window holds none. */
function readPeak(s: Lines, hz: number, tolHz: number): Peak | null {
  const v = s.values;
  const len = v.length;
  const lo = Math.max(s.firstLine + 1, Math.ceil((hz - tolHz) / s.dfHz));
  const hi = Math.min(len - 2, Math.floor((hz + tolHz) / s.dfHz));
  let best = -1;
  for (let k = lo; k <= hi; k++) {
    const x = v[k]!;
    if (x >= v[k - 1]! && x >= v[k + 1]! && (best < 0 || x > v[best]!)) best = k;
  }
  if (best < 0) return null;
  const a = v[best - 1]!;
  const b = v[best]!;
  const c = v[best + 1]!;
  const denom = a - 2 * b + c;
  const delta = denom < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / denom)) : 0;
  let power = 0;
  for (let k = Math.max(s.firstLine, best - 2); k <= Math.min(len - 1, best + 2); k++) {
    power += v[k]! * v[k]!;
  }
  const around: number[] = [];
  const from = Math.max(s.firstLine, best - NOISE_FLOOR_HALF_WIDTH_LINES);
  const to = Math.min(len - 1, best + NOISE_FLOOR_HALF_WIDTH_LINES);
  for (let k = from; k <= to; k++) {
    if (Math.abs(k - best) > NOISE_FLOOR_GAP_LINES) around.push(v[k]!);
  }
  const floor = noiseFloor(around);
  return {
    hz: (best + delta) * s.dfHz,
    amplitude: Math.sqrt(power / s.enbwBins),
    floor,
    present: b > NOISE_FLOOR_RATIO * floor && b > 0,
  };
}

function clamp01(x: number): number {
  return Math.max(0, Math.min(1, x));
}

function fmt(x: number, digits = 3): string {
  return Number(x.toPrecision(digits)).toString();
}

function orderLabel(k: number): string {
  return `${fmt(k, 3)}×`;
}

// ---------------------------------------------------------------- diagnosis

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
  const ev = (s: EvidenceSpectrum, p: Peak, label: string): DiagnosisEvidence => ({
    hz: p.hz,
    order: p.hz / f1,
    amplitude: p.amplitude,
    label,
    spectrum: s,
  });
  const at = (s: Lines, hz: number, tolFraction = HARMONIC_TOLERANCE): Peak | null =>
    readPeak(s, hz, tolFraction * hz + LINE_TOLERANCE * s.dfHz);
  const amp = (p: Peak | null): number => (p?.present ? p.amplitude : 0);

  // ---- shaft family (velocity)
  if (severe) {
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
    const axial = input.direction === 'A';
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
        summary: `1× dominant (${fmt(a1)} mm/s, ${fmt(100 * share1 ** 2, 2)} % of the energy) with little harmonic content${input.direction ? ` in ${input.direction}` : ''}: unbalance is likely; check the 1× phase and the axial level.`,
        evidence: [ev('velocity', h[1]!, '1×'), ...(a2 > 0 ? [ev('velocity', h[2]!, '2×')] : [])],
      });
    }
    const radialMis =
      !axial &&
      a1 > 0 &&
      a2 >= MISALIGNMENT_2X_RATIO * a1 &&
      a2 >= MISALIGNMENT_2X_OVER_SERIES * maxMid;
    const axialMis = axial && Math.hypot(a1, a2) >= MISALIGNMENT_AXIAL_SHARE * overall;
    const lineHz = components.lineHz;
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

    // ---- blade pass
    const blades = components.blades;
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

    // ---- electrical: 2 × line frequency, resolved from the shaft harmonics
    if (components.lineHz !== undefined) {
      const f2l = 2 * components.lineHz;
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

    // ---- belts: read from the acceleration spectrum turned into velocity (v = a / 2πf), since
    // belt frequencies often fall below the velocity spectrum's ISO cut-off (10 Hz).
    const beltLines: Lines | null =
      (components.belts ?? []).length === 0
        ? null
        : {
            values: Float64Array.from(acc.values, (a, k) =>
              k === 0 ? 0 : (a * STANDARD_GRAVITY * 1000) / (2 * Math.PI * k * acc.dfHz),
            ),
            dfHz: acc.dfHz,
            enbwBins: acc.enbwBins,
            firstLine: 1,
          };
    for (const belt of components.belts ?? []) {
      if (!(belt.pulleyDiameterMm > 0) || !(belt.lengthMm > belt.pulleyDiameterMm)) {
        throw new RangeError(
          `belt "${belt.name}": give a pulley diameter and a longer belt length`,
        );
      }
      const fb = (f1 * Math.PI * belt.pulleyDiameterMm) / belt.lengthMm;
      const found = [1, 2, 3, 4]
        .map((k) => ({ k, p: at(beltLines!, k * fb, 0.01) }))
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
  }

  // ---- bearings (envelope)
  const envelope = analysis.spectra.envelope;
  if ((components.bearings ?? []).length > 0 && envelope === null) {
    notes.push('No envelope spectrum (record too short): no bearing hints.');
  }
  if (envelope !== null) {
    const env: Lines = {
      values: envelope.values,
      dfHz: envelope.dfHz,
      enbwBins: getWindow(envelope.window, 64).enbwBins,
      firstLine: 1,
    };
    const bearingHints: {
      bearing: string;
      lineHz: number[];
      strongest: number;
      hint: DiagnosisHint;
    }[] = [];
    for (const bearing of components.bearings ?? []) {
      const o = bearingOrders(bearing);
      const ratio = bearing.speedRatio ?? 1;
      const kinds: { code: DiagnosisCode; name: string; order: number; what: string }[] = [
        { code: 'bearing-outer-race', name: 'BPFO', order: o.bpfo, what: 'outer race' },
        { code: 'bearing-inner-race', name: 'BPFI', order: o.bpfi, what: 'inner race' },
        { code: 'bearing-rolling-element', name: 'BSF', order: o.bsf, what: 'rolling element' },
        { code: 'bearing-cage', name: 'FTF', order: o.ftf, what: 'cage' },
      ];
      for (const kind of kinds) {
        const f = kind.order * ratio * f1;
        const lines: { k: number; p: Peak }[] = [];
        for (let k = 1; k <= BEARING_HARMONICS; k++) {
          const centre = k * f * (1 - (BEARING_SLIP_BELOW - BEARING_SLIP_ABOVE) / 2);
          const tol =
            (k * f * (BEARING_SLIP_BELOW + BEARING_SLIP_ABOVE)) / 2 + LINE_TOLERANCE * env.dfHz;
          if (centre + tol > (env.values.length - 2) * env.dfHz) break;
          const p = readPeak(env, centre, tol);
          if (p?.present) lines.push({ k, p });
        }
        const key = kind.name === 'BSF' ? [1, 2] : [1];
        if (lines.length < BEARING_MIN_LINES || !lines.some((l) => key.includes(l.k))) continue;
        const evidence = lines.map((l) =>
          ev('envelope', l.p, `${bearing.name} ${kind.name}${l.k > 1 ? ` ×${l.k}` : ''}`),
        );
        let sidebands = 0;
        if (kind.name === 'BPFI') {
          for (const l of lines.slice(0, 2)) {
            for (const sign of [-1, 1]) {
              const p = readPeak(env, l.p.hz + sign * f1 * ratio, LINE_TOLERANCE * env.dfHz);
              if (p?.present) {
                sidebands++;
                evidence.push(
                  ev(
                    'envelope',
                    p,
                    `${bearing.name} BPFI${l.k > 1 ? ` ×${l.k}` : ''}${sign < 0 ? '−' : '+'}1×`,
                  ),
                );
              }
            }
          }
        }
        // Stage: envelope only (early) or also in the acceleration spectrum (later).
        let inSpectrum = 0;
        for (const l of lines) {
          const p = readPeak(acceleration, l.p.hz, LINE_TOLERANCE * acceleration.dfHz);
          const onShaft =
            p !== null &&
            Math.abs(p.hz / f1 - Math.round(p.hz / f1)) * f1 < LINE_TOLERANCE * acceleration.dfHz &&
            Math.round(p.hz / f1) <= 10;
          if (p?.present && !onShaft) {
            inSpectrum++;
            evidence.push(
              ev(
                'acceleration',
                p,
                `${bearing.name} ${kind.name}${l.k > 1 ? ` ×${l.k}` : ''} (spectrum)`,
              ),
            );
          }
        }
        const stage =
          inSpectrum > 0
            ? 'also visible in the acceleration spectrum (a later stage)'
            : 'seen in the envelope spectrum only (an early stage)';
        bearingHints.push({
          bearing: bearing.name,
          lineHz: lines.map((l) => l.p.hz),
          strongest: Math.max(...lines.map((l) => l.p.amplitude)),
          hint: {
            code: kind.code,
            confidence: clamp01(
              0.35 +
                (0.5 * lines.length) / BEARING_HARMONICS +
                0.05 * sidebands +
                (inSpectrum > 0 ? 0.1 : 0),
            ),
            summary: `${lines.length} envelope lines at ${bearing.name} ${kind.name} (${fmt(f)} Hz) and harmonics${sidebands ? ` with ${sidebands} 1× sidebands` : ''}: a ${kind.what} defect is likely, ${stage}.`,
            evidence,
          },
        });
      }
      // A cage series covers every FTF multiple (BPFO = n · FTF): drop families that only echo it.
      const cage = bearingHints.find(
        (b) => b.bearing === bearing.name && b.hint.code === 'bearing-cage',
      );
      for (const b of bearingHints) {
        if (b.bearing !== bearing.name || b === cage) continue;
        const echo =
          cage !== undefined &&
          b.strongest < CAGE_FAMILY_DOMINANCE * cage.strongest &&
          b.lineHz.every((hz) => {
            const ftf = cage.lineHz[0]!; // the cage series always holds its fundamental
            const m = Math.round(hz / ftf);
            return (
              m >= 1 &&
              Math.abs(hz - m * ftf) <=
                (BEARING_SLIP_BELOW + BEARING_SLIP_ABOVE) * hz + LINE_TOLERANCE * env.dfHz
            );
          });
        if (!echo) hints.push(b.hint);
      }
      if (cage) hints.push(cage.hint);
      bearingHints.length = 0;
    }
  }

  // ---- gears (acceleration)
  for (const gear of components.gears ?? []) {
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

  hints.sort((a, b) => b.confidence - a.confidence);
  return { diagnosis: hints, notes };
}
