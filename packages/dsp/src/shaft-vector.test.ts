import { describe, expect, it } from 'vitest';
import { analyzeSnapshot } from './analyze-snapshot.ts';
import { shaftVectors } from './shaft-vector.ts';
import { lcg32 } from './seeded-random.ts';

const FS = 25600;
const N = 65536;

/** Pulse times where the angle 2π(f0·t + c·t²/2) reaches each whole turn (quadratic root). */
function pulses(f0: number, c: number, duration: number): number[] {
  const out: number[] = [];
  for (let m = 0; ; m++) {
    const t = c === 0 ? m / f0 : (-f0 + Math.sqrt(f0 * f0 + 2 * c * m)) / c;
    if (t > duration) return out;
    out.push(t);
  }
}

describe('shaftVectors', () => {
  // Definition: a(t) = A·cos(2πf(t − τ)) lags the pulse at t = 0 by 360·f·τ degrees.
  it('when 1× is delayed by 3 ms at 24.6 Hz, it reads a 26.57° lag and the amplitude', () => {
    const f = 24.6;
    const tau = 0.003;
    const a = Float64Array.from(
      { length: N },
      (_, i) => 0.5 * Math.cos(2 * Math.PI * f * (i / FS - tau)),
    );
    const [v1] = shaftVectors(
      a,
      { pulseTimesS: pulses(f, 0, (N - 1) / FS) },
      { sampleRateHz: FS, orders: [1] },
    );
    expect(v1!.accelPhaseDeg).toBeCloseTo(360 * f * tau, 1); // 26.568°
    expect(v1!.accelPeakG).toBeCloseTo(0.5, 3);
    expect(v1!.hz).toBeCloseTo(f, 3);
    // v = a/(2πf), RMS = peak/√2; 0.5 g at 24.6 Hz → 22.43 mm/s RMS; velocity lags by a further 90°
    expect(v1!.velocityRmsMmS).toBeCloseTo(
      (0.5 * 9.80665 * 1000) / (2 * Math.PI * f) / Math.SQRT2,
      2,
    );
    expect(v1!.velocityPhaseDeg).toBeCloseTo(360 * f * tau + 90, 1);
  });

  // Definition: a = cos(θ − φ1) + 0.3·cos(2θ − φ2) with θ from a speed ramping 5 % over the record.
  it('when the speed ramps, 1× and 2× vectors keep their phases (angle-domain integration)', () => {
    const f0 = 29.5;
    const duration = (N - 1) / FS;
    const c = (0.05 * f0) / duration;
    const phi1 = 300;
    const phi2 = 45;
    const rad = Math.PI / 180;
    const u = lcg32(7);
    const a = Float64Array.from({ length: N }, (_, i) => {
      const t = i / FS;
      const theta = 2 * Math.PI * (f0 * t + (c * t * t) / 2);
      return (
        Math.cos(theta - phi1 * rad) + 0.3 * Math.cos(2 * theta - phi2 * rad) + 0.2 * (u() - 0.5)
      );
    });
    const [v1, v2] = shaftVectors(
      a,
      { pulseTimesS: pulses(f0, c, duration) },
      { sampleRateHz: FS },
    );
    expect(v1!.accelPhaseDeg).toBeCloseTo(phi1, 0);
    expect(v1!.accelPeakG).toBeCloseTo(1, 2);
    expect(v2!.order).toBe(2);
    expect(v2!.accelPhaseDeg).toBeCloseTo(phi2, 0);
    expect(v2!.accelPeakG).toBeCloseTo(0.3, 2);
  });

  // Two pulses per turn: the phase is still referred to the first pulse of each turn.
  it('when the tach gives two pulses a turn, the 1× phase is unchanged', () => {
    const f = 20;
    const a = Float64Array.from({ length: N }, (_, i) =>
      Math.cos(2 * Math.PI * f * (i / FS) - Math.PI / 3),
    );
    const half = pulses(2 * f, 0, (N - 1) / FS);
    const [v1] = shaftVectors(
      a,
      { pulseTimesS: half, pulsesPerRev: 2 },
      { sampleRateHz: FS, orders: [1] },
    );
    expect(v1!.accelPhaseDeg).toBeCloseTo(60, 1);
  });

  it('when no whole revolution is inside the record, it says so', () => {
    expect(() =>
      shaftVectors(new Float64Array(1000), { pulseTimesS: [0.01, 5] }, { sampleRateHz: FS }),
    ).toThrow(/no whole revolution/);
  });

  // Through analyzeSnapshot: counts → g, then the vector; 1 g peak at 1× lagging 120°.
  it('when a snapshot has a tach, the analysis carries the 1× and 2× vectors', () => {
    const f = 25;
    const samples = Float64Array.from(
      { length: N },
      (_, i) => 0.1 * Math.cos(2 * Math.PI * f * (i / FS) - (120 * Math.PI) / 180),
    ); // volts at 100 mV/g → 1 g peak
    const record = {
      samples,
      encoding: 'float32',
      sampleRateHz: FS,
      adc: { bits: 24, fullScaleV: 10 },
      sensor: { sensitivityMvPerG: 100 },
    } as const;
    const r = analyzeSnapshot({ ...record, tach: { pulseTimesS: pulses(f, 0, (N - 1) / FS) } });
    expect(r.shaftVectors).not.toBeNull();
    expect(r.shaftVectors![0]!.accelPhaseDeg).toBeCloseTo(120, 1);
    expect(r.shaftVectors![0]!.accelPeakG).toBeCloseTo(1, 2);
    expect(r.shaftVectors![1]!.accelPeakG).toBeLessThan(1e-3);
    const noTach = analyzeSnapshot({ ...record, speedRpm: 1500 });
    expect(noTach.shaftVectors).toBeNull();
  });
});
