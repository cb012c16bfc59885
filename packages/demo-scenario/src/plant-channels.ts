/**
 * The demo plant (demo-plant.ts) as a gateway sees it: one channel per point, with its
 * capture set-up (sample rate, length, ADC), speed input, bearing defect orders and the
 * measurement fault it carries, if any.
 */
import { bearingOrders, type BearingOrders } from '@turnstone/dsp/fault-frequencies';
import { demoPlant, type DemoBearing, type DemoMachine, type DemoPoint } from './demo-plant.ts';
import type { AdcSetup } from './synthesize-capture.ts';
import { fnv1a } from '@turnstone/dsp/seeded-random';

/** Standard capture: 12.8 kHz for Fmax 5 kHz (fs = 2.56·Fmax), 8192 samples = 0.64 s. */
export const STANDARD_CAPTURE = {
  sampleRateHz: 12_800,
  sampleCount: 8192,
  fmaxHz: 5000,
  lines: 1600,
};
/**
 * Slow fans: 2.56 kHz for Fmax 1 kHz, 8192 samples = 3.2 s, so 0.625 Hz lines resolve 1×
 * of a 440–740 r/min shaft (7–12 Hz) for the speed estimate.
 */
export const LOW_SPEED_CAPTURE = {
  sampleRateHz: 2560,
  sampleCount: 8192,
  fmaxHz: 1000,
  lines: 1600,
};
/** 24-bit gateway input, ±5 V (a 100 mV/g sensor reaches the rails at 50 g). */
export const STANDARD_ADC: AdcSetup = { encoding: 'int24', bits: 24, fullScaleV: 5 };

export type MeasurementFault = 'clipping' | 'under-range' | 'aliasing';

export interface SimChannel {
  siteCode: string;
  tag: string;
  machine: DemoMachine;
  point: DemoPoint;
  /** Index of the point on its machine (0 = first). */
  pointIndex: number;
  bearing: DemoBearing | null;
  /** Defect orders of the point's bearing relative to the measured (machine) shaft. */
  bearingOrders: BearingOrders | null;
  sampleRateHz: number;
  sampleCount: number;
  /** Fmax the point is configured for (the server's analysis Fmax). */
  fmaxHz: number;
  lines: number;
  adc: AdcSetup;
  /** How the gateway knows the speed: tach pulses, a speed value, or not at all. */
  speedInput: 'tach' | 'rpm' | 'none';
  /** The measurement fault this channel carries (simulated only when faults are on). */
  fault: MeasurementFault | null;
  /** Structural resonance rung by bearing impacts, Hz (2–5 kHz, fixed per machine). */
  resonanceHz: number;
}

/** Machines whose gateway has a once-per-revolution tach input (P-201: the developing unbalance is followed by its 1× vector). */
const TACH_MACHINES = new Set(['P101', 'P201', 'G401', 'M110']);
const NO_SPEED_TYPES = new Set(['fan', 'blower']);

function faultOf(machine: DemoMachine, point: DemoPoint): MeasurementFault | null {
  if (machine.story === 'clipped-sensor' && point.suffix === 'MDE-H') return 'clipping';
  if (machine.story === 'under-ranged' && point.suffix === 'MDE-V') return 'under-range';
  if (machine.story === 'aliasing-setup') return 'aliasing';
  return null;
}

/** The channel set-up for one point, before faults are applied. */
function channelOf(
  siteCode: string,
  machine: DemoMachine,
  point: DemoPoint,
  pointIndex: number,
): SimChannel {
  const bearing = machine.bearings.find((b) => b.name === point.bearing) ?? null;
  let orders: BearingOrders | null = null;
  if (bearing) {
    const o = bearingOrders(bearing);
    const r = bearing.speedRatio ?? 1;
    orders = { bpfo: o.bpfo * r, bpfi: o.bpfi * r, bsf: o.bsf * r, ftf: o.ftf * r };
  }
  const fault = faultOf(machine, point);
  // F-330's fault is the set-up: the slow-fan rate with its anti-alias filter bypassed,
  // so content above Nyquist folds into the band (see story-recipe.ts).
  const capture = { ...(machine.type === 'fan' ? LOW_SPEED_CAPTURE : STANDARD_CAPTURE) };
  let adc = { ...STANDARD_ADC };
  if (fault === 'clipping') {
    // Input range left at ±0.5 V: a 100 mV/g sensor saturates at 5 g.
    adc = { encoding: 'int16', bits: 16, fullScaleV: 0.5 };
  } else if (fault === 'under-range') {
    // A 12-bit process input at ±5 V: 41 counts per g, a few bits of a quiet blower.
    adc = { encoding: 'int16', bits: 12, fullScaleV: 5 };
  }
  return {
    siteCode,
    tag: `${siteCode}-${machine.code}-${point.suffix}`,
    machine,
    point,
    pointIndex,
    bearing,
    bearingOrders: orders,
    sampleRateHz: capture.sampleRateHz,
    sampleCount: capture.sampleCount,
    fmaxHz: capture.fmaxHz,
    lines: capture.lines,
    adc,
    speedInput: TACH_MACHINES.has(machine.code)
      ? 'tach'
      : NO_SPEED_TYPES.has(machine.type)
        ? 'none'
        : 'rpm',
    fault,
    resonanceHz: 2200 + (fnv1a(machine.code) % 2300),
  };
}

/** Every channel of the demo plant, or of one site, in plant order. */
export function demoChannels(siteCode?: string): SimChannel[] {
  const out: SimChannel[] = [];
  for (const site of demoPlant) {
    if (siteCode && site.code !== siteCode) continue;
    for (const area of site.areas)
      for (const machine of area.machines)
        machine.points.forEach((p, i) => out.push(channelOf(site.code, machine, p, i)));
  }
  return out;
}
