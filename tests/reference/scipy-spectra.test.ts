// Live reference checks against scipy (Debian python3-scipy 1.10): welch, rfft, hilbert.
import { describe, expect, it } from 'vitest';
import {
  analyticSignal,
  bandEnvelope,
  hilbertEnvelope,
  idealBandRms,
  irfft,
  recordSpectrum,
  rfft,
  welch,
} from '@turnstone/dsp';
import { maxRelativeError, runPython, scipyAvailable, testSignal } from './scipy.ts';

const available = scipyAvailable();

// Each case starts Python with scipy, hence the generous timeout.
describe.skipIf(!available)('against scipy, live', { timeout: 60_000 }, () => {
  // scipy live: scipy.signal.welch(x, fs, window='hann', nperseg=8192, noverlap=4096)
  it.each(['density', 'spectrum'] as const)(
    'when 65,536 samples go through Welch (Hann, 8192, 50 %%, %s), every bin matches scipy within 1e-9',
    (scaling) => {
      const x = testSignal(65536, 25600);
      const ref = runPython<number[]>(
        `from scipy import signal
f, p = signal.welch(np.array(data['x']), fs=25600, window='hann', nperseg=8192, noverlap=4096, scaling=data['scaling'])
print(json.dumps(p.tolist()))`,
        { x, scaling },
      );
      const ours = welch(x, {
        sampleRateHz: 25600,
        nperseg: 8192,
        noverlap: 4096,
        window: 'hann',
        scaling,
      });
      expect(ours.power.length).toBe(ref.length);
      expect(maxRelativeError(ours.power, ref)).toBeLessThanOrEqual(1e-9);
    },
  );

  // scipy live: welch with the other windows and an odd overlap, to pin the conventions
  it.each([
    ['flattop', 1024, 300],
    ['hamming', 2048, 1024],
    ['boxcar', 512, 0],
  ] as const)(
    'when Welch uses %s, nperseg %i, noverlap %i, it matches scipy within 1e-9',
    (win, nperseg, noverlap) => {
      const x = testSignal(20000, 10000, 7);
      const ref = runPython<number[]>(
        `from scipy import signal
f, p = signal.welch(np.array(data['x']), fs=10000, window=data['w'], nperseg=data['n'], noverlap=data['o'])
print(json.dumps(p.tolist()))`,
        { x, w: win, n: nperseg, o: noverlap },
      );
      const ours = welch(x, {
        sampleRateHz: 10000,
        nperseg,
        noverlap,
        window: win === 'boxcar' ? 'rect' : win,
      });
      // With a rectangular window the DC line of a mean-removed segment is rounding noise
      // in both (≈1e-30), so it is compared absolutely and the rest relatively.
      const from = win === 'boxcar' ? 1 : 0;
      if (from === 1) expect(Math.abs(ours.power[0]! - ref[0]!)).toBeLessThan(1e-20);
      expect(maxRelativeError(ours.power.subarray(from), ref.slice(from))).toBeLessThanOrEqual(
        1e-9,
      );
    },
  );

  // scipy live: scipy.fft.rfft at powers of two and at sizes that take the Bluestein path
  it.each([4096, 65536, 1000, 12345])(
    'when rfft runs on %i samples, re and im match scipy.fft.rfft within 1e-9',
    (n) => {
      const x = testSignal(n, 1000, n);
      const ref = runPython<{ re: number[]; im: number[]; mag: number[] }>(
        `from scipy import fft
X = fft.rfft(np.array(data['x']))
print(json.dumps({'re': X.real.tolist(), 'im': X.imag.tolist(), 'mag': np.abs(X).tolist()}))`,
        { x },
      );
      const ours = rfft(x);
      const mag = Array.from(ours.re, (re, k) => Math.hypot(re, ours.im[k]!));
      expect(maxRelativeError(mag, ref.mag)).toBeLessThanOrEqual(1e-9);
      // Parts are compared relative to the bin's magnitude (a part can be near zero).
      let worst = 0;
      for (let k = 0; k < ref.re.length; k++) {
        const e = Math.hypot(ours.re[k]! - ref.re[k]!, ours.im[k]! - ref.im[k]!) / ref.mag[k]!;
        worst = Math.max(worst, e);
      }
      expect(worst).toBeLessThanOrEqual(1e-9);
      // and back (numpy.fft.irfft is the inverse; common practice, no source)
      const back = irfft(ours, n);
      expect(maxRelativeError(back, x)).toBeLessThan(1e-9);
    },
  );

  // scipy live: numpy.abs(scipy.signal.hilbert(x)), even and odd lengths
  it.each([4096, 20000, 1001])(
    'when the Hilbert envelope of %i samples is taken, it matches scipy within 1e-9',
    (n) => {
      const x = testSignal(n, 20000, 3);
      const ref = runPython<{ env: number[]; im: number[] }>(
        `from scipy import signal
z = signal.hilbert(np.array(data['x']))
print(json.dumps({'env': np.abs(z).tolist(), 'im': z.imag.tolist()}))`,
        { x },
      );
      expect(maxRelativeError(hilbertEnvelope(x), ref.env)).toBeLessThanOrEqual(1e-9);
      const z = analyticSignal(x);
      let worst = 0;
      for (let i = 0; i < n; i++)
        worst = Math.max(worst, Math.abs(z.im[i]! - ref.im[i]!) / ref.env[i]!);
      expect(worst).toBeLessThanOrEqual(1e-9);
    },
  );

  // scipy live: ideal FFT band-pass then scipy.signal.hilbert; our baseband path must give
  // the same envelope at the samples the two time bases share.
  it('when a band-passed envelope is computed at a reduced rate, it equals scipy’s full-rate envelope at shared samples', () => {
    const n = 65536;
    const fs = 25600;
    const x = testSignal(n, fs, 11);
    const ours = bandEnvelope(x, { sampleRateHz: fs, bandHz: [2000, 5000] });
    const ref = runPython<number[]>(
      `from scipy import signal
x = np.array(data['x']); n = len(x); fs = 25600
X = np.fft.rfft(x); f = np.arange(len(X)) * fs / n
X[(f < 2000 - 1e-9) | (f > 5000 + 1e-9)] = 0
print(json.dumps(np.abs(signal.hilbert(np.fft.irfft(X, n))).tolist()))`,
      { x },
    );
    const m = ours.envelope.length;
    const stride = n / m;
    expect(Number.isInteger(stride)).toBe(true);
    const shared = Array.from({ length: m }, (_, i) => ref[i * stride]!);
    expect(maxRelativeError(ours.envelope, shared)).toBeLessThanOrEqual(1e-9);
    expect(ours.sampleRateHz).toBe((fs * m) / n);
  });

  // scipy live: scipy.signal.periodogram(x, fs, window='hann', scaling='spectrum') — the
  // whole record at its full resolution, an odd length so the Bluestein path is used too.
  it.each([65536, 20001])(
    'when a record of %i samples is taken whole, its spectrum matches scipy’s Hann periodogram within 1e-9',
    (n) => {
      const x = testSignal(n, 12800, 3);
      const ref = runPython<number[]>(
        `from scipy import signal
f, p = signal.periodogram(np.array(data['x']), fs=12800, window='hann', scaling='spectrum')
print(json.dumps(p.tolist()))`,
        { x },
      );
      const ours = recordSpectrum(x, 12800);
      expect(ours.power.length).toBe(ref.length);
      expect(ours.dfHz).toBe(12800 / n);
      expect(maxRelativeError(Array.from(ours.power).slice(1), ref.slice(1))).toBeLessThanOrEqual(
        1e-9,
      );
    },
  );

  // scipy live: velocity over an ideal 10–1000 Hz band from scipy's Hann periodogram,
  // v = a/(2πf) line by line (g → mm/s with 9806.65 mm/s² per g), power / ENBW (1.5 bins).
  it('when velocity is read over an ideal band, it equals the band sum of scipy’s periodogram integrated line by line', () => {
    const x = testSignal(32768, 12800, 5);
    const ref = runPython<number>(
      `from scipy import signal
f, p = signal.periodogram(np.array(data['x']), fs=12800, window='hann', scaling='spectrum')
sel = (f >= 10) & (f <= 1000)
v2 = p[sel] * (9806.65 / (2 * np.pi * f[sel])) ** 2
print(json.dumps(float(np.sqrt(v2.sum() / 1.5))))`,
      { x },
    );
    const ours = idealBandRms(recordSpectrum(x, 12800), { loHz: 10, hiHz: 1000, to: 'mm/s' });
    expect(Math.abs(ours / ref - 1)).toBeLessThanOrEqual(1e-9);
  });
});
