import { describe, expect, it } from 'vitest';
import { aliasFrequency } from './alias-frequency.ts';
import { quantizationSnrDb } from './quantization-snr.ts';
import { findPeaks } from './spectral-peaks.ts';
import { welch } from './welch.ts';

describe('ideal quantization SNR', () => {
  // Kester, Analog Devices MT-001: 6.02·N + 1.76 dB; computed from it: 12 → 74.01, 16 → 98.09, 24 → 146.26 dB
  it.each([
    [12, 74.01],
    [16, 98.09],
    [24, 146.26],
  ])('when a converter has %i bits, the ideal SNR is %f dB', (bits, db) => {
    expect(quantizationSnrDb(bits)).toBeCloseTo(db, 2);
  });

  // Kester MT-001 (derivation): a full-scale sine quantized to 12 bits measures about 6.02·N + 1.76 dB
  it('when a full-scale sine is rounded to 12 bits, the measured SNR is within 0.5 dB of the formula', () => {
    const n = 1 << 16;
    const half = 2 ** 11;
    let signal = 0;
    let noise = 0;
    for (let i = 0; i < n; i++) {
      const x = (half - 0.5) * Math.sin(2 * Math.PI * 0.01234567 * i);
      const q = Math.round(x);
      signal += x * x;
      noise += (q - x) ** 2;
    }
    expect(10 * Math.log10(signal / noise)).toBeCloseTo(quantizationSnrDb(12), 0);
  });

  it('when bits are negative, it throws', () => {
    expect(() => quantizationSnrDb(-1)).toThrow(RangeError);
  });
});

describe('aliasing', () => {
  // Sampling theorem (Shannon 1949; Nyquist 1928), |f − k·fs| computed: at fs = 1 kHz, 1300 → 300, 900 → 100, 2600 → 400 Hz
  it.each([
    [1300, 300],
    [900, 100],
    [2600, 400],
    [250, 250],
  ])('when a %i Hz tone is sampled at 1 kHz, it appears at %i Hz', (f, alias) => {
    expect(aliasFrequency(f, 1000)).toBeCloseTo(alias, 9);
  });

  // Sampling theorem (Shannon 1949): a 1300 Hz tone sampled at 1 kHz appears at 300 Hz (|f − k·fs|), in the spectrum too
  it('when a 1300 Hz tone is sampled at 1 kHz, the spectrum peaks at 300 Hz', () => {
    const x = Float64Array.from({ length: 8192 }, (_, i) =>
      Math.sin((2 * Math.PI * 1300 * i) / 1000),
    );
    const r = welch(x, { sampleRateHz: 1000, nperseg: 2048, scaling: 'spectrum' });
    const [peak] = findPeaks(r.power, r.dfHz, { count: 1 });
    expect(peak!.hz).toBeCloseTo(300, 3);
  });
});
