/**
 * analyzeSnapshot's overall values over ideal bands: tones either side of the ISO band edges,
 * high-passes, and overall bands with their own span.
 */
import { describe, expect, it } from 'vitest';
import { analyzeSnapshot, type SnapshotInput } from './analyze-snapshot.ts';
import { ISO_BAND_HZ, isoBandForSpeed } from './iso-overall-band.ts';
import { COUNTS_PER_G, toneCounts } from './tone-record.test-support.ts';

/** Standard gravity, mm/s² per g (ISO 80000-3). */
const G_MM_S2 = 9806.65;

/** A record of tones (Hz, g peak) at any rate and length, in 24-bit counts, nothing else. */
const toneRecord = (
  fs: number,
  n: number,
  tones: [number, number][],
  extra: Partial<SnapshotInput> = {},
): SnapshotInput => toneCounts({ fs, n, tones, phaseRad: 0.3 }, extra);

/** Velocity RMS of a sine of `peakG` at f: v = a/(2πf), RMS = peak/√2. */
const toneVelocityRms = (f: number, peakG: number) =>
  (peakG * G_MM_S2) / (2 * Math.PI * f) / Math.SQRT2;

describe('overall values over ideal bands', () => {
  // v = a/(2πf): 0.05 g peak at 12 Hz = 0.05·9806.65/(2π·12)/√2 = 4.598 mm/s RMS (computed).
  // ISO 20816-1/-3 give the overall band by its edges (from memory); taken as ideal here.
  it('when a 12 Hz tone of 0.05 g peak is analysed, overall velocity reads 4.598 mm/s within 2 %', () => {
    expect(toneVelocityRms(12, 0.05)).toBeCloseTo(4.598, 3);
    for (const [fs, n] of [
      [25600, 65536],
      [12800, 8192],
    ] as const) {
      const r = analyzeSnapshot(toneRecord(fs, n, [[12, 0.05]], { speedRpm: 1480 }));
      expect(r.overall.isoBandHz).toEqual([10, 1000]);
      expect(Math.abs(r.overall.velocityRmsMmS / 4.598 - 1)).toBeLessThan(0.02);
    }
  });

  // v = a/(2πf) per tone; ideal 10–1000 Hz band (ISO 20816-3, from memory): a tone 2 Hz or
  // more inside the edge counts in full, one 2 Hz or more outside counts ≤ 2 %.
  it.each([4, 8, 12, 15, 50, 500, 998])(
    'when a %s Hz tone is recorded for 2.56 s, it counts within 2 % inside the band and ≤ 2 % outside',
    (f) => {
      const r = analyzeSnapshot(toneRecord(25600, 65536, [[f, 0.05]], { speedRpm: 1480 }));
      const exact = toneVelocityRms(f, 0.05);
      const ratio = r.overall.velocityRmsMmS / exact;
      if (f >= 12 && f <= 998) expect(Math.abs(ratio - 1)).toBeLessThan(0.02);
      else expect(ratio).toBeLessThan(0.02);
    },
  );

  // v = a/(2πf); slow machines take 2–1000 Hz (ISO 20816-3, from memory). 1× of a
  // 150 r/min shaft is 2.5 Hz, of a 300 r/min shaft 5 Hz; 3.2 s records (8 and 16 turns).
  it.each([
    [150, 2.5],
    [300, 5],
  ])('when a %s r/min shaft is recorded, its 1× (%s Hz) reads within 2 %', (rpm, f) => {
    const r = analyzeSnapshot(
      toneRecord(
        2560,
        8192,
        [
          [f, 0.02],
          [4 * f, 0.01],
          [120, 0.05],
        ],
        {
          speedRpm: rpm,
          fmaxHz: 1000,
        },
      ),
    );
    expect(r.overall.isoBandHz).toEqual([2, 1000]);
    const exact = Math.hypot(
      toneVelocityRms(f, 0.02),
      toneVelocityRms(4 * f, 0.01),
      toneVelocityRms(120, 0.05),
    );
    expect(Math.abs(r.overall.velocityRmsMmS / exact - 1)).toBeLessThan(0.02);
  });

  // ISO 20816-3 (from memory): 10–1000 Hz above 600 r/min, 2–1000 Hz for 120–600 r/min,
  // so 600 r/min itself takes 2–1000 Hz.
  it.each([
    [599, [2, 1000]],
    [600, [2, 1000]],
    [601, [10, 1000]],
  ])('when the shaft turns at %s r/min, the ISO band is %j Hz', (rpm, band) => {
    const r = analyzeSnapshot(toneRecord(2560, 4096, [[30, 0.1]], { speedRpm: rpm }));
    expect(r.overall.isoBandHz).toEqual(band);
    expect(ISO_BAND_HZ[isoBandForSpeed(rpm)]).toEqual(band);
  });

  // A sensor settling after power-up: an offset of 0.4 V (4 g at 100 mV/g) decaying with
  // τ = 1.5 s (first-order response, common practice, no source) on top of a 50 Hz tone of
  // 0.3 g peak. Over [10 Hz, Fmax] the overall acceleration is the tone's 0.3/√2 g,
  // its kurtosis a sine's 1.5 and its crest factor √2 (moment definitions).
  it('when a settling offset decays under the machine signal, the high-passed overall values ignore it', () => {
    const fs = 12800;
    const n = 65536;
    const samples = Int32Array.from({ length: n }, (_, i) => {
      const t = i / fs;
      const g = 4 * Math.exp(-t / 1.5) + 0.3 * Math.sin(2 * Math.PI * 50 * t);
      return Math.round(g * COUNTS_PER_G * 0.1); // 100 mV/g into a 24-bit, ±10 V converter
    });
    const input: SnapshotInput = {
      ...toneRecord(fs, n, []),
      samples,
      adc: { bits: 24, fullScaleV: 10 },
      speedRpm: 1480,
    };
    const r = analyzeSnapshot(input);
    expect(r.overall.accelBandHz).toEqual([10, fs / 2.56]);
    expect(Math.abs(r.overall.accelRmsG / (0.3 / Math.SQRT2) - 1)).toBeLessThan(0.02);
    expect(r.overall.kurtosis).toBeCloseTo(1.5, 1);
    expect(r.overall.crestFactor).toBeCloseTo(Math.SQRT2, 1);
    // the same record without the offset reads the same
    const clean = analyzeSnapshot(toneRecord(fs, n, [[50, 0.3]], { speedRpm: 1480 }));
    expect(Math.abs(r.overall.accelRmsG / clean.overall.accelRmsG - 1)).toBeLessThan(0.02);
  });

  // The band is stated with the value: a high-pass given by the caller is the one used.
  it('when a 2 Hz acceleration high-pass is asked, a 5 Hz tone counts in the overall acceleration', () => {
    const input = toneRecord(
      2560,
      16384,
      [
        [5, 0.1],
        [100, 0.1],
      ],
      { speedRpm: 1480 },
    );
    const at10 = analyzeSnapshot(input);
    const at2 = analyzeSnapshot(input, { accelerationHighPassHz: 2 });
    expect(at10.overall.accelBandHz).toEqual([10, 1000]);
    expect(at2.overall.accelBandHz).toEqual([2, 1000]);
    expect(at10.overall.accelRmsG).toBeCloseTo(0.1 / Math.SQRT2, 3);
    expect(at2.overall.accelRmsG).toBeCloseTo(0.1, 3); // √(2 · (0.1/√2)²)
  });

  // v = a/(2πf) per tone: a velocity band with its own span 10–5000 Hz counts a 3 kHz tone
  // the ISO 10–1000 Hz value leaves out (ISO 20816-3 band edges, from memory).
  it('when an overall velocity band has its own span, it reads that span, not the ISO band', () => {
    const tones: [number, number][] = [
      [100, 0.2],
      [3000, 5],
    ];
    const r = analyzeSnapshot(
      toneRecord(25600, 65536, tones, {
        speedRpm: 1480,
        bands: [
          { key: 'iso', kind: 'overall', unit: 'mm/s' },
          { key: 'wide', kind: 'overall', loHz: 10, hiHz: 5000, unit: 'mm/s' },
        ],
      }),
    );
    const v = Object.fromEntries(r.bandValues.map((b) => [b.key, b.value]));
    const iso = toneVelocityRms(100, 0.2);
    const wide = Math.hypot(iso, toneVelocityRms(3000, 5));
    expect(Math.abs(v.iso! / iso - 1)).toBeLessThan(0.01);
    expect(Math.abs(v.wide! / wide - 1)).toBeLessThan(0.01);
    expect(v.wide! / v.iso!).toBeGreaterThan(1.2);
  });

  // d = a/(2πf)² per tone (µm: a in mm/s² over (2πf)², × 1000); the peak-to-peak of the sum
  // is taken from its definition on a fine grid over one period, not from the largest line.
  it('when a displacement band has a span, its peak-to-peak is the waveform’s, not twice the largest line', () => {
    const tones: [number, number][] = [
      [25, 0.2],
      [50, 0.5],
      [75, 0.6],
    ];
    const r = analyzeSnapshot(
      toneRecord(25600, 65536, tones, {
        speedRpm: 1500,
        bands: [
          { key: 'd', kind: 'overall', loHz: 10, hiHz: 1000, unit: 'um', measure: 'peak' },
          { key: 'line', kind: 'hz', loHz: 10, hiHz: 1000, unit: 'um', measure: 'peak' },
        ],
      }),
    );
    let min = Infinity;
    let max = -Infinity;
    for (let i = 0; i < 100_000; i++) {
      const t = i / 100_000 / 25;
      let d = 0;
      for (const [f, a] of tones) {
        d -= ((a * G_MM_S2 * 1000) / (2 * Math.PI * f) ** 2) * Math.sin(2 * Math.PI * f * t + 0.3);
      }
      min = Math.min(min, d);
      max = Math.max(max, d);
    }
    const pkpk = max - min;
    const v = Object.fromEntries(r.bandValues.map((b) => [b.key, b.value]));
    expect(Math.abs((2 * v.d!) / pkpk - 1)).toBeLessThan(0.01);
    // the largest line alone (the 25 Hz tone's 159 µm pk-pk) is not the waveform's
    expect(Math.abs((2 * v.line!) / pkpk - 1)).toBeGreaterThan(0.1);
  });

  it('when an overall span is malformed, the band list is refused', () => {
    const input = toneRecord(2560, 4096, [[30, 0.1]], {
      bands: [{ key: 'bad', kind: 'overall', loHz: 100, hiHz: 10 }],
    });
    expect(() => analyzeSnapshot(input)).toThrow(/overall span/);
  });
});
