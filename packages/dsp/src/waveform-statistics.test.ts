import { describe, expect, it } from 'vitest';
import { integrateWaveform, trimmedPeakToPeak } from './integrate-waveform.ts';
import { integrateSineAmplitude } from './units.ts';
import { waveformStatistics } from './waveform-statistics.ts';
import { lcg32 } from './seeded-random.ts';

describe('waveform statistics', () => {
  // Definitions: sine peak = √2 × RMS = 1.41421 × RMS; Pearson kurtosis of a sine = 1.5 (moment definition)
  it('when a 1 g peak sine is measured, RMS 0.7071, crest factor √2 and kurtosis 1.5 come out', () => {
    const x = Float64Array.from(
      { length: 25600 },
      (_, i) => 0.2 + Math.sin((2 * Math.PI * 100 * i) / 25600),
    );
    const s = waveformStatistics(x);
    expect(s.mean).toBeCloseTo(0.2, 12);
    expect(s.rms).toBeCloseTo(Math.SQRT1_2, 12);
    expect(s.peak).toBeCloseTo(1, 9);
    expect(s.crestFactor).toBeCloseTo(Math.SQRT2, 9);
    expect(s.kurtosis).toBeCloseTo(1.5, 9);
  });

  // Gaussian kurtosis 3 (moment definition); Box–Muller from a fixed LCG
  it('when Gaussian noise is measured, kurtosis is near 3', () => {
    const lcg = lcg32(12345);
    const u = (): number => lcg() + 2 ** -33; // (0, 1): never 0, for the logarithm
    const x = Float64Array.from(
      { length: 200000 },
      () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u()),
    );
    expect(waveformStatistics(x).kurtosis).toBeCloseTo(3, 1);
  });

  it('when the signal is constant, crest factor and kurtosis are 0 rather than NaN', () => {
    const s = waveformStatistics([2, 2, 2]);
    expect([s.rms, s.crestFactor, s.kurtosis]).toEqual([0, 0, 0]);
    expect(() => waveformStatistics([])).toThrow(RangeError);
    expect(() => waveformStatistics([1, Infinity])).toThrow(RangeError);
  });
});

describe('waveform integration', () => {
  // Calculus of a sinusoid, g₀ = 9.80665 m/s² (computed): 1 g peak at 100 Hz → 15.6078 mm/s peak, 49.681 µm peak-to-peak
  it('when a 1 g peak 100 Hz sine is integrated in the frequency domain, it reads 15.6078 mm/s and 49.681 µm pk-pk', () => {
    const fs = 25600;
    const x = Float64Array.from({ length: 65536 }, (_, i) =>
      Math.sin((2 * Math.PI * 100 * i) / fs),
    );
    const v = integrateWaveform(x, { sampleRateHz: fs, to: 'mm/s' });
    expect(trimmedPeakToPeak(v) / 2).toBeCloseTo(15.6078, 3);
    const d = integrateWaveform(x, { sampleRateHz: fs, to: 'um' });
    expect(Math.abs(trimmedPeakToPeak(d) / 49.681 - 1)).toBeLessThan(1e-3);
    // velocity lags acceleration by 90°: v = −cos/ω for a = sin (sample 32768 is a whole number of cycles in)
    expect(v[32768]).toBeCloseTo(-15.6078, 2);
  });

  // v = a/(2πf), d = a/(2πf)² (calculus of a sinusoid, textbook); a fractional number of cycles must not matter (common practice, no source)
  it.each([13.3, 24.5, 57.1])(
    'when a %f Hz tone holds a fractional number of cycles, displacement pk-pk is within 0.5 percent',
    (f) => {
      const fs = 25600;
      const x = Float64Array.from({ length: 65536 }, (_, i) =>
        Math.sin((2 * Math.PI * f * i) / fs + 0.4),
      );
      const d = integrateWaveform(x, { sampleRateHz: fs, lowCutoffHz: 10, highCutoffHz: 1000 });
      expect(
        Math.abs(trimmedPeakToPeak(d) / (2 * integrateSineAmplitude(1, f, 'g', 'um')) - 1),
      ).toBeLessThan(5e-3);
    },
  );

  // band-limited synthesis (common practice, no source): a shorter output is the same waveform on a coarser grid
  it('when the output is synthesised at a quarter of the rate, it equals every fourth full-rate sample', () => {
    const fs = 25600;
    const x = Float64Array.from(
      { length: 16384 },
      (_, i) => Math.sin((2 * Math.PI * 37.3 * i) / fs) + 0.1 * Math.sin(i),
    );
    const full = integrateWaveform(x, { sampleRateHz: fs, lowCutoffHz: 10, highCutoffHz: 1000 });
    const quarter = integrateWaveform(x, {
      sampleRateHz: fs,
      lowCutoffHz: 10,
      highCutoffHz: 1000,
      outputLength: 4096,
    });
    for (let i = 0; i < 4096; i += 97) expect(quarter[i]).toBeCloseTo(full[4 * i]!, 9);
    expect(() =>
      integrateWaveform(x, { sampleRateHz: fs, highCutoffHz: 1000, outputLength: 1024 }),
    ).toThrow(/cannot hold/);
    expect(() => integrateWaveform(x, { sampleRateHz: fs, outputLength: 3000 })).toThrow(
      /power of two/,
    );
  });

  it('when a tone lies below the low cutoff, it is removed', () => {
    const fs = 1024;
    const x = Float64Array.from({ length: 8192 }, (_, i) => Math.sin((2 * Math.PI * 2 * i) / fs));
    const d = integrateWaveform(x, { sampleRateHz: fs, lowCutoffHz: 10 });
    expect(trimmedPeakToPeak(d)).toBeLessThan(1e-3 * 2 * integrateSineAmplitude(1, 2, 'g', 'um'));
    expect(() => integrateWaveform(x, { sampleRateHz: fs, lowCutoffHz: 0 })).toThrow(RangeError);
  });
});
