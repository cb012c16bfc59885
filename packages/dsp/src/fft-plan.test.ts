import { describe, expect, it } from 'vitest';
import { getFftPlan } from './fft-plan.ts';
import { irfft, rfft } from './real-fft.ts';

function naiveDft(x: number[]): { re: number[]; im: number[] } {
  const n = x.length;
  const re: number[] = [];
  const im: number[] = [];
  for (let k = 0; k <= n / 2; k++) {
    let r = 0;
    let i = 0;
    for (let t = 0; t < n; t++) {
      r += x[t]! * Math.cos((2 * Math.PI * k * t) / n);
      i -= x[t]! * Math.sin((2 * Math.PI * k * t) / n);
    }
    re.push(r);
    im.push(i);
  }
  return { re, im };
}

describe('fft plans and rfft', () => {
  // numpy.fft.rfft([0, 1, 0, 0]) = [1, −1j, −1] (computed with numpy; also the DFT definition by hand)
  it('when rfft runs on [0, 1, 0, 0], it gives [1, −1j, −1] as numpy does', () => {
    const { re, im } = rfft([0, 1, 0, 0]);
    expect(Array.from(re)).toEqual([1, 0, -1]);
    expect(im[0]).toBeCloseTo(0, 15);
    expect(im[1]).toBeCloseTo(-1, 15);
    expect(im[2]).toBeCloseTo(0, 15);
  });

  // DFT definition (Oppenheim & Schafer); Bluestein 1970 for the non-power-of-two sizes
  it.each([2, 3, 7, 64, 100, 255])(
    'when rfft runs on %i samples, it equals the direct DFT sum',
    (n) => {
      const x = Array.from({ length: n }, (_, i) => Math.sin(i * 1.3) + 0.1 * i);
      const ours = rfft(x);
      const ref = naiveDft(x);
      for (let k = 0; k < ref.re.length; k++) {
        expect(ours.re[k]).toBeCloseTo(ref.re[k]!, 9);
        expect(ours.im[k]).toBeCloseTo(ref.im[k]!, 9);
      }
    },
  );

  // Parseval's theorem (common practice, no source)
  it('when a signal is transformed, Σx² equals the one-sided spectral energy (Parseval)', () => {
    const n = 1024;
    const x = Array.from({ length: n }, (_, i) => Math.cos(i * 0.37) * Math.exp(-i / 500));
    const { re, im } = rfft(x);
    let spectral = 0;
    for (let k = 0; k < re.length; k++) {
      const w = k === 0 || k === n / 2 ? 1 : 2;
      spectral += (w * (re[k]! ** 2 + im[k]! ** 2)) / n;
    }
    expect(spectral).toBeCloseTo(
      x.reduce((a, v) => a + v * v, 0),
      10,
    );
  });

  it.each([1, 2, 6, 16, 101, 1024])(
    'when irfft inverts rfft of %i samples, the signal comes back',
    (n) => {
      const x = Array.from({ length: n }, (_, i) => Math.sin(i) + (i % 3));
      const back = irfft(rfft(x), n);
      x.forEach((v, i) => expect(back[i]).toBeCloseTo(v, 10));
    },
  );

  // inverse DFT definition: the unscaled inverse is N × the scaled one
  it.each([16, 12])(
    'when a %i-point spectrum is inverted without scaling, it is N times the scaled inverse',
    (n) => {
      const plan = getFftPlan(n);
      const input = Float64Array.from(
        { length: 2 * n },
        (_, i) => Math.cos(i * 0.7) - 0.2 * (i % 5),
      );
      const scaled = new Float64Array(2 * n);
      const unscaled = new Float64Array(2 * n);
      plan.inverse(scaled, input);
      plan.inverseUnscaled(unscaled, input);
      scaled.forEach((v, i) => expect(unscaled[i]).toBeCloseTo(n * v, 10));
      const back = new Float64Array(2 * n);
      plan.forward(back, scaled);
      input.forEach((v, i) => expect(back[i]).toBeCloseTo(v, 10));
    },
  );

  it('when a plan is asked twice for one size, the same plan comes back', () => {
    expect(getFftPlan(4096)).toBe(getFftPlan(4096));
    expect(getFftPlan(1000)).toBe(getFftPlan(1000));
  });

  // DFT definition; common practice, no source, for the cache bound itself
  it('when recordings of many odd lengths are transformed, old plans make way and results stay exact', () => {
    const first = getFftPlan(1001);
    for (let n = 1003; n < 1003 + 2 * 12; n += 2) getFftPlan(n);
    const again = getFftPlan(1001);
    expect(again).not.toBe(first);
    const x = Array.from({ length: 1001 }, (_, i) => Math.cos(i * 0.11) + (i % 5) * 0.01);
    const ours = rfft(x);
    const ref = naiveDft(x);
    for (const k of [0, 1, 17, 250, 500]) {
      expect(ours.re[k]).toBeCloseTo(ref.re[k]!, 8);
      expect(ours.im[k]).toBeCloseTo(ref.im[k]!, 8);
    }
    // a shorter record after a longer one reuses the work buffers without leaking bins
    const short = rfft([0, 1, 0, 0]);
    expect(Array.from(short.re)).toEqual([1, 0, -1]);
  });

  it('when the size or input is bad, it throws', () => {
    expect(() => getFftPlan(0)).toThrow(RangeError);
    expect(() => rfft([])).toThrow(RangeError);
    expect(() => rfft([1, NaN])).toThrow(/non-finite/);
    expect(() => irfft({ re: new Float64Array(2), im: new Float64Array(2) }, 8)).toThrow(
      RangeError,
    );
  });
});
