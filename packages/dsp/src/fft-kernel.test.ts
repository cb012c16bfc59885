import { describe, expect, it, vi } from 'vitest';
import { fftKernel } from './fft-kernel.ts';
import { fftJsPlan, getFftPlan } from './fft-plan.ts';
import { welch } from './welch.ts';
import { lcg32 } from './seeded-random.ts';

// The WebAssembly kernel against the direct DFT sum (the definition, Oppenheim & Schafer)
// and against fft.js on the same input. The scipy checks in tests/reference run on
// whichever path is active; the project `unit-fft-js` runs every other dsp test on fft.js
// too (not this file: it tests the kernel itself, which TURNSTONE_FFT=js switches off).

function directDft(re: number[], im: number[], sign: -1 | 1): { re: number[]; im: number[] } {
  const n = re.length;
  const outRe: number[] = [];
  const outIm: number[] = [];
  for (let k = 0; k < n; k++) {
    let r = 0;
    let i = 0;
    for (let t = 0; t < n; t++) {
      const a = (sign * 2 * Math.PI * ((k * t) % n)) / n;
      r += re[t]! * Math.cos(a) - im[t]! * Math.sin(a);
      i += re[t]! * Math.sin(a) + im[t]! * Math.cos(a);
    }
    outRe.push(r);
    outIm.push(i);
  }
  return { re: outRe, im: outIm };
}

function signal(n: number, seed: number): Float64Array {
  const u = lcg32(seed);
  return Float64Array.from({ length: n }, () => u() - 0.5);
}

function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]!));
  return m;
}

describe('the WebAssembly FFT kernel', () => {
  const found = fftKernel();
  if (!found) throw new Error('no WebAssembly kernel (TURNSTONE_FFT=js, or no WebAssembly SIMD)');
  const kernel = found;

  it('when the runtime has WebAssembly SIMD, the plans and Welch run on the kernel', () => {
    const complexPlan = vi.spyOn(kernel, 'complexPlan');
    const welchSum = vi.spyOn(kernel, 'welchSum');
    try {
      // 2048 points: a size no other test in this file plans, so the plan is built here.
      const plan = getFftPlan(2048);
      expect(complexPlan).toHaveBeenCalledWith(2048);
      const x = signal(4096, 5);
      const out = new Float64Array(4096);
      plan.forward(out, x);
      const direct = new Float64Array(4096);
      kernel.complexPlan(2048).forward(direct, x);
      expect(Array.from(out)).toEqual(Array.from(direct));
      welch(signal(1024, 9), { sampleRateHz: 1000, nperseg: 256 });
      expect(welchSum).toHaveBeenCalledTimes(1);
    } finally {
      complexPlan.mockRestore();
      welchSum.mockRestore();
    }
  });

  it('when TURNSTONE_FFT=js, a fresh module has no kernel (callers fall back to fft.js)', async () => {
    vi.stubEnv('TURNSTONE_FFT', 'js');
    vi.resetModules();
    try {
      const fresh = await import('./fft-kernel.ts');
      expect(fresh.fftKernel()).toBeNull();
    } finally {
      vi.unstubAllEnvs();
      vi.resetModules();
    }
  });

  it.each([2, 4, 8, 16, 32, 128, 512])(
    'when %i complex points go forward and back, each matches the direct DFT to 1e-12',
    (n) => {
      const x = signal(2 * n, n);
      const re = Array.from({ length: n }, (_, i) => x[2 * i]!);
      const im = Array.from({ length: n }, (_, i) => x[2 * i + 1]!);
      const plan = kernel.complexPlan(n);
      for (const sign of [-1, 1] as const) {
        const out = new Float64Array(2 * n);
        if (sign === -1) plan.forward(out, x);
        else plan.inverseUnscaled(out, x);
        const ref = directDft(re, im, sign);
        const scale = Math.max(maxAbs(ref.re), maxAbs(ref.im));
        for (let k = 0; k < n; k++) {
          expect(Math.abs(out[2 * k]! - ref.re[k]!)).toBeLessThan(1e-12 * scale);
          expect(Math.abs(out[2 * k + 1]! - ref.im[k]!)).toBeLessThan(1e-12 * scale);
        }
      }
    },
  );

  it.each([8, 64, 4096, 65536])(
    'when %i reals are transformed, the kernel and fft.js agree to 1e-13 of the largest bin',
    (n) => {
      const x = signal(n, 7);
      const ours = new Float64Array(n + 2);
      const theirs = new Float64Array(2 * n);
      kernel.realPlan(n).realForward(ours, x);
      fftJsPlan(n).realForward(theirs, x);
      const scale = maxAbs(theirs.subarray(0, n + 2));
      for (let i = 0; i < n + 2; i++) {
        expect(Math.abs(ours[i]! - theirs[i]!)).toBeLessThan(1e-13 * scale);
      }
    },
  );

  it.each([8, 16, 1024, 32768])(
    'when a %i-point real spectrum is inverted, the signal comes back to 1e-13',
    (n) => {
      const x = signal(n, 11);
      const spectrum = new Float64Array(n + 2);
      const plan = kernel.realPlan(n);
      plan.realForward(spectrum, x);
      const back = new Float64Array(n);
      plan.realInverse(back, spectrum);
      for (let i = 0; i < n; i++) expect(Math.abs(back[i]! - x[i]!)).toBeLessThan(1e-13);
    },
  );

  it('when an inverse magnitude is taken, it is |z| of fft.js’s unscaled inverse', () => {
    const n = 1024;
    const x = signal(2 * n, 3);
    const ours = new Float64Array(n);
    kernel.complexPlan(n).inverseMagnitude(ours, x);
    const z = new Float64Array(2 * n);
    fftJsPlan(n).inverseUnscaled(z, x);
    for (let i = 0; i < n; i++) {
      expect(ours[i]).toBeCloseTo(Math.hypot(z[2 * i]!, z[2 * i + 1]!), 11);
    }
  });

  it('when Welch sums are taken, each segment’s mean is removed before the window', () => {
    // Two segments of 8 with step 4 and a rectangular window: the sum of |DFT(x − mean)|²
    // over the segments, checked bin by bin against the direct DFT (definition).
    const data = Float64Array.from([3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8]);
    const window = new Float64Array(8).fill(1);
    const power = new Float64Array(5);
    kernel.welchSum(data, 2, 4, window, true, power);
    const expected = new Array<number>(5).fill(0);
    for (const start of [0, 4]) {
      const seg = Array.from(data.subarray(start, start + 8));
      const mean = seg.reduce((a, v) => a + v, 0) / 8;
      const ref = directDft(
        seg.map((v) => v - mean),
        new Array<number>(8).fill(0),
        -1,
      );
      for (let k = 0; k < 5; k++) expected[k]! += ref.re[k]! ** 2 + ref.im[k]! ** 2;
    }
    expected.forEach((v, k) => expect(power[k]).toBeCloseTo(v, 10));
  });
});
