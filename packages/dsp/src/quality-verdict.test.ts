import { describe, expect, it } from 'vitest';
import {
  ALIAS_GUARD_BAND_POWER_FRACTION,
  assessQuality,
  CLIPPED_FRACTION_UNUSABLE,
  NO_SIGNAL_RMS_G,
  UNDER_RANGE_SUSPECT_BITS,
  UNDER_RANGE_UNUSABLE_BITS,
} from './quality-verdict.ts';
import { DRIFT_LINE_RATIO } from './quality-waveform.ts';
import { lcg32 } from './seeded-random.ts';

const FS = 25600;
const HALF24 = 2 ** 23;

/** Deterministic pseudo-noise in [−0.5, 0.5) (32-bit LCG). */
function lcg(seed: number): () => number {
  const u = lcg32(seed);
  return () => u() - 0.5;
}

/** 24-bit counts of a 117 Hz tone at `fraction` of full scale plus a little noise. */
function capture24(fraction: number, n = 16384, seed = 1): Int32Array {
  const r = lcg(seed);
  return Int32Array.from({ length: n }, (_, i) =>
    Math.round(HALF24 * (fraction * Math.sin((2 * Math.PI * 117 * i) / FS) + 0.001 * r())),
  );
}

/** Deterministic standard normal deviates (Box–Muller on the LCG). */
function gauss(seed: number): () => number {
  const r = lcg(seed);
  return () => Math.sqrt(-2 * Math.log(r() + 0.5 + 2 ** -33)) * Math.cos(2 * Math.PI * (r() + 0.5));
}

/**
 * Bearing impacts ringing a resonance: a damped sine burst x(t) = e^(−ζωt)·sin(ω√(1−ζ²)t)
 * starting from rest at each impact (definition of a viscously damped single-degree-of-
 * freedom impulse response), repeated every `periodS`, with optional Gaussian noise.
 */
function ringingImpacts(
  resonanceFraction: number,
  zeta: number,
  noise: number,
  n = 16384,
  periodS = 1 / 87.3,
): Float64Array {
  const w = 2 * Math.PI * resonanceFraction * FS;
  const wd = w * Math.sqrt(1 - zeta * zeta);
  const g = gauss(7);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / FS;
    // impacts at k·periodS + 0.37/FS, so they fall between samples
    const since = t - 0.37 / FS - Math.floor((t - 0.37 / FS) / periodS) * periodS;
    x[i] = (since >= 0 ? Math.exp(-zeta * w * since) * Math.sin(wd * since) : 0) + noise * g();
  }
  return x;
}

const codes = (q: ReturnType<typeof assessQuality>): string[] => q.findings.map((f) => f.code);

/** Float32 volts from a 24-bit ±10 V input with a 100 mV/g sensor. */
const VOLTS_INPUT = {
  encoding: 'float32',
  bits: 24,
  fullScaleV: 10,
  sampleRateHz: FS,
  sensitivityMvPerG: 100,
} as const;

describe('quality verdict', () => {
  // A clean 24-bit capture is ok (common practice, no source)
  it('when a clean 24-bit capture uses half the range, the verdict is ok with no findings', () => {
    const q = assessQuality(capture24(0.5), { bits: 24, sampleRateHz: FS });
    expect(q.verdict).toBe('ok');
    expect(q.findings).toEqual([]);
    expect(q.bitsUsed).toBeCloseTo(Math.log2(HALF24), 1); // peak-to-peak ≈ one full scale
  });

  // Clipping is flagged; above a small fraction the capture is unusable (common practice, no source)
  it('when a tone is driven past full scale, it is clipped and unusable', () => {
    const top = HALF24 - 1;
    const x = capture24(1.4).map((c) => Math.max(-HALF24, Math.min(top, c)));
    const q = assessQuality(x, { bits: 24, sampleRateHz: FS });
    expect(q.verdict).toBe('unusable');
    const f = q.findings.find((g) => g.code === 'clipped')!;
    expect(f.severity).toBe('unusable');
    expect(f.value).toBeGreaterThan(CLIPPED_FRACTION_UNUSABLE);
    expect(q.metrics.longestRailRun).toBeGreaterThan(10);
  });

  it('when a single sample touches the rail, the capture is only suspect', () => {
    const x = capture24(0.5);
    x[1000] = HALF24 - 1;
    const q = assessQuality(x, { bits: 24, sampleRateHz: FS });
    expect(q.findings.find((f) => f.code === 'clipped')!.severity).toBe('suspect');
    expect(q.metrics.longestRailRun).toBe(1);
  });

  // 3-bit signals are flagged (common practice, no source); Kester MT-001 for the SNR of the bits used
  it('when a 16-bit capture only moves over 3 bits, it is under-range and unusable', () => {
    const x = Int32Array.from({ length: 8192 }, (_, i) =>
      Math.round(3.5 * Math.sin((2 * Math.PI * 117 * i) / FS)),
    );
    const q = assessQuality(x, { bits: 16, sampleRateHz: FS });
    expect(q.bitsUsed).toBeCloseTo(Math.log2(7), 9);
    expect(q.bitsUsed).toBeLessThan(UNDER_RANGE_UNUSABLE_BITS);
    expect(q.snrDb).toBeCloseTo(20 * Math.log10(2) * Math.log2(7) + 1.7609, 3);
    expect(q.findings.find((f) => f.code === 'under-range')!.severity).toBe('unusable');
    expect(q.verdict).toBe('unusable');
  });

  it('when a capture uses 6 bits, it is under-range but only suspect', () => {
    const x = Int32Array.from({ length: 8192 }, (_, i) =>
      Math.round(31.5 * Math.sin((2 * Math.PI * 117 * i) / FS)),
    );
    const q = assessQuality(x, { bits: 16, sampleRateHz: FS });
    expect(q.bitsUsed).toBeLessThan(UNDER_RANGE_SUSPECT_BITS);
    expect(q.verdict).toBe('suspect');
    expect(codes(q)).toEqual(['under-range']);
  });

  // Aliased tones are flagged (sampling theorem: Shannon 1949, Nyquist 1928). A 1450 Hz tone sampled at 1 kHz folds to 450 Hz,
  // inside the guard band between fs/2.56 and Nyquist that an anti-alias filter keeps empty.
  it('when an unfiltered 1450 Hz tone is sampled at 1 kHz, the guard-band energy raises alias-risk', () => {
    const x = Int32Array.from({ length: 8192 }, (_, i) =>
      Math.round(1e6 * Math.sin((2 * Math.PI * 1450 * i) / 1000)),
    );
    const q = assessQuality(x, { bits: 24, sampleRateHz: 1000 });
    expect(codes(q)).toContain('alias-risk');
    expect(q.metrics.guardBandPowerFraction).toBeGreaterThan(0.9);
    expect(q.verdict).toBe('suspect');
  });

  // common practice, no source: fs ≥ 2.56 × Fmax
  it('when Fmax is asked above fs/2.56 or the filter cutoff above Nyquist, alias-risk is raised', () => {
    const x = capture24(0.5);
    expect(codes(assessQuality(x, { bits: 24, sampleRateHz: FS, fmaxHz: 12000 }))).toEqual([
      'alias-risk',
    ]);
    expect(
      codes(assessQuality(x, { bits: 24, sampleRateHz: FS, antiAliasCutoffHz: 14000 })),
    ).toEqual(['alias-risk']);
    expect(codes(assessQuality(x, { bits: 24, sampleRateHz: FS, fmaxHz: 10000 }))).toEqual([]);
  });

  it('when the sensor is dead, the capture is a flatline and unusable', () => {
    const q = assessQuality(new Int32Array(4096).fill(12), { bits: 24, sampleRateHz: FS });
    expect(codes(q)).toEqual(['flatline']);
    expect(q.verdict).toBe('unusable');
    expect(q.bitsUsed).toBe(0);
  });

  it('when the signal sticks at one value for a long stretch, flatline is suspect', () => {
    const x = capture24(0.3);
    x.fill(4242, 2000, 4000);
    const q = assessQuality(x, { bits: 24, sampleRateHz: FS });
    expect(q.findings.find((f) => f.code === 'flatline')!.severity).toBe('suspect');
  });

  it('when the capture sits 30 % of full scale off zero, bias is suspect; at 60 % unusable', () => {
    const x = capture24(0.2).map((c) => c + Math.round(0.3 * HALF24));
    expect(assessQuality(x, { bits: 24 }).findings.map((f) => [f.code, f.severity])).toEqual([
      ['bias', 'suspect'],
    ]);
    const y = capture24(0.2).map((c) => c + Math.round(0.6 * HALF24));
    expect(assessQuality(y, { bits: 24 }).verdict).toBe('unusable');
  });

  it('when three isolated single-sample impulses sit on a clean tone, spikes counts three', () => {
    const x = capture24(0.05);
    for (const i of [100, 5000, 12000]) x[i] = Math.round(0.9 * HALF24);
    const q = assessQuality(x, { bits: 24, sampleRateHz: FS });
    const f = q.findings.find((g) => g.code === 'spikes')!;
    expect(f.value).toBe(3);
    expect(q.verdict).toBe('suspect');
  });

  it('when float32 volts are given, they are read as counts of the stated ADC', () => {
    const volts = Float32Array.from(capture24(0.5), (c) => c / HALF24);
    const q = assessQuality(volts, {
      encoding: 'float32',
      bits: 24,
      fullScaleV: 1,
      sampleRateHz: FS,
    });
    expect(q.verdict).toBe('ok');
    expect(q.bitsUsed).toBeCloseTo(Math.log2(HALF24), 1);
  });

  it('when the ADC or input is bad, it throws', () => {
    expect(() => assessQuality([1], {})).toThrow(RangeError);
    expect(() => assessQuality([1, 2, 3], { bits: 40 })).toThrow(RangeError);
    expect(() => assessQuality([1, NaN, 3], {})).toThrow(RangeError);
  });

  // Ringing impacts start from rest, so the first sample of each burst stands alone against
  // what came before; the samples after it must count as neighbours. Resonances at
  // 0.21–0.35·fs (5.4–9 kHz at 25.6 kHz), damping ratio 0.03–0.1 (common practice, no source).
  it('when bearing impacts ring a resonance at 0.21–0.35·fs, no spikes are reported, with or without noise', () => {
    for (const f of [0.21, 0.25, 0.28, 0.3, 0.35])
      for (const zeta of [0.03, 0.06, 0.1])
        for (const noise of [0, 0.02]) {
          const volts = ringingImpacts(f, zeta, noise).map((v) => 0.3 * v);
          const q = assessQuality(Float32Array.from(volts), {
            encoding: 'float32',
            bits: 24,
            sampleRateHz: FS,
          });
          expect({ f, zeta, noise, spikes: q.metrics.spikeCount }).toEqual({
            f,
            zeta,
            noise,
            spikes: 0,
          });
          expect(codes(q)).not.toContain('spikes');
        }
  });

  it('when single-sample spikes sit among ringing impacts, exactly those spikes are counted', () => {
    // Sparse impacts (one per 0.25 s) keep σ low, so each burst's peak exceeds 10 σ.
    const x = ringingImpacts(0.3, 0.05, 0.005, 16384, 0.25).map((v) => 0.05 * v);
    for (const i of [3001, 9002, 14003]) x[i] = x[i]! + 0.6;
    const q = assessQuality(Float32Array.from(x), {
      encoding: 'float32',
      bits: 24,
      sampleRateHz: FS,
    });
    expect(q.metrics.spikeCount).toBe(3);
    expect(codes(q)).toContain('spikes');
  });

  // A sensor amplifier that saturates at 80 % of the ADC's full scale: a sine driven 1.25×
  // past that level, held flat there (definition of hard limiting), plus a little noise.
  it('when the waveform is held flat at 80 % of full scale, below the rails, flat-top makes it unusable', () => {
    const g = gauss(3);
    const x = Int32Array.from({ length: 16384 }, (_, i) => {
      const v = 1.25 * 0.8 * Math.sin((2 * Math.PI * 117 * i) / FS);
      return Math.round(HALF24 * (Math.max(-0.8, Math.min(0.8, v)) + 1e-5 * g()));
    });
    const q = assessQuality(x, { bits: 24, sampleRateHz: FS });
    expect(codes(q)).not.toContain('clipped'); // never reaches the rails
    const f = q.findings.find((h) => h.code === 'flat-top')!;
    expect(f.severity).toBe('unusable');
    // fraction of a sine of amplitude 1.25·L above L: 2·acos(1/1.25)/π per period, both
    // sides (definition of the sine); the tolerance adds a hair
    const expected = (2 * Math.acos(1 / 1.25)) / Math.PI;
    expect(f.value).toBeGreaterThan(expected - 0.01);
    expect(f.value).toBeLessThan(expected + 0.03);
    expect(f.message).toContain('80 % of full scale');
  });

  it('when a sine is not limited, its crest is not a flat top, whatever its frequency', () => {
    // Tones from 5 Hz to fs/4 including exact sub-multiples of fs (few distinct phases).
    for (const hz of [5, 50, 117, 200, 800, 1600, 3200, 4000, 6400]) {
      const x = Int32Array.from({ length: 16384 }, (_, i) =>
        Math.round(0.8 * HALF24 * Math.sin((2 * Math.PI * hz * i) / FS + 0.3)),
      );
      const q = assessQuality(x, { bits: 24, sampleRateHz: FS });
      expect({ hz, flat: q.metrics.flatTopFraction }).toEqual({ hz, flat: 0 });
    }
  });

  // A dead or disconnected sensor on a 24-bit ±10 V input with a 100 mV/g sensor.
  it('when the input holds only 3 µV of noise, it is no machine signal, not under-range', () => {
    const g = gauss(11);
    const volts = Float32Array.from({ length: 16384 }, () => 3e-6 * g());
    const q = assessQuality(volts, VOLTS_INPUT);
    expect(codes(q)).toEqual(['no-signal']);
    expect(q.verdict).toBe('unusable');
    expect(q.findings[0]!.message).toMatch(/no machine signal.*connected/);
    expect(q.findings[0]!.message).not.toMatch(/raise the gain or range/);
    expect(q.metrics.rmsG).toBeCloseTo(3e-6 / 0.1, 6); // σ of the noise ÷ 0.1 V/g
  });

  it('when the input holds 15 µV of noise and 40 µV of 50 Hz mains hum, it is no machine signal', () => {
    const g = gauss(12);
    const volts = Float32Array.from(
      { length: 16384 },
      (_, i) => 15e-6 * g() + 40e-6 * Math.sin((2 * Math.PI * 50 * i) / FS),
    );
    const q = assessQuality(volts, VOLTS_INPUT);
    expect(codes(q)).toEqual(['no-signal']);
    expect(q.verdict).toBe('unusable');
  });

  it('when a quiet machine gives 2 mg RMS, it is a machine signal', () => {
    const g = gauss(13);
    // 2 mg RMS = 0.2 mV RMS at 100 mV/g: a 29.7 Hz tone of 0.28 mV peak (0.198 mV RMS)
    // plus 0.03 mV RMS of noise; RMS of a sum of uncorrelated parts = √(Σ RMS²)
    const volts = Float32Array.from(
      { length: 16384 },
      (_, i) => 0.28e-3 * Math.sin((2 * Math.PI * 29.7 * i) / FS) + 0.03e-3 * g(),
    );
    const q = assessQuality(volts, VOLTS_INPUT);
    expect(q.metrics.rmsG! / 2e-3).toBeCloseTo(1, 1);
    expect(q.metrics.rmsG).toBeGreaterThan(NO_SIGNAL_RMS_G);
    expect(codes(q)).not.toContain('no-signal');
  });

  // A sensor settling after power-up: 0.4 V decaying with τ = 1.5 s (first-order
  // settling) under a machine signal of 0.229 g RMS at 100 mV/g, one second captured.
  it('when a 0.4 V offset settles with τ = 1.5 s under the signal, drift is flagged', () => {
    const n = 25600;
    const amp = 0.0229 * Math.SQRT2; // 22.9 mV RMS sine
    const volts = Float32Array.from(
      { length: n },
      (_, i) => 0.4 * Math.exp(-i / FS / 1.5) + amp * Math.sin((2 * Math.PI * 49.6 * i) / FS),
    );
    const q = assessQuality(volts, {
      encoding: 'float32',
      bits: 24,
      fullScaleV: 10,
      sampleRateHz: FS,
    });
    const f = q.findings.find((h) => h.code === 'drift')!;
    expect(f.severity).toBe('suspect');
    expect(f.value).toBeGreaterThan(DRIFT_LINE_RATIO);
  });

  it('when a stationary slow tone has 1.5 cycles or more in the capture, it is not drift', () => {
    // The line through a sine of k cycles explains about 6/(πk)² of its variance
    // (projection of a sine onto a line, by definition): below the ratio for k ≥ 1.5.
    for (const cycles of [1.5, 1.75, 2, 2.5, 4, 10])
      for (const phase of [0, 0.8, 1.6, 2.4]) {
        const x = Int32Array.from({ length: 8192 }, (_, i) =>
          Math.round(0.3 * HALF24 * Math.sin((2 * Math.PI * cycles * i) / 8192 + phase)),
        );
        const q = assessQuality(x, { bits: 24 });
        expect(q.metrics.driftRatio).toBeLessThan(DRIFT_LINE_RATIO);
        expect(codes(q)).not.toContain('drift');
      }
  });

  // Guard band rule: equal power density in the guard band and below it puts
  // (1/2 − 1/2.56)/(1/2) = 21.875 % of the power in the guard band (definition).
  it('the guard-band threshold is the guard band’s share of the width, 21.875 %', () => {
    expect(ALIAS_GUARD_BAND_POWER_FRACTION).toBeCloseTo(0.21875, 12);
  });

  it('when 40 % or 25 % of the power lies in the guard band, alias-risk is raised; at 18 % it is not', () => {
    // a 1 kHz tone plus an 11 kHz tone (inside the 10–12.8 kHz guard band at 25.6 kHz);
    // a tone's power is amplitude²/2, so b²/(a² + b²) of the power is in the guard band
    const share = (p: number) => {
      const a = 0.3;
      const b = a * Math.sqrt(p / (1 - p));
      const x = Int32Array.from({ length: 16384 }, (_, i) =>
        Math.round(
          HALF24 *
            (a * Math.sin((2 * Math.PI * 1000 * i) / FS) +
              b * Math.sin((2 * Math.PI * 11000 * i) / FS)),
        ),
      );
      return assessQuality(x, { bits: 24, sampleRateHz: FS });
    };
    for (const p of [0.4, 0.25]) {
      const q = share(p);
      expect(q.metrics.guardBandPowerFraction).toBeCloseTo(p, 2);
      expect(codes(q)).toContain('alias-risk');
    }
    const ok = share(0.18);
    expect(ok.metrics.guardBandPowerFraction).toBeCloseTo(0.18, 2);
    expect(codes(ok)).not.toContain('alias-risk');
  });
});
