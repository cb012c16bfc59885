import { describe, expect, it } from 'vitest';
import { analyzeSnapshot, type SnapshotInput } from './analyze-snapshot.ts';
import { bandRms } from './band-rms.ts';
import { ISO_BAND_HZ, isoBandForSpeed } from './iso-overall-band.ts';
import { welch } from './welch.ts';

const FS = 25600;
const N = 65536;
const COUNTS_PER_G = 0.1 * 2 ** 23; // 100 mV/g into a 24-bit, 1 V converter

/** 24-bit counts of a sum of tones (amplitudes in g peak) plus a little deterministic noise. */
function snapshot(
  tones: [number, number][],
  extra: Partial<SnapshotInput> = {},
  n = N,
): SnapshotInput {
  let s = 99;
  const samples = Int32Array.from({ length: n }, (_, i) => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    let g = 1e-4 * (s / 2 ** 32 - 0.5);
    for (const [f, a] of tones) g += a * Math.sin((2 * Math.PI * f * i) / FS + 0.1);
    return Math.round(g * COUNTS_PER_G);
  });
  return {
    samples,
    encoding: 'int32',
    sampleRateHz: FS,
    adc: { bits: 24, fullScaleV: 1 },
    sensor: { sensitivityMvPerG: 100 },
    ...extra,
  };
}

describe('analyzeSnapshot', () => {
  // Calculus of a sinusoid (v = a/2πf, d = a/(2πf)², RMS = peak/√2): 1 g peak at 100 Hz → 0.7071 g RMS, 15.61 mm/s peak (11.04 RMS), 49.68 µm pk-pk
  it('when a 1 g peak 100 Hz tone is analysed, the overall values are 0.7071 g, 11.04 mm/s and 49.68 µm pk-pk', () => {
    const r = analyzeSnapshot(snapshot([[100, 1]], { speedRpm: 1500 }));
    expect(r.overall.accelRmsG).toBeCloseTo(Math.SQRT1_2, 4);
    expect(r.overall.accelPeakG).toBeCloseTo(1, 3);
    // within 0.2 %: the 1/f weight differs across the three lines of Hann's main lobe
    expect(Math.abs(r.overall.velocityRmsMmS / (15.6078 / Math.SQRT2) - 1)).toBeLessThan(2e-3);
    expect(Math.abs(r.overall.displacementPkPkUm / 49.681 - 1)).toBeLessThan(2e-3);
    expect(r.overall.crestFactor).toBeCloseTo(Math.SQRT2, 2);
    // on the middle 80 % (204.8 cycles) a sine's kurtosis is 1.5 to within 1e-3
    expect(r.overall.kurtosis).toBeCloseTo(1.5, 2);
    expect(r.overall.isoBandHz).toEqual([10, 1000]);
    expect(r.overall.accelBandHz).toEqual([10, FS / 2.56]);
    expect(r.quality.verdict).toBe('ok');
  });

  // Harris 1978 (Hann kernel) + interpolation: the largest peak is the tone, read between lines
  it('when a tone sits between lines, the first peak gives its frequency, order and RMS amplitude', () => {
    const r = analyzeSnapshot(
      snapshot(
        [
          [101.3, 0.5],
          [24.7, 0.1],
        ],
        { speedRpm: 1482 },
      ),
    );
    const [p] = r.peaks;
    expect(r.peaks).toHaveLength(10);
    expect(p!.hz).toBeCloseTo(101.3, 2);
    expect(p!.amplitude).toBeCloseTo(0.5 / Math.SQRT2, 3);
    expect(p!.order).toBeCloseTo(101.3 / (1482 / 60), 3);
    expect(r.peaks[1]!.hz).toBeCloseTo(24.7, 1);
  });

  // ISO 20816-3 (from memory): 2–1000 Hz band at or below 600 r/min
  it('when the machine turns below 600 r/min, the ISO band is 2–1000 Hz; a 5 Hz tone counts only then', () => {
    const slow = analyzeSnapshot(snapshot([[5, 0.05]], { speedRpm: 300 }));
    const fast = analyzeSnapshot(snapshot([[5, 0.05]], { speedRpm: 1500 }));
    expect(slow.overall.isoBand).toBe('below600');
    expect(fast.overall.isoBand).toBe('above600');
    expect(slow.overall.velocityRmsMmS).toBeGreaterThan(100 * fast.overall.velocityRmsMmS);
  });

  // Parseval (common practice, no source): frequency-domain overall equals time-domain RMS
  it('when broadband noise is analysed, the spectrum’s band RMS matches the time-domain RMS within 1 %', () => {
    let s = 5;
    const samples = Int32Array.from({ length: N }, () => {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      return Math.round((s / 2 ** 32 - 0.5) * 1e6);
    });
    const input: SnapshotInput = { ...snapshot([]), samples };
    const r = analyzeSnapshot(input);
    const full = welch(
      Float64Array.from(samples, (c) => c / COUNTS_PER_G),
      { sampleRateHz: FS, scaling: 'spectrum' },
    );
    // over the band the overall acceleration states (10 Hz … Fmax)
    const fromSpectrum = bandRms(
      { power: full.power, dfHz: full.dfHz, enbwBins: full.enbwBins },
      { loHz: r.overall.accelBandHz[0], hiHz: r.overall.accelBandHz[1] },
    );
    expect(Math.abs(fromSpectrum / r.overall.accelRmsG - 1)).toBeLessThan(0.01);
    const stored = r.spectra.acceleration;
    expect(stored.values).toBeInstanceOf(Float32Array);
    expect(stored.values.length).toBe(3201); // 0 … Fmax at 3.125 Hz (3200 lines)
    expect(stored.dfHz).toBe(3.125);
    expect(stored.averages).toBe(15);
  });

  // Fyfe & Munck 1997: with a tach, the order spectrum comes from computed order tracking
  it('when tach pulses are given, speed comes from the tach and the order spectrum is tracked', () => {
    const pulses = Array.from({ length: 64 }, (_, k) => k / 25);
    const r = analyzeSnapshot(snapshot([[50, 0.2]], { tach: { pulseTimesS: pulses } }));
    expect(r.speed.source).toBe('tach');
    expect(r.speed.rpm).toBeCloseTo(1500, 6);
    expect(r.spectra.order!.method).toBe('computed-order-tracking');
    const o = r.spectra.order!;
    const k = Math.round(2 / o.dOrder);
    expect(o.values[k]).toBeCloseTo(0.2 / Math.SQRT2, 3);
  });

  it('when only an rpm is given, the order axis is the Hz axis over shaft speed', () => {
    const r = analyzeSnapshot(snapshot([[100, 1]], { speedRpm: 1500 }));
    expect(r.speed).toEqual({ rpm: 1500, hz: 25, source: 'rpm' });
    expect(r.spectra.order!.method).toBe('hz-axis');
    expect(r.spectra.order!.dOrder).toBeCloseTo(3.125 / 25, 12);
    expect(r.spectra.order!.values.length).toBe(Math.floor(100 / 0.125) + 1); // up to 100 orders
  });

  // common practice, no source: running speed from the 1× peak near nominal
  it('when only a nominal speed is known, running speed is estimated from the 1× peak', () => {
    const r = analyzeSnapshot(
      snapshot(
        [
          [24.61, 0.3],
          [49.22, 0.1],
        ],
        { nominalRpm: 1480 },
      ),
    );
    expect(r.speed.source).toBe('estimated');
    expect(r.speed.rpm!).toBeCloseTo(24.61 * 60, 0);
    // noise only: nothing stands out near nominal, so no speed is claimed
    const noise = analyzeSnapshot(snapshot([[2000, 0.01]], { nominalRpm: 1480 }));
    expect(noise.speed.source).toBe('none');
    const none = analyzeSnapshot(snapshot([[100, 1]]));
    expect(none.speed).toEqual({ rpm: null, hz: null, source: 'none' });
    expect(none.spectra.order).toBeNull();
    expect(none.peaks[0]!.order).toBeNull();
  });

  // Randall & Antoni 2011: envelope of an amplitude-modulated resonance shows the modulation
  it('when a resonance is modulated at a bearing rate, the envelope spectrum shows that rate', () => {
    const samples = Int32Array.from({ length: N }, (_, i) => {
      const t = i / FS;
      return Math.round(
        (1 + 0.5 * Math.cos(2 * Math.PI * 87.5 * t)) *
          0.2 *
          Math.cos(2 * Math.PI * 5000 * t) *
          COUNTS_PER_G,
      );
    });
    const r = analyzeSnapshot({ ...snapshot([]), samples });
    const env = r.spectra.envelope!;
    expect(env.unit).toBe('g');
    expect(env.bandHz[0]).toBeCloseTo(2500, 0);
    // the carrier's amplitude is the envelope's mean, removed before the FFT (AM definition)
    expect(env.meanG).toBeCloseTo(0.2, 3);
    expect(env.values[0]).toBeCloseTo(0, 6);
    expect(env.values[Math.round(87.5 / env.dfHz)]).toBeCloseTo(0.1, 3);
  });

  it('when bands are asked, each kind gives its value in its unit, and unreadable ones give null', () => {
    const bearings = [
      { name: 'DE', rollingElements: 9, ballDiameterMm: 7.94, pitchDiameterMm: 39.04 },
    ];
    const r = analyzeSnapshot(
      snapshot(
        [
          [25, 0.1],
          [100, 1],
        ],
        {
          speedRpm: 1500,
          machine: { bearings },
          bands: [
            { key: 'overall', kind: 'overall' },
            { key: 'a-rms', kind: 'overall', unit: 'g' },
            { key: '80-120', kind: 'hz', loHz: 80, hiHz: 120, unit: 'g' },
            { key: '1x', kind: 'fault', fault: '1×', unit: 'mm/s', measure: 'peak' },
            { key: '3-5x', kind: 'order', loOrder: 3, hiOrder: 5, unit: 'g' },
            { key: 'bpfo', kind: 'fault', fault: 'DE BPFO', source: 'envelope' },
            { key: 'nope', kind: 'fault', fault: 'NDE BPFI' },
          ],
        },
      ),
    );
    const v = Object.fromEntries(r.bandValues.map((b) => [b.key, b]));
    // Velocity RMS of the two tones from v = a/(2πf) (textbook): √((v₁² + v₂²)/2) of the
    // peaks 0.1 g at 25 Hz and 1 g at 100 Hz, g₀ = 9806.65 mm/s² (ISO 80000-3).
    const vPeak = (g: number, hz: number) => (g * 9806.65) / (2 * Math.PI * hz);
    const vRms = Math.sqrt((vPeak(0.1, 25) ** 2 + vPeak(1, 100) ** 2) / 2);
    expect(v.overall!.unit).toBe('mm/s');
    expect(Math.abs(v.overall!.value! / vRms - 1)).toBeLessThan(0.02);
    // Acceleration RMS of two sines: √((0.1² + 1²)/2) g (definition of RMS).
    expect(v['a-rms']!.value).toBeCloseTo(Math.sqrt((0.1 ** 2 + 1) / 2), 3);
    expect(v['80-120']!.value).toBeCloseTo(Math.SQRT1_2, 3);
    expect(v['1x']!.value).toBeCloseTo((0.1 * 9806.65) / (2 * Math.PI * 25), 1); // v = a/2πf (textbook)
    expect(v['3-5x']!.value).toBeCloseTo(Math.SQRT1_2, 3);
    // Two steady tones: nothing modulates them, so the envelope has (almost) nothing at
    // DE BPFO (89.6 Hz here); a value read from the wrong spectrum or bin would not be this small.
    expect(v.bpfo!.value).toBeGreaterThanOrEqual(0);
    expect(v.bpfo!.value).toBeLessThan(0.002);
    expect(v.nope!.value).toBeNull();
    expect(r.faultFrequencies.map((f) => f.name)).toContain('DE BPFO');
  });

  it('when a clipped capture is analysed, the verdict says unusable and why', () => {
    const r = analyzeSnapshot(snapshot([[100, 15]]));
    expect(r.quality.verdict).toBe('unusable');
    expect(r.quality.findings.map((f) => f.code)).toContain('clipped');
  });

  it('when a short record is analysed, the segment shrinks to fit and the result is still complete', () => {
    const r = analyzeSnapshot(snapshot([[100, 1]], {}, 5000));
    expect(r.spectra.acceleration.nperseg).toBe(4096);
    expect(r.sampleCount).toBe(5000);
    expect(r.spectra.envelope).not.toBeNull();
  });

  it('when the input is incomplete or impossible, it throws a clear TypeError or RangeError', () => {
    const good = snapshot([[100, 1]], {}, 1024);
    expect(() => analyzeSnapshot({ ...good, samples: [1, 2, 3] as never })).toThrow(TypeError);
    expect(() => analyzeSnapshot({ ...good, samples: new Int32Array(10) })).toThrow(/at least 64/);
    expect(() => analyzeSnapshot({ ...good, sampleRateHz: 0 })).toThrow(/sampleRateHz/);
    expect(() => analyzeSnapshot({ ...good, fmaxHz: 20000 })).toThrow(/Nyquist/);
    expect(() => analyzeSnapshot({ ...good, encoding: 'int8' as never })).toThrow(/encoding/);
    expect(() => analyzeSnapshot({ ...good, adc: { bits: 99, fullScaleV: 1 } })).toThrow(/bits/);
    expect(() => analyzeSnapshot({ ...good, sensor: { sensitivityMvPerG: 0 } })).toThrow(
      /sensitivity/,
    );
    expect(() => analyzeSnapshot({ ...good, window: 'kaiser' as never })).toThrow(/window/);
    expect(() =>
      analyzeSnapshot({ ...good, bands: [{ key: 'a', kind: 'hz', loHz: 5, hiHz: 1 }] }),
    ).toThrow(/band "a"/);
    expect(() => analyzeSnapshot({ ...good, tach: { pulseTimesS: [0.2, 0.1] } })).toThrow(
      /increase/,
    );
  });
});

/** Standard gravity, mm/s² per g (ISO 80000-3). */
const G_MM_S2 = 9806.65;

/** A record of tones (Hz, g peak) at any rate and length, in 24-bit counts, nothing else. */
function toneRecord(
  fs: number,
  n: number,
  tones: [number, number][],
  extra: Partial<SnapshotInput> = {},
): SnapshotInput {
  const samples = Int32Array.from({ length: n }, (_, i) => {
    let g = 0;
    for (const [f, a] of tones) g += a * Math.sin((2 * Math.PI * f * i) / fs + 0.3);
    return Math.round(g * COUNTS_PER_G);
  });
  return {
    samples,
    encoding: 'int32',
    sampleRateHz: fs,
    adc: { bits: 24, fullScaleV: 1 },
    sensor: { sensitivityMvPerG: 100 },
    ...extra,
  };
}

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
