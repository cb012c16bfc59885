import { describe, expect, it } from 'vitest';
import { analyzeSnapshot, type SnapshotInput } from './analyze-snapshot.ts';
import { bandRms } from './band-rms.ts';
import { welch } from './welch.ts';
import { lcg32 } from './seeded-random.ts';
import { COUNTS_PER_G, toneCounts } from './tone-record.test-support.ts';

const FS = 25600;
const N = 65536;

/** 24-bit counts of a sum of tones (amplitudes in g peak) plus a little deterministic noise. */
const snapshot = (
  tones: [number, number][],
  extra: Partial<SnapshotInput> = {},
  n = N,
): SnapshotInput => toneCounts({ fs: FS, n, tones, phaseRad: 0.1, noiseG: 1e-4, seed: 99 }, extra);

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
    const uniform = lcg32(5);
    const samples = Int32Array.from({ length: N }, () => Math.round((uniform() - 0.5) * 1e6));
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
