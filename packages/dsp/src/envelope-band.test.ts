import { describe, expect, it } from 'vitest';
import { analyzeSnapshot } from './analyze-snapshot.ts';
import { lcg32 } from './seeded-random.ts';

const FS = 25600;
const N = 65536;
const BPFO = 87.3; // outer-race defect frequency, Hz
const RESONANCE = 5600; // structural resonance the impacts ring, Hz

/**
 * An outer-race bearing fault as a practitioner captures it: impacts every 1/BPFO s, each
 * ringing a 5.6 kHz resonance as a damped sine (ζ = 0.05; definition of a damped SDOF
 * impulse response), under a 24.7 Hz running-speed tone of 0.5 g and Gaussian noise of
 * 0.02 g, in g (Randall & Antoni 2011, MSSP 25:485–520, for the model of the signal).
 */
function bearingFault(impactG: number): Float64Array {
  const lcg = lcg32(12345);
  const uniform = () => lcg() + 2 ** -33; // (0, 1): never 0, for the logarithm
  const w = 2 * Math.PI * RESONANCE;
  const zeta = 0.05;
  return Float64Array.from({ length: N }, (_, i) => {
    const t = i / FS;
    const since = t - Math.floor(t * BPFO) / BPFO;
    const ring =
      impactG * Math.exp(-zeta * w * since) * Math.sin(w * Math.sqrt(1 - zeta ** 2) * since);
    const noise = 0.02 * Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
    return ring + 0.5 * Math.sin(2 * Math.PI * 24.7 * t) + noise;
  });
}

/** Peak of the envelope spectrum within ±2 lines of `hz`, over the median line (0…500 Hz). */
function lineOverMedian(env: { dfHz: number; values: Float32Array }, hz: number): number {
  const k = Math.round(hz / env.dfHz);
  const peak = Math.max(...Array.from(env.values.subarray(k - 2, k + 3)));
  const lines = Array.from(env.values.subarray(1, Math.round(500 / env.dfHz))).sort(
    (a, b) => a - b,
  );
  return peak / lines[lines.length >> 1]!;
}

const analyse = (x: Float64Array, envelopeBandHz?: [number, number]) =>
  analyzeSnapshot({
    // float32 samples are volts: g × 0.1 V/g
    samples: Float64Array.from(x, (v) => v * 0.1),
    encoding: 'float32',
    sampleRateHz: FS,
    adc: { bits: 24, fullScaleV: 10 },
    sensor: { sensitivityMvPerG: 100 },
    speedRpm: 24.7 * 60,
    fmaxHz: 1000, // a point set up for the low-frequency spectrum
    lines: 1600,
    ...(envelopeBandHz ? { envelopeBandHz } : {}),
  });

describe('envelope band of a point', () => {
  it('with Fmax at 1 kHz, the default band (from the sample rate) still finds the outer-race fault', () => {
    const a = analyse(bearingFault(0.25));
    const env = a.spectra.envelope!;
    expect(env.bandHz[0]).toBeCloseTo(FS / 10.24, -1);
    expect(env.bandHz[1]).toBeCloseTo(FS / 2.56, -1);
    // BPFO and its second harmonic stand far above the envelope spectrum's floor
    expect(lineOverMedian(env, BPFO)).toBeGreaterThan(10);
    expect(lineOverMedian(env, 2 * BPFO)).toBeGreaterThan(5);
    // the mean is removed: line 0 holds nothing, and the mean is given apart
    expect(env.values[0]!).toBeLessThan(1e-6 * env.meanG);
  });

  it('a band below the resonance (the old Fmax/4 … Fmax) misses it; the engineer’s band around it finds it', () => {
    const x = bearingFault(0.25);
    const low = analyse(x, [250, 1000]).spectra.envelope!;
    const around = analyse(x, [4600, 6600]).spectra.envelope!;
    const at = (env: typeof low) => {
      const k = Math.round(BPFO / env.dfHz);
      return Math.max(...Array.from(env.values.subarray(k - 2, k + 3)));
    };
    expect(at(around)).toBeGreaterThan(5 * at(low));
    expect(lineOverMedian(around, BPFO)).toBeGreaterThan(10);
    expect(around.bandHz[0]).toBeCloseTo(4600, -1);
  });

  it('a band above what the capture holds is cut at fs/2.56; one wholly above falls back to the default', () => {
    const x = bearingFault(0.25);
    expect(analyse(x, [4000, 20000]).spectra.envelope!.bandHz[1]).toBeCloseTo(10000, -1);
    expect(analyse(x, [11000, 12000]).spectra.envelope!.bandHz[0]).toBeCloseTo(2500, -1);
  });
});
