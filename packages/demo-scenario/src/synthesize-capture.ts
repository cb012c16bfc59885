/**
 * One accelerometer capture, synthesised in g and converted to ADC counts the way a
 * gateway's input stage would: tones at orders of a (slightly drifting) shaft speed,
 * bearing-defect impacts ringing a structural resonance, gear mesh with sidebands, fixed
 * frequency tones, bursts, white noise; sensor sensitivity, ADC range and rails.
 * Pure and deterministic: the same recipe and seed give the same counts.
 */
import { gaussian, mulberry32 } from '@turnstone/dsp/seeded-random';

/** Standard gravity, m/s² (3rd CGPM, 1901). */
const G = 9.80665;

/** A tone at an order of the shaft speed, given as velocity (what a vibration analyst reads). */
export interface OrderTone {
  order: number;
  /** Velocity, mm/s RMS. */
  velocityMmS: number;
  /**
   * Where the tone sits on the shaft: velocity phase lag in degrees after the tach mark, in
   * the convention of the dsp's `ShaftVector` (the tone reads v·cos(k·θ − φ), θ the shaft
   * angle from the once-per-revolution mark). A real machine's order tones are locked to the
   * shaft (a heavy spot, a coupling offset), so this is a property of the machine and point,
   * not of the capture. Absent: a random phase (a recipe that does not care).
   */
  phaseLagDeg?: number;
}

/**
 * Impacts repeating at a bearing defect order, each ringing a structural resonance
 * (a decaying sinusoid), so the envelope spectrum shows the repetition frequency.
 */
export interface ImpactTrain {
  /** Repetition rate, orders of the shaft speed (BPFO, BPFI, …). */
  order: number;
  /** Wanted envelope-spectrum line at the repetition rate, g peak. */
  envelopeG: number;
  /** Resonance rung by each impact, Hz. */
  resonanceHz: number;
  /** Damping ratio of that resonance. @default 0.05 */
  damping?: number;
  /** Amplitude modulation at 1× (an inner race passing through the load zone), 0–1. @default 0 */
  modulationDepth?: number;
  /** Random spread of the impact spacing, fraction (rolling elements slip). @default 0.005 */
  jitter?: number;
}

/** A gear mesh: the mesh tone with sidebands spaced at the speeds of the two shafts. */
export interface GearMeshTone {
  /** Mesh frequency, orders of the measured shaft (teeth × shaft ratio). */
  order: number;
  /** Mesh tone, g RMS. */
  meshG: number;
  /** Second mesh harmonic as a fraction of the first. @default 0.3 */
  secondHarmonic?: number;
  /** Sideband families: spacing in orders, first-pair amplitude g RMS, pairs. */
  sidebands?: { spacingOrder: number; g: number; pairs: number }[];
}

/** Ringing bursts of random timing (cavitation, a loose guard), g peak. */
export interface Bursts {
  count: number;
  peakG: number;
  resonanceHz: number;
  damping?: number;
}

export interface AdcSetup {
  encoding: 'int16' | 'int24';
  /** Effective bits; the rails are ±2^(bits−1). */
  bits: number;
  /** Volts at the positive rail. */
  fullScaleV: number;
}

export interface CaptureRecipe {
  sampleRateHz: number;
  sampleCount: number;
  /** Shaft speed at the start of the capture, r/min. */
  rpm: number;
  /** Speed change over the capture, fraction of rpm (a slowly drifting drive). @default 0 */
  speedRamp?: number;
  tones?: OrderTone[];
  impacts?: ImpactTrain[];
  meshes?: GearMeshTone[];
  /** Tones at fixed frequencies (electrical, or content above Nyquist folded down), g RMS. */
  hzTones?: { hz: number; g: number }[];
  bursts?: Bursts;
  /** White noise over 0 … Nyquist, g RMS. */
  noiseG: number;
  sensitivityMvPerG: number;
  adc: AdcSetup;
  /** Emit one tach pulse per revolution. @default false */
  tach?: boolean;
  seed: number;
}

export interface SynthCapture {
  counts: Int16Array | Int32Array;
  encoding: AdcSetup['encoding'];
  adc: { bits: number; fullScaleV: number };
  sampleRateHz: number;
  /** Mean speed over the capture, r/min. */
  rpm: number;
  tach?: { pulseTimesS: number[]; pulsesPerRev: 1 };
  /** Samples that hit a rail (the input was beyond the ADC range). */
  railSamples: number;
}

/**
 * Peak acceleration (g) of a tone of `velocityMmS` RMS at `hz`: a = 2πf·v, peak = √2·RMS
 * (calculus of a sinusoid: v = a/(2πf); sine peak = 1.41421 × RMS).
 */
export function toneAccelPeakG(velocityMmS: number, hz: number): number {
  return (Math.SQRT2 * velocityMmS * 1e-3 * 2 * Math.PI * hz) / G;
}

/**
 * Impact amplitude (g peak) that makes the envelope-spectrum line at the repetition rate
 * `rateHz` read `envelopeG`: the envelope of one ring is A·e^(−t/τ) with τ = 1/(ζ·2π·fn);
 * its Fourier series line at 1/T is 2A·f·τ/√(1 + (2πfτ)²) (rings shorter than the spacing).
 * Source: the Fourier transform of a one-sided exponential (any signals text), computed.
 */
export function impactAmplitudeG(
  envelopeG: number,
  rateHz: number,
  resonanceHz: number,
  damping: number,
): number {
  const tau = 1 / (damping * 2 * Math.PI * resonanceHz);
  const w = 2 * Math.PI * rateHz * tau;
  return (envelopeG * Math.sqrt(1 + w * w)) / (2 * rateHz * tau);
}

/** Builds the capture: acceleration in g → volts → counts, clamped at the rails. */
export function synthesizeCapture(recipe: CaptureRecipe): SynthCapture {
  const { sampleRateHz: fs, sampleCount: n } = recipe;
  if (!(fs > 0) || !Number.isInteger(n) || n < 2)
    throw new RangeError('sample rate and count must be positive');
  const uniform = mulberry32(recipe.seed);
  const normal = gaussian(uniform);
  const f0 = recipe.rpm / 60;
  const durationS = n / fs;
  const ramp = recipe.speedRamp ?? 0;
  // Shaft angle in revolutions: f(t) = f0·(1 + ramp·t/T) → θ(t) = f0·t + ½·f0·ramp·t²/T.
  const a2 = (0.5 * f0 * ramp) / durationS;
  const revs = (t: number) => f0 * t + a2 * t * t;
  const theta0 = uniform();
  const x = new Float64Array(n);
  // A tone at order k has angle k·2π·(θ(t) + θ0), θ quadratic in t: its phasor advances by a
  // rotation that itself rotates at a constant rate (a chirp recurrence, two complex
  // multiplications per sample instead of a sine; rounding drift over 8192 samples < 1e-12).
  const dt = 1 / fs;
  // `phase` is the tone's sine phase at the tach mark (θ = 0, where the shaft has turned a
  // whole number of revolutions since θ0), radians; null draws one.
  const addOrderTone = (order: number, peak: number, phase: number | null = null) => {
    // Drawn even when the phase is given, so a recipe's noise and impacts stay the same.
    const drawn = 2 * Math.PI * uniform();
    const ph = phase ?? drawn;
    const k = 2 * Math.PI * order;
    const start = k * theta0 + ph;
    // θ(t+dt) − θ(t) = f0·dt + a2·(2t·dt + dt²): increment at t = 0 and its constant change.
    const inc0 = k * (f0 * dt + a2 * dt * dt);
    const incStep = k * 2 * a2 * dt * dt;
    let zr = Math.cos(start);
    let zi = Math.sin(start);
    let wr = Math.cos(inc0);
    let wi = Math.sin(inc0);
    const cr = Math.cos(incStep);
    const ci = Math.sin(incStep);
    for (let i = 0; i < n; i++) {
      x[i]! += peak * zi;
      const nzr = zr * wr - zi * wi;
      zi = zr * wi + zi * wr;
      zr = nzr;
      const nwr = wr * cr - wi * ci;
      wi = wr * ci + wi * cr;
      wr = nwr;
    }
  };
  for (const tone of recipe.tones ?? []) {
    // Velocity v·cos(kθ − φ) is acceleration a·cos(kθ − φ + 90°) (a = dv/dt) = a·sin(kθ + π − φ):
    // the sine phase at the mark is π − φ.
    const phase =
      tone.phaseLagDeg === undefined ? null : Math.PI - (tone.phaseLagDeg * Math.PI) / 180;
    addOrderTone(tone.order, toneAccelPeakG(tone.velocityMmS, tone.order * f0), phase);
  }

  for (const mesh of recipe.meshes ?? []) {
    const lines: { order: number; g: number }[] = [{ order: mesh.order, g: mesh.meshG }];
    lines.push({ order: 2 * mesh.order, g: mesh.meshG * (mesh.secondHarmonic ?? 0.3) });
    for (const sb of mesh.sidebands ?? []) {
      for (let p = 1; p <= sb.pairs; p++) {
        const g = sb.g / p;
        lines.push(
          { order: mesh.order - p * sb.spacingOrder, g },
          { order: mesh.order + p * sb.spacingOrder, g },
        );
      }
    }
    for (const line of lines) addOrderTone(line.order, Math.SQRT2 * line.g);
  }

  for (const tone of recipe.hzTones ?? []) {
    const amp = Math.SQRT2 * tone.g;
    const ph = 2 * Math.PI * uniform();
    const w = (2 * Math.PI * tone.hz) / fs;
    for (let i = 0; i < n; i++) x[i]! += amp * Math.sin(w * i + ph);
  }

  for (const train of recipe.impacts ?? []) {
    const damping = train.damping ?? 0.05;
    const rateHz = train.order * f0;
    const amp = impactAmplitudeG(train.envelopeG, rateHz, train.resonanceHz, damping);
    const depth = train.modulationDepth ?? 0;
    const jitter = train.jitter ?? 0.005;
    // Impacts are evenly spaced in shaft angle (they follow the speed), with slip jitter.
    const spacingRev = 1 / train.order;
    let rev = uniform() * spacingRev;
    const totalRevs = revs(durationS);
    while (rev < totalRevs) {
      const t = timeAtRevs(rev, f0, a2);
      const load = 1 + depth * Math.cos(2 * Math.PI * (rev + theta0));
      addRing(x, fs, t, amp * load, train.resonanceHz, damping);
      rev += spacingRev * (1 + jitter * normal());
    }
  }

  if (recipe.bursts) {
    const b = recipe.bursts;
    for (let j = 0; j < b.count; j++) {
      addRing(
        x,
        fs,
        uniform() * durationS,
        b.peakG * (0.8 + 0.4 * uniform()),
        b.resonanceHz,
        b.damping ?? 0.03,
      );
    }
  }

  if (recipe.noiseG > 0) {
    // Box–Muller in pairs (both deviates of each pair used).
    for (let i = 0; i < n; i += 2) {
      const r = recipe.noiseG * Math.sqrt(-2 * Math.log(Math.max(uniform(), 1e-12)));
      const a = 2 * Math.PI * uniform();
      x[i]! += r * Math.cos(a);
      if (i + 1 < n) x[i + 1]! += r * Math.sin(a);
    }
  }

  // g → V → counts; the ADC saturates at its rails.
  const { bits, fullScaleV, encoding } = recipe.adc;
  if (encoding === 'int16' ? bits > 16 : bits > 24)
    throw new RangeError(`${bits} bits do not fit ${encoding}`);
  const half = 2 ** (bits - 1);
  const countsPerG = ((recipe.sensitivityMvPerG / 1000) * half) / fullScaleV;
  const counts = encoding === 'int16' ? new Int16Array(n) : new Int32Array(n);
  let railSamples = 0;
  for (let i = 0; i < n; i++) {
    let c = Math.round(x[i]! * countsPerG);
    if (c >= half - 1) {
      c = half - 1;
      railSamples++;
    } else if (c <= -half) {
      c = -half;
      railSamples++;
    }
    counts[i] = c;
  }

  const out: SynthCapture = {
    counts,
    encoding,
    adc: { bits, fullScaleV },
    sampleRateHz: fs,
    rpm: recipe.rpm * (1 + ramp / 2),
    railSamples,
  };
  if (recipe.tach) {
    const pulseTimesS: number[] = [];
    for (let m = Math.ceil(theta0); ; m++) {
      const t = timeAtRevs(m - theta0, f0, a2);
      if (t >= durationS) break;
      pulseTimesS.push(Math.round(t * 1e7) / 1e7);
    }
    if (pulseTimesS.length >= 2) out.tach = { pulseTimesS, pulsesPerRev: 1 };
  }
  return out;
}

/** Time at which the shaft has turned `r` revolutions: solves f0·t + a2·t² = r. */
function timeAtRevs(r: number, f0: number, a2: number): number {
  if (Math.abs(a2) < 1e-12) return r / f0;
  return (-f0 + Math.sqrt(f0 * f0 + 4 * a2 * r)) / (2 * a2);
}

/** Adds a decaying sinusoid A·e^(−ζωt)·sin(ωd·t) starting at t0, for about 8 time constants. */
function addRing(
  x: Float64Array,
  fs: number,
  t0: number,
  amp: number,
  fnHz: number,
  damping: number,
): void {
  const wn = 2 * Math.PI * fnHz;
  const wd = wn * Math.sqrt(1 - damping * damping);
  const decay = damping * wn;
  const start = Math.ceil(t0 * fs);
  const end = Math.min(x.length, start + Math.ceil((8 / decay) * fs));
  for (let i = Math.max(0, start); i < end; i++) {
    const t = i / fs - t0;
    x[i]! += amp * Math.exp(-decay * t) * Math.sin(wd * t);
  }
}
