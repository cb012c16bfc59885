import { checkPulses, type TachPulses } from './order-tracking.ts';

/** Standard gravity, m/s² (ISO 80000-3). */
const G = 9.80665;

/**
 * The vector (amplitude and phase) of one shaft order, measured against the tach pulse.
 *
 * Phase convention: **phase lag in degrees, 0 ≤ φ < 360**. The order-k component is read as
 * `A · cos(k·θ − φ)`, θ the shaft angle in radians counted from a tach pulse in the direction
 * of rotation; φ is how far (in degrees of the k× cycle) the component's positive peak comes
 * *after* the pulse. A heavy spot moving against the rotation raises φ. Velocity lags
 * acceleration by 90° (v = ∫a dt), so `velocityPhaseDeg = accelPhaseDeg + 90` (mod 360).
 */
export interface ShaftVector {
  order: number;
  /** Mean frequency of the order over the record, Hz. */
  hz: number;
  /** Acceleration amplitude of the order, g peak. */
  accelPeakG: number;
  accelPhaseDeg: number;
  /** Velocity of the order, mm/s RMS (a / 2πf at the mean frequency). */
  velocityRmsMmS: number;
  velocityPhaseDeg: number;
  /** Whole revolutions averaged. */
  revolutions: number;
}

/** Options for {@link shaftVectors}. */
export interface ShaftVectorOptions {
  sampleRateHz: number;
  /** Orders to read. @default [1, 2] */
  orders?: readonly number[];
}

function wrap360(deg: number): number {
  const d = deg % 360;
  return d < 0 ? d + 360 : d + 0; // + 0 turns −0 into 0
}

/**
 * Shaft-order vectors from tach pulses by synchronous demodulation in the angle domain: the
 * shaft angle θ(t) is interpolated linearly between pulses, and over the whole revolutions
 * between the first and last usable pulse X_k = (1/πR) Σ a(t)·e^(−jkθ(t))·Δθ, so that
 * a = A·cos(kθ − φ) gives X_k = A·e^(−jφ): amplitude |X_k|, phase lag φ = −arg X_k.
 * Integrating over angle (Δθ per sample) keeps the estimate right while the speed drifts.
 *
 * Source: the Fourier coefficient of a periodic signal (definition); synchronous
 * (tach-referenced) phase as used for field balancing — common practice, no source for the
 * sign convention, which is stated on {@link ShaftVector}.
 */
export function shaftVectors(
  accelG: ArrayLike<number>,
  tach: TachPulses,
  options: ShaftVectorOptions,
): ShaftVector[] {
  const fs = options.sampleRateHz;
  if (!(fs > 0)) throw new RangeError(`sampleRateHz must be positive, got ${fs}`);
  const orders = options.orders ?? [1, 2];
  for (const k of orders) {
    if (!(k > 0) || !Number.isFinite(k)) throw new RangeError(`orders must be positive, got ${k}`);
  }
  const { times, pulsesPerRev } = checkPulses(tach);
  const n = accelG.length;
  const duration = (n - 1) / fs;
  const inside: number[] = [];
  for (const t of times) if (t >= 0 && t <= duration) inside.push(t);
  const revolutions = Math.floor((inside.length - 1) / pulsesPerRev);
  if (revolutions < 1)
    throw new RangeError('the tach pulses inside the record cover no whole revolution');
  const lastPulse = revolutions * pulsesPerRev;
  const re = new Float64Array(orders.length);
  const im = new Float64Array(orders.length);
  const perPulse = (2 * Math.PI) / pulsesPerRev;
  let i = Math.ceil(inside[0]! * fs);
  for (let p = 0; p < lastPulse; p++) {
    const t0 = inside[p]!;
    const t1 = inside[p + 1]!;
    const rate = perPulse / (t1 - t0); // rad/s within this pulse interval
    const end = t1 * fs;
    for (; i < end; i++) {
      const theta = p * perPulse + (i / fs - t0) * rate;
      const w = (accelG[i] as number) * (rate / fs); // a · Δθ
      for (let o = 0; o < orders.length; o++) {
        const arg = orders[o]! * theta;
        re[o]! += w * Math.cos(arg);
        im[o]! -= w * Math.sin(arg);
      }
    }
  }
  const meanHz = revolutions / (inside[lastPulse]! - inside[0]!);
  return orders.map((k, o) => {
    const xr = re[o]! / (Math.PI * revolutions);
    const xi = im[o]! / (Math.PI * revolutions);
    const amplitude = Math.hypot(xr, xi);
    const accelPhaseDeg = wrap360((-Math.atan2(xi, xr) * 180) / Math.PI);
    const hz = k * meanHz;
    return {
      order: k,
      hz,
      accelPeakG: amplitude,
      accelPhaseDeg,
      velocityRmsMmS: (amplitude * G * 1000) / (2 * Math.PI * hz) / Math.SQRT2,
      velocityPhaseDeg: wrap360(accelPhaseDeg + 90),
      revolutions,
    };
  });
}
