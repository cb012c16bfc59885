/**
 * Synthetic captures built from definitions for the diagnosis tests and bench: tones at
 * shaft orders given as velocity (a = 2πf·v, peak = √2·RMS), fixed-frequency tones, damped
 * sine bursts (bearing impacts exciting a resonance), amplitude-modulated gear mesh tones
 * and Gaussian noise — never from Turnstone's own output.
 */
import type { SnapshotInput, TachPulses } from '@turnstone/dsp';
import { mulberry32 } from '@turnstone/dsp/seeded-random';

/** Standard gravity, m/s² (ISO 80000-3). */
const G = 9.80665;

export interface OrderToneSpec {
  order: number;
  /** Velocity, mm/s RMS. */
  mmS: number;
  phaseDeg?: number;
}

export interface ImpactSpec {
  /** Repetition rate, Hz. */
  rateHz: number;
  /** Peak acceleration of each ring, g. */
  g: number;
  resonanceHz: number;
  /** Damping ratio ζ. */
  damping: number;
  /** Amplitude factor of every other impact (a ball striking outer, then inner race). @default 1 */
  alternate?: number;
  /** Amplitude modulation: depth m at modHz (inner race through the load zone). */
  modHz?: number;
  modDepth?: number;
  /** Random spacing jitter, fraction of the period (slip). @default 0.005 */
  jitter?: number;
}

export interface MeshSpec {
  hz: number;
  /** Peak acceleration of the mesh tone, g. */
  g: number;
  /** Amplitude modulation at the gear's shaft speed: 1 + depth·cos(2π modHz t). */
  modHz: number;
  depth: number;
}

export interface CaptureSpec {
  rpm: number;
  fs?: number;
  n?: number;
  orders?: OrderToneSpec[];
  /** Fixed-frequency tones given as velocity, mm/s RMS (electrical, belts). */
  hzTones?: { hz: number; mmS: number }[];
  impacts?: ImpactSpec[];
  meshes?: MeshSpec[];
  /** White Gaussian noise, g RMS. */
  noiseG: number;
  seed: number;
}

/** Acceleration peak (g) of a tone of `mmS` RMS velocity at `hz`. */
export function accelPeakG(mmS: number, hz: number): number {
  return (Math.SQRT2 * mmS * 1e-3 * 2 * Math.PI * hz) / G;
}

/** The capture as float samples in volts (100 mV/g) with its speed and a tach (one pulse a turn). */
export function synthCapture(spec: CaptureSpec): { input: SnapshotInput; tach: TachPulses } {
  const fs = spec.fs ?? 25600;
  const n = spec.n ?? 65536;
  const f1 = spec.rpm / 60;
  const rand = mulberry32(spec.seed);
  const x = new Float64Array(n);
  // Gaussian noise (Box–Muller)
  for (let i = 0; i < n; i += 2) {
    const u = Math.max(rand(), 1e-12);
    const v = rand();
    const r = spec.noiseG * Math.sqrt(-2 * Math.log(u));
    x[i] = r * Math.cos(2 * Math.PI * v);
    if (i + 1 < n) x[i + 1] = r * Math.sin(2 * Math.PI * v);
  }
  for (const t of spec.orders ?? []) {
    const hz = t.order * f1;
    const a = accelPeakG(t.mmS, hz);
    const ph = ((t.phaseDeg ?? 0) * Math.PI) / 180;
    for (let i = 0; i < n; i++) x[i]! += a * Math.cos((2 * Math.PI * hz * i) / fs - ph);
  }
  for (const t of spec.hzTones ?? []) {
    const a = accelPeakG(t.mmS, t.hz);
    for (let i = 0; i < n; i++) x[i]! += a * Math.sin((2 * Math.PI * t.hz * i) / fs + 0.3);
  }
  for (const m of spec.meshes ?? []) {
    for (let i = 0; i < n; i++) {
      const t = i / fs;
      x[i]! +=
        m.g *
        (1 + m.depth * Math.cos(2 * Math.PI * m.modHz * t)) *
        Math.sin(2 * Math.PI * m.hz * t);
    }
  }
  for (const imp of spec.impacts ?? []) {
    const wn = 2 * Math.PI * imp.resonanceHz;
    const decay = imp.damping * wn;
    const wd = wn * Math.sqrt(1 - imp.damping ** 2);
    const ringS = 8 / decay;
    const period = 1 / imp.rateHz;
    const jitter = imp.jitter ?? 0.005;
    let j = 0;
    for (let t0 = period * rand(); t0 < n / fs; t0 += period * (1 + jitter * (2 * rand() - 1))) {
      let a = imp.g * (j % 2 === 1 ? (imp.alternate ?? 1) : 1);
      if (imp.modHz !== undefined)
        a *= 1 + (imp.modDepth ?? 0) * Math.cos(2 * Math.PI * imp.modHz * t0);
      j++;
      const i0 = Math.ceil(t0 * fs);
      const i1 = Math.min(n, Math.ceil((t0 + ringS) * fs));
      for (let i = i0; i < i1; i++) {
        const dt = i / fs - t0;
        x[i]! += a * Math.exp(-decay * dt) * Math.sin(wd * dt);
      }
    }
  }
  const sensitivityV = 0.1; // 100 mV/g
  for (let i = 0; i < n; i++) x[i]! *= sensitivityV;
  const pulses: number[] = [];
  for (let t = 0; t < n / fs; t += 1 / f1) pulses.push(t);
  return {
    input: {
      samples: x,
      encoding: 'float32',
      sampleRateHz: fs,
      adc: { bits: 24, fullScaleV: 10 },
      sensor: { sensitivityMvPerG: 100 },
      speedRpm: spec.rpm,
    },
    tach: { pulseTimesS: pulses, pulsesPerRev: 1 },
  };
}
