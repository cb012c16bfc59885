/**
 * What each machine's story (demo-plant.ts) puts into a capture at a given moment of
 * its history: the levels of 1×, 2×, bearing impacts, gear mesh, noise and the channel's
 * measurement fault, as a {@link CaptureRecipe}. `progress` runs 0 → 1 over the history
 * (the seed's weeks, ending now); the stories are written in it so a short history tells
 * the same story faster. Levels are ours (demo only), chosen against the template limits
 * of @turnstone/condition (ISO 20816-3 zones, from memory) so the alerts fall where the
 * story says.
 */
import type { DemoMachine } from './demo-plant.ts';
import type { SimChannel } from './plant-channels.ts';
import { fnv1a, gaussian, mulberry32 } from '@turnstone/dsp/seeded-random';
import type { CaptureRecipe, GearMeshTone, ImpactTrain, OrderTone } from './synthesize-capture.ts';

/** When the misalignment of B-301 is corrected (laser alignment), as progress. */
export const REALIGNED_AT = 0.55;
/** Progress at which P-101's outer-race envelope reaches alert (0.2 g) and danger (0.5 g). */
export const P101_ALERT_AT = 0.72;
export const P101_DANGER_AT = 1.3;

export interface StoryMoment {
  /** 0 at the start of the history, 1 now; above 1 continues the story. */
  progress: number;
  /** Capture time, epoch ms (slow speed drift follows it). */
  takenAtMs: number;
  /** Seed of this capture's randomness. */
  seed: number;
  /** Simulate the channel's measurement fault. @default true */
  faults?: boolean;
}

const BASE_1X: Record<DemoMachine['type'], number> = {
  pump: 0.9,
  motor: 1.0,
  fan: 1.3,
  blower: 1.2,
  gearbox: 0.7,
  compressor: 1.1,
};
const NOISE_G: Record<DemoMachine['type'], number> = {
  pump: 0.03,
  motor: 0.025,
  fan: 0.02,
  blower: 0.035,
  gearbox: 0.05,
  compressor: 0.06,
};
/** 1× seen in each direction relative to horizontal (stiffer vertically, less axially). */
const DIRECTION_1X = { H: 1, V: 0.8, A: 0.5 } as const;

/** How strongly a point sees a defect of the bearing under `faultyPoint`s. */
function bearingWeight(c: SimChannel, location: string): number {
  if (c.point.location === location) return c.point.direction === 'V' ? 0.85 : 1;
  return c.point.location.startsWith('Motor') ? 0.2 : 0.12;
}

const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));

/**
 * Where the unbalance force that builds up on P-201's impeller (deposits, wear) sits relative
 * to the rotor's residual unbalance, degrees of shaft angle: the measured 1× is the sum of the
 * two vectors, so its phase moves slowly from the residual's towards the build-up's as the
 * build-up grows (by about 25° over the story) — ours, demo only.
 */
const BUILD_UP_ANGLE_DEG = 30;
/**
 * Capture-to-capture scatter of the order tones' phase, degrees (1σ): load and temperature
 * move the response a little. A few degrees is what a steady machine shows from one capture
 * to the next (common practice, no source).
 */
const PHASE_SCATTER_DEG = 1.5;

const wrap360 = (deg: number) => ((deg % 360) + 360) % 360;

/**
 * The fixed angles of one channel, degrees: the rotor's residual unbalance (per machine) and
 * the structure's response lag from force to this sensor at k× (per point and order). Stable
 * hashes of the names, so every capture of a point sees the same shaft.
 */
function shaftAngles(c: SimChannel) {
  return {
    residualDeg: fnv1a(`${c.machine.code}/residual`) % 360,
    responseDeg: (order: number) => fnv1a(`${c.tag}/${order}x`) % 360,
  };
}

/** Magnitude and angle (degrees) of the sum of two vectors given as magnitude and angle. */
function addVectors(a: number, aDeg: number, b: number, bDeg: number) {
  const re = a * Math.cos((aDeg * Math.PI) / 180) + b * Math.cos((bDeg * Math.PI) / 180);
  const im = a * Math.sin((aDeg * Math.PI) / 180) + b * Math.sin((bDeg * Math.PI) / 180);
  return { magnitude: Math.hypot(re, im), deg: (Math.atan2(im, re) * 180) / Math.PI };
}

/** The recipe of one capture of `c` at `m`. */
export function storyRecipe(c: SimChannel, m: StoryMoment): CaptureRecipe {
  const uniform = mulberry32(m.seed ^ 0x9e3779b9);
  const normal = gaussian(uniform);
  const u = clamp(m.progress, 0, 1.5);
  const mach = c.machine;
  const story = mach.story;
  const jitter = (spread: number) => Math.max(0.2, 1 + spread * normal());
  const day = m.takenAtMs / 86_400_000;
  // Slow speed drift (load and supply), a weekly swing of ±0.4 % plus a little scatter.
  const drift = 0.004 * Math.sin((2 * Math.PI * day) / 7.3 + c.pointIndex) + 0.0015 * normal();
  const rpm = mach.nominalRpm * (0.995 + drift);

  const dir = DIRECTION_1X[c.point.direction];
  let v1 = BASE_1X[mach.type] * dir * (1 + 0.08 * Math.sin(c.pointIndex * 2.1));
  let v2 = 0.35 * (c.point.direction === 'A' ? 1.4 : 1);
  let v3 = 0.15;
  let noiseG = NOISE_G[mach.type];
  const impacts: ImpactTrain[] = [];
  const meshes: GearMeshTone[] = [];
  const hzTones: { hz: number; g: number }[] = [];
  let bursts: CaptureRecipe['bursts'];
  /** How far the 1× force has turned from the residual unbalance, degrees. */
  let unbalanceShiftDeg = 0;

  switch (story) {
    case 'outer-race-growing': {
      // Exponential growth through alert at P101_ALERT_AT towards danger at P101_DANGER_AT.
      const k = Math.log(0.48 / 0.18) / (P101_DANGER_AT - P101_ALERT_AT);
      const env = 0.02 + 0.18 * Math.exp(k * (u - P101_ALERT_AT));
      if (c.bearingOrders)
        impacts.push({
          order: c.bearingOrders.bpfo * 0.99, // 1 % slip (Randall & Antoni 2011)
          envelopeG: env * bearingWeight(c, 'Motor DE') * jitter(0.05),
          resonanceHz: c.resonanceHz,
        });
      noiseG *= 1 + 0.5 * u;
      break;
    }
    case 'inner-race-early': {
      const env = 0.015 + 0.2 * Math.exp(3.5 * (u - 0.95));
      if (c.bearingOrders)
        impacts.push({
          order: c.bearingOrders.bpfi * 0.99,
          envelopeG: env * bearingWeight(c, 'Motor DE') * jitter(0.05),
          resonanceHz: c.resonanceHz,
          modulationDepth: 0.6,
        });
      break;
    }
    case 'unbalance-rising': {
      // P-201 (group 1, 1× alert 3.6 / danger 5.68 mm/s) crosses danger near the end;
      // F-210 (flexible, same 1× levels) reaches alert only. The build-up adds to the
      // residual unbalance as a vector BUILD_UP_ANGLE_DEG away from it.
      const rise = mach.type === 'pump' ? 5.4 * u ** 1.5 : 3.4 * u ** 2;
      const sum = addVectors(BASE_1X[mach.type] + 0.4, 0, rise, BUILD_UP_ANGLE_DEG);
      v1 = sum.magnitude * dir * (c.point.location.endsWith('NDE') ? 0.9 : 1);
      if (c.point.direction === 'A') v1 *= 0.8;
      unbalanceShiftDeg = sum.deg;
      break;
    }
    case 'misalignment': {
      // 2× (and 3×) high until the coupling is realigned, then back to normal.
      const before = u < REALIGNED_AT;
      v2 = before
        ? (c.point.location === 'Motor DE' ? 2.9 : 2.45) * (c.point.direction === 'V' ? 0.9 : 1)
        : 0.5;
      v3 = before ? 0.9 : 0.15;
      v1 = before ? 1.8 * dir : 1.1 * dir;
      break;
    }
    default:
      break;
  }

  // Gear mesh: G-401 wears (mesh and sidebands at both shaft speeds grow), G-230 healthy.
  for (const gear of mach.gears ?? []) {
    const wear = story === 'gear-wear' ? u : 0;
    const weight = c.point.location === 'Input shaft' ? 1 : 0.8;
    const meshG = (0.18 + 0.5 * wear ** 2) * weight * jitter(0.04);
    meshes.push({
      order: gear.teeth * gear.speedRatio,
      meshG,
      sidebands: [
        { spacingOrder: 1, g: (0.02 + 0.2 * wear ** 2) * weight, pairs: 2 },
        {
          spacingOrder: gear.teeth / gear.mateTeeth,
          g: (0.015 + 0.12 * wear ** 2) * weight,
          pairs: 2,
        },
      ],
    });
  }

  const tones: OrderTone[] = [
    { order: 1, velocityMmS: v1 * jitter(0.04) },
    { order: 2, velocityMmS: v2 * jitter(0.05) },
    { order: 3, velocityMmS: v3 * jitter(0.08) },
  ];
  const passCount = mach.vaneCount ?? mach.bladeCount;
  if (passCount) tones.push({ order: passCount, velocityMmS: 0.4 * jitter(0.1) });
  // Every order tone is locked to the shaft: force angle plus the point's response lag, with
  // a little scatter (its own generator, so the story's other draws stay as they were).
  const angles = shaftAngles(c);
  const scatter = gaussian(mulberry32(m.seed ^ 0x5bd1e995));
  for (const t of tones) {
    const forceDeg = t.order === 1 ? angles.residualDeg + unbalanceShiftDeg : 0;
    t.phaseLagDeg = wrap360(forceDeg + angles.responseDeg(t.order) + PHASE_SCATTER_DEG * scatter());
  }

  const faults = m.faults ?? true;
  let speedNote = 1;
  if (faults && c.fault === 'clipping' && uniform() < 0.3) {
    // Cavitation bursts on some captures: peaks far beyond the ±5 g input range.
    bursts = { count: 3 + Math.floor(uniform() * 4), peakG: 9, resonanceHz: 1500 };
  }
  if (faults && c.fault === 'under-range') {
    // Machine load varies; the channel's few bits vary with it.
    speedNote = 0.6 + 0.6 * uniform();
  }
  if (faults && c.fault === 'aliasing') {
    // A 3.7 kHz motor/gear component, unfiltered, folds to |3700 − 2560| = 1140 Hz.
    hzTones.push({ hz: Math.abs(3700 - c.sampleRateHz), g: 0.15 * jitter(0.1) });
  }

  const recipe: CaptureRecipe = {
    sampleRateHz: c.sampleRateHz,
    sampleCount: c.sampleCount,
    rpm,
    speedRamp: 0.0005 * normal(),
    tones: tones.map((t) => ({ ...t, velocityMmS: t.velocityMmS * speedNote })),
    impacts,
    meshes,
    hzTones,
    noiseG: noiseG * speedNote * jitter(0.05),
    sensitivityMvPerG: c.point.sensitivityMvPerG,
    adc: faults || c.fault === null ? c.adc : { encoding: 'int24', bits: 24, fullScaleV: 5 },
    tach: c.speedInput === 'tach',
    seed: m.seed,
  };
  if (bursts) recipe.bursts = bursts;
  return recipe;
}
