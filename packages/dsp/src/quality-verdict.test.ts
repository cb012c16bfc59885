import { describe, expect, it } from 'vitest';
import {
  assessQuality,
  CLIPPED_FRACTION_UNUSABLE,
  UNDER_RANGE_SUSPECT_BITS,
  UNDER_RANGE_UNUSABLE_BITS,
} from './quality-verdict.ts';

const FS = 25600;
const HALF24 = 2 ** 23;

/** Deterministic pseudo-noise in [−0.5, 0.5) (32-bit LCG). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32 - 0.5;
  };
}

/** 24-bit counts of a 117 Hz tone at `fraction` of full scale plus a little noise. */
function capture24(fraction: number, n = 16384, seed = 1): Int32Array {
  const r = lcg(seed);
  return Int32Array.from({ length: n }, (_, i) =>
    Math.round(HALF24 * (fraction * Math.sin((2 * Math.PI * 117 * i) / FS) + 0.001 * r())),
  );
}

const codes = (q: ReturnType<typeof assessQuality>): string[] => q.findings.map((f) => f.code);

describe('quality verdict', () => {
  // issue 3: a clean 24-bit capture is ok (common practice, no source)
  it('when a clean 24-bit capture uses half the range, the verdict is ok with no findings', () => {
    const q = assessQuality(capture24(0.5), { bits: 24, sampleRateHz: FS });
    expect(q.verdict).toBe('ok');
    expect(q.findings).toEqual([]);
    expect(q.bitsUsed).toBeCloseTo(Math.log2(HALF24), 1); // peak-to-peak ≈ one full scale
  });

  // issue 3: clipping is flagged; above a small fraction the capture is unusable
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

  // issue 3: 3-bit signals are flagged; Kester MT-001 for the SNR of the bits used
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

  // issue 3: aliased tones are flagged. A 1450 Hz tone sampled at 1 kHz folds to 450 Hz,
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
});
