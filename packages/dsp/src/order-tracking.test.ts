import { describe, expect, it } from 'vitest';
import { computedOrderTracking, tachSpeedRpm } from './order-tracking.ts';
import { findPeaks } from './spectral-peaks.ts';
import { welch } from './welch.ts';

/** Run-up from 10 to 20 rev/s over 10 s: θ(t) = 2π(10t + t²/2), x = sin(3θ), one tach pulse per rev. */
function runUp(fs = 5000, seconds = 10): { x: Float64Array; pulses: number[] } {
  const n = Math.round(fs * seconds);
  const x = Float64Array.from({ length: n }, (_, i) => {
    const t = i / fs;
    return Math.sin(3 * 2 * Math.PI * (10 * t + 0.5 * t * t));
  });
  const pulses: number[] = [];
  for (let k = 0; ; k++) {
    const t = -10 + Math.sqrt(100 + 2 * k); // 10t + t²/2 = k
    if (t > seconds) break;
    pulses.push(t);
  }
  return { x, pulses };
}

describe('computed order tracking', () => {
  // Fyfe & Munck 1997, Mech. Systems and Signal Processing 11(2): run-up 10 → 20 rev/s of sin(3θ) gives one line at order 3.000
  it('when a run-up from 10 to 20 rev/s of sin(3θ) is tracked, one line stands at order 3.000 with 0.7071 RMS', () => {
    const { x, pulses } = runUp();
    const r = computedOrderTracking(
      x,
      { pulseTimesS: pulses },
      { sampleRateHz: 5000, maxOrder: 10 },
    );
    const [first, second] = findPeaks(r.power, r.dOrder, {
      count: 2,
      nperseg: r.samplesPerRev * r.revsPerBlock,
    });
    expect(first!.hz).toBeCloseTo(3, 3);
    expect(first!.amplitude).toBeCloseTo(Math.SQRT1_2, 3);
    // everything else is at least 60 dB down
    expect(second!.amplitude / first!.amplitude).toBeLessThan(1e-3);
    expect(r.revolutions).toBe(149); // the 150th pulse falls at t = 10 s, just after the last sample
    expect(r.dOrder).toBe(1 / 16);
  });

  // common practice, no source: the same run-up in a Hz spectrum is smeared over 30–60 Hz
  it('when the same run-up is read on a Hz axis, no single line holds the tone (why tracking is needed)', () => {
    const { x } = runUp();
    const r = welch(x, { sampleRateHz: 5000, nperseg: 8192, scaling: 'spectrum' });
    expect(Math.sqrt(Math.max(...r.power))).toBeLessThan(0.3);
  });

  it('when two pulses per revolution are given, the speed and the order line stay the same', () => {
    const { x, pulses } = runUp();
    const half: number[] = [];
    for (let k = 0; k < pulses.length - 1; k++) {
      half.push(pulses[k]!, -10 + Math.sqrt(100 + 2 * (k + 0.5)));
    }
    half.push(pulses.at(-1)!);
    const r = computedOrderTracking(
      x,
      { pulseTimesS: half, pulsesPerRev: 2 },
      { sampleRateHz: 5000, maxOrder: 10 },
    );
    const [peak] = findPeaks(r.power, r.dOrder, {
      count: 1,
      nperseg: r.samplesPerRev * r.revsPerBlock,
    });
    expect(peak!.hz).toBeCloseTo(3, 3);
    expect(tachSpeedRpm({ pulseTimesS: half, pulsesPerRev: 2 })).toBeCloseTo(
      tachSpeedRpm({ pulseTimesS: pulses }),
      6,
    );
  });

  // definition: 60 · revolutions / time
  it('when pulses come every 25 ms, the tach speed is 2400 r/min', () => {
    expect(tachSpeedRpm({ pulseTimesS: [0, 0.025, 0.05, 0.075] })).toBeCloseTo(2400, 9);
  });

  it('when pulses are not increasing or too few, it throws', () => {
    const x = new Float64Array(1000);
    expect(() =>
      computedOrderTracking(x, { pulseTimesS: [0.1, 0.05] }, { sampleRateHz: 1000 }),
    ).toThrow(/increase/);
    expect(() => computedOrderTracking(x, { pulseTimesS: [0.1] }, { sampleRateHz: 1000 })).toThrow(
      RangeError,
    );
    expect(() =>
      computedOrderTracking(x, { pulseTimesS: [5, 6, 7] }, { sampleRateHz: 1000 }),
    ).toThrow(/inside/);
    expect(() => tachSpeedRpm({ pulseTimesS: [0, 1], pulsesPerRev: 0 })).toThrow(RangeError);
  });
});
