import { describe, expect, it } from 'vitest';
import { deflateRawSync, inflateRawSync } from 'node:zlib';
import { analyzeSnapshot } from '@turnstone/dsp';
import {
  decodeSpectra,
  decodeSpectraDetail,
  encodeSpectra,
  SPECTRA_MAX_RELATIVE_ERROR,
  SPECTRA_RANGE_DB,
  SPECTRA_STEP_DB,
  storedSpectrum,
} from './spectra-codec.ts';
import { toneCounts } from '@turnstone/dsp/tone-record.test-support';

/** Largest relative error of decoded lines against the float64 values they came from. */
function maxRelativeError(want: ArrayLike<number>, got: Float32Array): number {
  let worst = 0;
  for (let i = 0; i < want.length; i++) {
    const w = want[i]!;
    if (w === 0) expect(got[i]).toBe(0);
    else worst = Math.max(worst, Math.abs(got[i]! - w) / w);
  }
  return worst;
}

const roundTrip = (values: ArrayLike<number>) =>
  decodeSpectra(encodeSpectra({ acceleration: values })).acceleration!;

describe('stored spectra: 16-bit log-amplitude code, deflated', () => {
  // Level of a field quantity, 20·log10 of the ratio (ISO 80000-3): half of a 0.01 dB step
  // is a ratio of 10^(0.005/20) = 1 + 5.7581e-4 (python3: 10**(0.005/20)-1 = 0.000575812),
  // and the decoded float32 adds at most 2^-24 = 5.96e-8 (IEEE 754 binary32): 5.7587e-4.
  it('states a worst-case relative error of 5.759e-4 (half of a 0.01 dB step) over 655.34 dB', () => {
    expect(SPECTRA_STEP_DB).toBe(0.01);
    expect(SPECTRA_RANGE_DB).toBeCloseTo(655.34, 9);
    expect(SPECTRA_MAX_RELATIVE_ERROR).toBeCloseTo(5.7587e-4, 8);
  });

  // From the definition above: values exactly half a step between two codes are the worst
  // case; the error there must reach the bound (so the bound is tight) and never pass it.
  it('keeps every line above the floor within the bound, and reaches it half-way between codes', () => {
    const ref = 3.7;
    const values = new Float64Array(6001);
    values[0] = ref;
    for (let k = 1; k < values.length; k++) {
      // 0 … 600 dB below ref: a code boundary (…+0.5 steps) every other line, arbitrary ones between.
      const steps = k % 2 ? 10 * k + 0.5 : 10 * k + 0.123 * (k % 7);
      values[k] = ref * 10 ** ((-steps * SPECTRA_STEP_DB) / 20);
    }
    const worst = maxRelativeError(values, roundTrip(values));
    expect(worst).toBeLessThanOrEqual(SPECTRA_MAX_RELATIVE_ERROR);
    expect(worst).toBeGreaterThan(0.99 * (10 ** (SPECTRA_STEP_DB / 40) - 1));
  });

  // Common practice, no source: a plant spectrum, a 1 g peak tone (0.7071 g RMS) at 100 Hz
  // over a little noise, as analyzeSnapshot computes it.
  it('round-trips the spectra analyzeSnapshot computes within the bound', () => {
    const a = analyzeSnapshot(
      toneCounts(
        { fs: 12800, n: 8192, tones: [[100, 1]], noiseG: 1e-3, seed: 7 },
        { speedRpm: 1480, fmaxHz: 5000, lines: 1600 },
      ),
    );
    const input = {
      acceleration: a.spectra.acceleration.values,
      velocity: a.spectra.velocity.values,
      envelope: a.spectra.envelope?.values,
      order: a.spectra.order?.values,
    };
    const blob = encodeSpectra(input);
    const out = decodeSpectra(blob);
    for (const kind of ['acceleration', 'velocity', 'envelope', 'order'] as const) {
      expect(out[kind]).not.toBeNull();
      expect(out[kind]!.length).toBe(input[kind]!.length);
      expect(maxRelativeError(input[kind]!, out[kind]!)).toBeLessThanOrEqual(
        SPECTRA_MAX_RELATIVE_ERROR,
      );
    }
    // 4 float32 spectra take 4 bytes a line; the code takes at most 2 before deflate.
    const lines = Object.values(input).reduce((n, v) => n + (v?.length ?? 0), 0);
    expect(blob.length).toBeLessThan(2 * lines);
  });

  it('keeps zeros exact, tiny spectra within the bound, and decodes lines under the floor as 0', () => {
    const ref = 2e-3;
    const below = (db: number) => ref * 10 ** (-db / 20);
    const values = [0, ref, 0, below(600), below(655), below(656), below(900), 0];
    const out = roundTrip(values);
    expect(Array.from(out.subarray(0, 3))).toEqual([expect.any(Number), expect.any(Number), 0]);
    expect(Math.abs(out[1]! - ref) / ref).toBeLessThanOrEqual(SPECTRA_MAX_RELATIVE_ERROR);
    expect(Math.abs(out[4]! - below(655)) / below(655)).toBeLessThanOrEqual(
      SPECTRA_MAX_RELATIVE_ERROR,
    );
    // 656 and 900 dB under the largest line: beyond the 655.34 dB range, stored as 0.
    expect([out[5], out[6], out[7]]).toEqual([0, 0, 0]);
    // A spectrum that is tiny as a whole keeps its relative precision (float32 normal range).
    const tiny = [1e-30, 3e-31, 7.5e-32];
    expect(maxRelativeError(tiny, roundTrip(tiny))).toBeLessThanOrEqual(SPECTRA_MAX_RELATIVE_ERROR);
    expect(Array.from(roundTrip([0, 0, 0]))).toEqual([0, 0, 0]);
    expect(Object.is(roundTrip([-0])[0], 0)).toBe(true);
  });

  it('stores empty and absent spectra as such', () => {
    const out = decodeSpectra(encodeSpectra({ acceleration: [], velocity: [1, 2], order: null }));
    expect(out.acceleration).toEqual(new Float32Array(0));
    expect(out.velocity!.length).toBe(2);
    expect(out.envelope).toBeNull();
    expect(out.order).toBeNull();
    const one = decodeSpectra(encodeSpectra({ acceleration: [], velocity: [1, 2] }), 'velocity');
    expect(one.acceleration).toBeNull();
    expect(one.velocity![1]).toBe(2); // the largest line is stored exactly
    expect(decodeSpectra(encodeSpectra({}))).toEqual({
      acceleration: null,
      velocity: null,
      envelope: null,
      order: null,
    });
  });

  it('refuses NaN, infinite and negative lines with the spectrum and line named', () => {
    expect(() => encodeSpectra({ velocity: [1, Number.NaN] })).toThrow(
      /velocity spectrum line 1 is NaN/,
    );
    expect(() => encodeSpectra({ envelope: [0, 0, -1e-9] })).toThrow(
      /envelope spectrum line 2 is -1e-9.*≥ 0/,
    );
    expect(() => encodeSpectra({ order: [Number.POSITIVE_INFINITY] })).toThrow(
      /order spectrum line 0 is Infinity/,
    );
  });

  it('refuses a BLOB of another format or a damaged one', () => {
    expect(() => decodeSpectra(Buffer.from([9, 1, 2]))).toThrow(/unknown format 9/);
    expect(() => decodeSpectra(Buffer.alloc(0))).toThrow(/unknown format/);
    const good = encodeSpectra({ acceleration: [1, 2, 3] });
    expect(() => decodeSpectra(good.subarray(0, good.length - 3))).toThrow();
  });

  it('reads rows written before the compact column from their float32 columns', () => {
    const old = Float32Array.from([0.5, 0.25, 0]);
    const row = {
      spectra: null,
      accelSpectrum: Buffer.from(old.buffer),
      velocitySpectrum: null,
      envelopeSpectrum: null,
      orderSpectrum: null,
    };
    expect(storedSpectrum(row, 'acceleration')).toEqual(old);
    expect(storedSpectrum(row, 'velocity')).toBeNull();
    // A row with the compact column reads it, whatever the old columns hold.
    const both = { ...row, spectra: encodeSpectra({ acceleration: [1, 0, 2] }) };
    const got = storedSpectrum(both, 'acceleration')!;
    expect(got[1]).toBe(0);
    expect(Math.abs(got[2]! - 2) / 2).toBeLessThanOrEqual(SPECTRA_MAX_RELATIVE_ERROR);
  });

  it('carries a detail (JSON) with the spectra, and reads BLOBs written without one', () => {
    // common practice, no source: a JSON value survives its own round trip unchanged.
    const detail = {
      peaks: [{ hz: 24.75, order: 1, amplitude: 0.0123 }],
      spectra: { velocity: { unit: 'mm/s', scale: 'rms', dfHz: 0.625, lines: 2 } },
      note: 'ünïcode ✓',
    };
    const values = [3, 0, 1.5e-4, 2];
    const withDetail = encodeSpectra({ acceleration: values, velocity: [1, 2] }, detail);
    expect(withDetail[0]).toBe(2);
    expect(decodeSpectraDetail(withDetail)).toEqual(detail);
    const out = decodeSpectra(withDetail);
    expect(maxRelativeError(values, out.acceleration!)).toBeLessThanOrEqual(
      SPECTRA_MAX_RELATIVE_ERROR,
    );
    expect(decodeSpectra(withDetail, 'velocity').velocity![1]).toBe(2);
    // The same spectra without a detail: format 1 as before, the detail undefined.
    const plain = encodeSpectra({ acceleration: values, velocity: [1, 2] });
    expect(plain[0]).toBe(1);
    expect(decodeSpectraDetail(plain)).toBeUndefined();
    expect(decodeSpectra(plain)).toEqual(out);
    // A detail cut short is refused, not read as something else.
    const cut = Buffer.concat([
      Buffer.from([2]),
      deflateRawSync(Buffer.concat([inflateRawSync(withDetail.subarray(1)).subarray(0, -2)])),
    ]);
    expect(() => decodeSpectraDetail(cut)).toThrow(SyntaxError);
  });
});
