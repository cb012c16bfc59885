import { describe, expect, it } from 'vitest';
import { idealBandRms, recordSpectrum } from './ideal-band-rms.ts';

// Short records near a band edge. The ideal band is read from the whole record's lines,
// Δf = 1/T apart (fs / n), so its edge is only as sharp as the record is long: at T = 0.5 s
// the lines are 2 Hz apart and a tone within two lines (4 Hz) of the edge is shared between
// the inside and the outside by the Hann window's main lobe.
// Sources: Hann window, periodic form: a tone on a line k puts amplitudes 1/2 on k and 1/4 on
// k ± 1, i.e. powers 1/4 and 1/16, none elsewhere (Harris 1978, Proc. IEEE 66(1):51–83);
// velocity of a sinusoid v = a/(2πf), RMS = peak/√2 (textbook); g₀ = 9806.65 mm/s²
// (ISO 80000-3).
const G0 = 9806.65;
const FS = 2560;
const T = 0.5; // s: Δf = 2 Hz
const tone = (hz: number, peakG: number) =>
  Float64Array.from({ length: FS * T }, (_, i) => peakG * Math.sin((2 * Math.PI * hz * i) / FS));
const velocityRms = (hz: number, peakG: number) => (peakG * G0) / (2 * Math.PI * hz) / Math.SQRT2;
const band = (x: Float64Array) =>
  idealBandRms(recordSpectrum(x, FS), { loHz: 10, hiHz: 1000, from: 'g', to: 'mm/s' });

describe('idealBandRms on a 0.5 s record (lines 2 Hz apart) near the 10 Hz edge', () => {
  it('when a tone sits on the edge line, it reads the share of its main lobe at or above the edge', () => {
    // lines 10 and 12 Hz hold powers 1/4 and 1/16 of 3/8, weighted (1/2πf)²:
    // v/v₁₀ = √((1/4 + 1/16·(10/12)²) / (3/8)) = 0.88452 (hand arithmetic)
    const expected = Math.sqrt((0.25 + 0.0625 * (10 / 12) ** 2) / 0.375);
    expect(band(tone(10, 0.05)) / velocityRms(10, 0.05)).toBeCloseTo(expected, 4);
  });

  it('when a tone sits two lines (4 Hz) inside the edge, it reads in full', () => {
    // 14 Hz: lines 12, 14, 16 all inside; the 1/f weight across the lobe:
    // √((1/16·(14/12)² + 1/4 + 1/16·(14/16)²) / (3/8)) = 1.00651 (hand arithmetic)
    const expected = Math.sqrt((0.0625 * (14 / 12) ** 2 + 0.25 + 0.0625 * (14 / 16) ** 2) / 0.375);
    expect(band(tone(14, 0.05)) / velocityRms(14, 0.05)).toBeCloseTo(expected, 4);
  });

  it('when a tone sits two lines (4 Hz) outside the edge, none of it counts', () => {
    // 6 Hz: lines 4, 6, 8 Hz, all below 10 Hz
    expect(band(tone(6, 0.05))).toBeLessThan(1e-6 * velocityRms(6, 0.05));
  });

  it('when a tone sits one line (2 Hz) outside the edge, only its upper side line counts', () => {
    // 8 Hz: only line 10 Hz (power 1/16 of 3/8) is inside, weighted (8/10)²:
    // v/v₈ = √(1/16·(8/10)² / (3/8)) = 0.32660 (hand arithmetic)
    const expected = Math.sqrt((0.0625 * (8 / 10) ** 2) / 0.375);
    expect(band(tone(8, 0.05)) / velocityRms(8, 0.05)).toBeCloseTo(expected, 4);
  });
});
