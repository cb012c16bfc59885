import { describe, expect, it } from 'vitest';
import { hilbertEnvelope } from './analytic-signal.ts';
import { bandEnvelope, defaultEnvelopeBandHz, envelopeSpectrum } from './envelope.ts';

/** (1 + 0.5 cos 2π·100t) · cos 2π·3000t at 20 kHz for 1 s (amplitude modulation, by definition). */
function amTone(): Float64Array {
  const fs = 20000;
  return Float64Array.from({ length: fs }, (_, i) => {
    const t = i / fs;
    return (1 + 0.5 * Math.cos(2 * Math.PI * 100 * t)) * Math.cos(2 * Math.PI * 3000 * t);
  });
}

describe('envelope', () => {
  // Envelope of (1 + 0.5 cos 2π·100t)·cos 2π·3000t is 1 + 0.5 cos 2π·100t (definition of
  // amplitude modulation; its analytic-signal magnitude, as scipy.signal.hilbert gives)
  it('when a 3 kHz carrier is 50 % modulated at 100 Hz, the envelope has mean 1.000 and 0.500 at 100 Hz', () => {
    const r = envelopeSpectrum(amTone(), { sampleRateHz: 20000, bandHz: [2000, 4000] });
    expect(r.dfHz).toBeCloseTo(1, 12);
    expect(r.mean).toBeCloseTo(1.0, 6);
    // the mean is removed before the FFT: nothing at DC nor leaking into lines 1 and 2
    expect(r.amplitude[0]!).toBeLessThan(1e-9);
    expect(r.amplitude[1]!).toBeLessThan(1e-9);
    expect(r.amplitude[2]!).toBeLessThan(1e-9);
    expect(r.amplitude[100]).toBeCloseTo(0.5, 6);
    expect(r.amplitude[200]!).toBeLessThan(1e-6);
  });

  // Definition of the analytic signal: the full-rate Hilbert envelope of the same signal is 1 + 0.5 cos 2π·100t
  it('when the full-rate Hilbert envelope is taken, it follows 1 + 0.5 cos 2π·100t', () => {
    const env = hilbertEnvelope(amTone());
    for (const i of [0, 50, 123, 5000, 19999]) {
      expect(env[i]).toBeCloseTo(1 + 0.5 * Math.cos((2 * Math.PI * 100 * i) / 20000), 6);
    }
  });

  // Randall & Antoni 2011: the band-pass keeps what is outside the resonance band out of the envelope
  it('when a strong low-frequency tone sits outside the band, the envelope ignores it', () => {
    const x = amTone().map((v, i) => v + 5 * Math.sin((2 * Math.PI * 50 * i) / 20000));
    const r = envelopeSpectrum(x, { sampleRateHz: 20000, bandHz: [2000, 4000] });
    expect(r.mean).toBeCloseTo(1.0, 6);
    expect(r.amplitude[50]!).toBeLessThan(1e-6);
  });

  it('the default band comes from the sample rate: fs/10.24 to fs/2.56', () => {
    // common practice, no source: 2.5–10 kHz at 25.6 kHz
    expect(defaultEnvelopeBandHz(25600)).toEqual([2500, 10000]);
  });

  it('when the band is outside (0, fs/2) or empty, it throws RangeError', () => {
    const x = amTone();
    expect(() => bandEnvelope(x, { sampleRateHz: 20000, bandHz: [5000, 12000] })).toThrow(
      RangeError,
    );
    expect(() => bandEnvelope(x, { sampleRateHz: 20000, bandHz: [3000, 2000] })).toThrow(
      RangeError,
    );
    expect(() => bandEnvelope(new Float64Array(2), { sampleRateHz: 20000 })).toThrow(RangeError);
  });
});
