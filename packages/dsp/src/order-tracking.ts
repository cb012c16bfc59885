import { nextPowerOfTwo } from './fft-plan.ts';
import { welch } from './welch.ts';
import type { WindowName } from './window-functions.ts';

/** Tach pulses: times of successive once-per-(1/pulsesPerRev)-revolution marks. */
export interface TachPulses {
  /** Pulse times in seconds from the first sample, strictly increasing. */
  pulseTimesS: ArrayLike<number>;
  /** Pulses per shaft revolution. @default 1 */
  pulsesPerRev?: number;
}

/** Options for {@link computedOrderTracking}. */
export interface OrderTrackingOptions {
  /** Sample rate of the waveform in Hz. Required. */
  sampleRateHz: number;
  /** Highest order of interest; sets the angular sampling (≥ 2.56 samples per order). @default 50 */
  maxOrder?: number;
  /** Revolutions per FFT block (a power of two); order resolution is 1/revsPerBlock. @default min(16, revolutions available) */
  revsPerBlock?: number;
  /** Window for the order spectrum. @default 'hann' */
  window?: WindowName;
}

/** Order spectrum from computed order tracking. */
export interface OrderSpectrum {
  /** One-sided power per line in input unit² (a tone at an order reads its RMS²). */
  power: Float64Array;
  /** Line spacing in orders (1 / revsPerBlock). */
  dOrder: number;
  samplesPerRev: number;
  revsPerBlock: number;
  /** Whole revolutions resampled. */
  revolutions: number;
  /** Blocks averaged. */
  blocks: number;
  enbwBins: number;
  window: WindowName;
}

/** Checks tach pulses and returns them as an array of times. */
export function checkPulses(tach: TachPulses): { times: Float64Array; pulsesPerRev: number } {
  const ppr = tach.pulsesPerRev ?? 1;
  if (!Number.isInteger(ppr) || ppr < 1)
    throw new RangeError(`pulsesPerRev must be a positive integer, got ${ppr}`);
  const times = Float64Array.from(tach.pulseTimesS);
  if (times.length < 2)
    throw new RangeError(`tach needs at least 2 pulse times, got ${times.length}`);
  for (let i = 0; i < times.length; i++) {
    if (!Number.isFinite(times[i]!)) throw new RangeError(`tach pulse ${i} is not a finite time`);
    if (i > 0 && !(times[i]! > times[i - 1]!)) {
      throw new RangeError(`tach pulse times must increase strictly (pulse ${i}: ${times[i]} s)`);
    }
  }
  return { times, pulsesPerRev: ppr };
}

/**
 * Mean shaft speed over the tach record, r/min: 60 · (pulses − 1) / pulsesPerRev /
 * (last − first). Source: definition.
 */
export function tachSpeedRpm(tach: TachPulses): number {
  const { times, pulsesPerRev } = checkPulses(tach);
  return (60 * (times.length - 1)) / pulsesPerRev / (times[times.length - 1]! - times[0]!);
}

/** 4-point Lagrange interpolation on a uniform grid at fractional position u ∈ [0, 1) after p1. */
function cubic(p0: number, p1: number, p2: number, p3: number, u: number): number {
  const um1 = u + 1;
  const u1 = u - 1;
  const u2 = u - 2;
  return (
    (-p0 * u * u1 * u2) / 6 +
    (p1 * um1 * u1 * u2) / 2 -
    (p2 * um1 * u * u2) / 2 +
    (p3 * um1 * u * u1) / 6
  );
}

/**
 * Computed order tracking: the shaft angle is known at each tach pulse; the time of every
 * constant angle increment is interpolated through the pulses (cubic through four
 * successive pulses), the waveform is interpolated at those times (cubic Lagrange), and
 * the angle-domain signal is Welch-averaged in blocks of whole revolutions (Hann, 50 %
 * overlap), giving a spectrum in orders whose lines stay sharp through speed changes.
 *
 * Source: Fyfe & Munck, "Analysis of computed order tracking", MSSP 11(2):187–205, 1997
 * (angle from tach pulse times, resampling at equal angle steps; interpolation order
 * dominates the error).
 */
export function computedOrderTracking(
  input: ArrayLike<number>,
  tach: TachPulses,
  options: OrderTrackingOptions,
): OrderSpectrum {
  const n = input.length;
  const fs = options.sampleRateHz;
  if (!(fs > 0)) throw new RangeError(`sampleRateHz must be positive, got ${fs}`);
  if (n < 4) throw new RangeError(`order tracking needs at least 4 samples, got ${n}`);
  const { times, pulsesPerRev } = checkPulses(tach);
  const maxOrder = options.maxOrder ?? 50;
  if (!(maxOrder > 0)) throw new RangeError(`maxOrder must be positive, got ${maxOrder}`);
  const duration = (n - 1) / fs;
  // Pulses outside the waveform cannot place any sample; keep those inside it.
  let first = 0;
  while (first < times.length && times[first]! < 0) first++;
  let last = times.length - 1;
  while (last >= 0 && times[last]! > duration) last--;
  const pulses = last - first + 1;
  if (pulses < 2) throw new RangeError('fewer than 2 tach pulses fall inside the waveform');

  const samplesPerRev = nextPowerOfTwo(Math.ceil(2.56 * maxOrder));
  const stepsPerPulse = samplesPerRev / pulsesPerRev;
  const totalRevs = Math.floor((pulses - 1) / pulsesPerRev);
  if (totalRevs < 1) throw new RangeError('tach pulses cover less than one revolution');
  let revsPerBlock = options.revsPerBlock ?? Math.min(16, 2 ** Math.floor(Math.log2(totalRevs)));
  if (!Number.isInteger(revsPerBlock) || revsPerBlock < 1 || revsPerBlock > totalRevs) {
    throw new RangeError(
      `revsPerBlock must be an integer in 1 … ${totalRevs}, got ${revsPerBlock}`,
    );
  }
  revsPerBlock = Math.floor(revsPerBlock);

  const count = totalRevs * samplesPerRev;
  const resampled = new Float64Array(count);
  const p = (i: number): number => times[first + Math.min(Math.max(i, 0), pulses - 1)]!;
  for (let j = 0; j < count; j++) {
    // Angle in pulse intervals from the first kept pulse.
    const a = j / stepsPerPulse;
    const i = Math.floor(a);
    const u = a - i;
    let t: number;
    if (i === 0 || i >= pulses - 2) {
      // Ends: quadratic through the three nearest pulses.
      const base = Math.min(Math.max(i - 1, 0), pulses - 3);
      if (pulses < 3) {
        t = p(i) + u * (p(i + 1) - p(i));
      } else {
        const v = a - base;
        const t0 = p(base);
        const t1 = p(base + 1);
        const t2 = p(base + 2);
        t = (t0 * (v - 1) * (v - 2)) / 2 - t1 * v * (v - 2) + (t2 * v * (v - 1)) / 2;
      }
    } else {
      t = cubic(p(i - 1), p(i), p(i + 1), p(i + 2), u);
    }
    const s = t * fs;
    const k = Math.min(Math.max(Math.floor(s), 1), n - 3);
    resampled[j] = cubic(input[k - 1]!, input[k]!, input[k + 1]!, input[k + 2]!, s - k);
  }

  const windowName = options.window ?? 'hann';
  const nperseg = samplesPerRev * revsPerBlock;
  const spectrum = welch(resampled, {
    sampleRateHz: samplesPerRev,
    nperseg,
    window: windowName,
    scaling: 'spectrum',
  });
  const lines = Math.min(spectrum.power.length, Math.floor(maxOrder * revsPerBlock + 1e-9) + 1);
  return {
    power: spectrum.power.slice(0, lines),
    dOrder: 1 / revsPerBlock,
    samplesPerRev,
    revsPerBlock,
    revolutions: totalRevs,
    blocks: spectrum.segments,
    enbwBins: spectrum.enbwBins,
    window: windowName,
  };
}
