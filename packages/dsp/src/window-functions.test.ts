import { describe, expect, it } from 'vitest';
import { getWindow, parseWindowName, windowResponse } from './window-functions.ts';

describe('window figures', () => {
  // Harris 1978, Proc. IEEE 66(1), table 1 (periodic windows, N = 4096)
  it.each([
    ['rect', 1.0, 1.0, 3.92],
    ['hann', 0.5, 1.5, 1.42],
    ['hamming', 0.54, 1.363, 1.75],
  ] as const)(
    'when %s is built with 4096 points, coherent gain is %f and ENBW %f bins',
    (name, cg, enbw, scallopDb) => {
      const w = getWindow(name, 4096);
      expect(w.coherentGain).toBeCloseTo(cg, 4);
      expect(w.enbwBins).toBeCloseTo(enbw, 3);
      expect(-20 * Math.log10(windowResponse(w, 0.5))).toBeCloseTo(scallopDb, 2);
    },
  );

  // scipy's flat-top coefficients (D'Antona & Ferrero 2006), computed from them: CG 0.2156, ENBW 3.770, scallop 0.01 dB
  it('when flat-top is built with 4096 points, ENBW is about 3.77 bins and scalloping below 0.02 dB', () => {
    const w = getWindow('flattop', 4096);
    expect(w.enbwBins).toBeCloseTo(3.77, 2);
    expect(w.coherentGain).toBeCloseTo(0.2156, 4);
    expect(-20 * Math.log10(windowResponse(w, 0.5))).toBeLessThan(0.02);
  });

  // definition (Harris 1978): the closed-form kernel equals the direct sum
  it('when the window response is evaluated in closed form, it equals the direct DTFT sum', () => {
    for (const name of ['rect', 'hann', 'hamming', 'flattop'] as const) {
      const w = getWindow(name, 256);
      for (const delta of [0, 0.25, 0.5, 1, 1.7, 3.2]) {
        let re = 0;
        let im = 0;
        for (let i = 0; i < 256; i++) {
          re += w.values[i]! * Math.cos((-2 * Math.PI * i * delta) / 256);
          im += w.values[i]! * Math.sin((-2 * Math.PI * i * delta) / 256);
        }
        expect(windowResponse(w, delta)).toBeCloseTo(Math.hypot(re, im) / w.sum, 12);
      }
    }
  });

  // scipy.signal.get_window('hann', 8, fftbins=True) = [0, .146, .5, .854, 1, .854, .5, .146] (from memory)
  it('when a periodic Hann of 8 points is built, it starts at 0 and peaks at 1 in the middle', () => {
    const w = getWindow('hann', 8).values;
    expect(w[0]).toBe(0);
    expect(w[4]).toBeCloseTo(1, 15);
    expect(w[2]).toBeCloseTo(0.5, 15);
    expect(w[1]).toBeCloseTo(w[7]!, 15);
  });

  it('when a window is asked twice, the cached instance comes back', () => {
    expect(getWindow('hann', 1024)).toBe(getWindow('hann', 1024));
  });

  it('when the name or length is wrong, it throws', () => {
    expect(() => getWindow('kaiser' as never, 8)).toThrow(TypeError);
    expect(() => getWindow('hann', 0)).toThrow(RangeError);
    expect(() => parseWindowName('blackman')).toThrow(/use one of/);
  });
});
