import { fftKernel } from './fft-kernel.ts';
import { getFftPlan, nextPowerOfTwo } from './fft-plan.ts';
import { scratch } from './scratch.ts';
import { getWindow, type WindowName } from './window-functions.ts';

/** Options for {@link bandEnvelope} and {@link envelopeSpectrum}. */
export interface EnvelopeOptions {
  /** Sample rate in Hz. @default 1 */
  sampleRateHz?: number;
  /**
   * Band-pass edges [lo, hi] in Hz around the structural resonance the bearing impacts
   * excite.
   * @default {@link defaultEnvelopeBandHz}(fs)
   */
  bandHz?: readonly [number, number];
  /**
   * The signal's one-sided spectrum (interleaved complex, bins 0 … ⌊N/2⌋ of an
   * unnormalised rfft of the whole input), to reuse instead of computing it.
   * @default computed
   */
  spectrum?: Float64Array;
}

/** The envelope of the band-passed signal on its own (reduced) time base. */
export interface BandEnvelope {
  /** Envelope samples |z|, in the input's unit. */
  envelope: Float64Array;
  /** Sample rate of `envelope`: fs · M / N with M a power of two ≥ the band's bin count. */
  sampleRateHz: number;
  /** Band actually used, snapped to bins. */
  bandHz: [number, number];
}

/**
 * Default envelope band from the sample rate, not from a point's analysis Fmax:
 * [fs/10.24, fs/2.56], the upper three quarters of the alias-free band (2.5–10 kHz at
 * 25.6 kHz), where the structural resonances that bearing impacts excite usually lie.
 * Source: Randall & Antoni 2011, MSSP 25:485–520 (demodulate a high-frequency band where
 * the impacts dominate); the edges are common practice, no source.
 */
export function defaultEnvelopeBandHz(sampleRateHz: number): [number, number] {
  if (!(sampleRateHz > 0))
    throw new RangeError(`sampleRateHz must be positive, got ${sampleRateHz}`);
  return [sampleRateHz / 10.24, sampleRateHz / 2.56];
}

function checkBand(
  fs: number,
  n: number,
  band: readonly [number, number] | undefined,
): [number, number] {
  if (!(fs > 0)) throw new RangeError(`sampleRateHz must be positive, got ${fs}`);
  const [lo, hi] = band ?? defaultEnvelopeBandHz(fs);
  if (!(lo >= 0) || !(hi > lo) || hi > fs / 2) {
    throw new RangeError(`envelope band must satisfy 0 ≤ lo < hi ≤ fs/2, got [${lo}, ${hi}]`);
  }
  const df = fs / n;
  const k1 = Math.max(0, Math.ceil(lo / df - 1e-9));
  const k2 = Math.min(Math.floor(n / 2), Math.floor(hi / df + 1e-9));
  if (k2 < k1) throw new RangeError(`envelope band [${lo}, ${hi}] Hz holds no spectral line`);
  return [k1, k2];
}

/**
 * Envelope of the band-passed signal: ideal (FFT) band-pass, analytic signal (negative
 * frequencies removed, positive doubled, as scipy.signal.hilbert), magnitude. The band is
 * shifted to baseband and transformed back at a reduced size M (a power of two covering
 * the band), so the envelope comes out on a coarser time base at no loss: the samples are
 * exactly the band-limited interpolation of the full-rate envelope.
 *
 * Source: Randall & Antoni, "Rolling element bearing diagnostics — a tutorial", MSSP
 * 25:485–520, 2011 (envelope analysis); Marple 1999 (analytic signal by FFT).
 */
export function bandEnvelope(
  input: ArrayLike<number>,
  options: EnvelopeOptions = {},
): BandEnvelope {
  const n = input.length;
  if (n < 4) throw new RangeError(`an envelope needs at least 4 samples, got ${n}`);
  const fs = options.sampleRateHz ?? 1;
  const [k1, k2] = checkBand(fs, n, options.bandHz);
  let spectrum = options.spectrum;
  if (!spectrum) {
    const data = input instanceof Float64Array ? input : Float64Array.from(input);
    spectrum = new Float64Array(2 * n);
    getFftPlan(n).realForward(spectrum, data);
  }
  const lines = k2 - k1 + 1;
  const m = Math.max(2, nextPowerOfTwo(lines));
  const baseband = scratch('envelope-baseband', 2 * m);
  baseband.fill(0, 2 * lines);
  const scale = 1 / n; // the inverse below is unscaled: 1/M folded in with M/N
  for (let j = 0; j < lines; j++) {
    const k = k1 + j;
    const h = k === 0 || 2 * k === n ? 1 : 2;
    baseband[2 * j] = h * scale * spectrum[2 * k]!;
    baseband[2 * j + 1] = h * scale * spectrum[2 * k + 1]!;
  }
  const envelope = new Float64Array(m);
  const kernel = fftKernel();
  if (kernel) {
    kernel.complexPlan(m).inverseMagnitude(envelope, baseband);
  } else {
    const z = scratch('envelope-z', 2 * m);
    getFftPlan(m).inverseUnscaled(z, baseband);
    for (let i = 0; i < m; i++) {
      const re = z[2 * i]!;
      const im = z[2 * i + 1]!;
      envelope[i] = Math.sqrt(re * re + im * im);
    }
  }
  const df = fs / n;
  return { envelope, sampleRateHz: (fs * m) / n, bandHz: [k1 * df, k2 * df] };
}

/** Options for {@link envelopeSpectrum}. */
export interface EnvelopeSpectrumOptions extends EnvelopeOptions {
  /** Highest envelope frequency kept. @default min(1000 Hz, band width) */
  fmaxHz?: number;
  /** Window for the envelope's FFT. @default 'hann' */
  window?: WindowName;
}

/** Envelope spectrum in peak amplitude (a modulation of depth m on a carrier of amplitude A reads m·A). */
export interface EnvelopeSpectrum {
  /** Peak amplitude per line, input unit; the mean is removed first, so line 0 is 0. */
  amplitude: Float64Array;
  /** The envelope's (window-weighted) mean, input unit: the carrier's amplitude. */
  mean: number;
  /** Line spacing in Hz (fs / N of the input). */
  dfHz: number;
  bandHz: [number, number];
  window: WindowName;
  /** Equivalent noise bandwidth of the window, in lines. */
  enbwBins: number;
}

/**
 * Envelope spectrum for bearing diagnostics: band-pass, envelope (analytic signal), mean
 * removed, FFT of the whole envelope through a window, single-sided peak amplitude with
 * the window's coherent gain removed. The mean (returned apart) would otherwise fill line
 * 0 and, through the window's main lobe, the lowest lines where the fault lines of slow
 * shafts sit; it is the window-weighted mean, so a constant envelope leaves nothing at all.
 * (1 + 0.5 cos 2π·100t)·cos 2π·3000t reads mean 1.0 and 0.5 at 100 Hz.
 *
 * Source: Randall & Antoni 2011, MSSP 25:485–520 (envelope analysis); Harris 1978
 * (coherent gain).
 */
export function envelopeSpectrum(
  input: ArrayLike<number>,
  options: EnvelopeSpectrumOptions = {},
): EnvelopeSpectrum {
  const env = bandEnvelope(input, options);
  const m = env.envelope.length;
  const windowName = options.window ?? 'hann';
  const window = getWindow(windowName, m);
  let weighted = 0;
  for (let i = 0; i < m; i++) weighted += env.envelope[i]! * window.values[i]!;
  const mean = weighted / window.sum;
  const frame = scratch('envelope-frame', m);
  for (let i = 0; i < m; i++) frame[i] = (env.envelope[i]! - mean) * window.values[i]!;
  const out = scratch('envelope-out', 2 * m);
  getFftPlan(m).realForward(out, frame);
  const df = env.sampleRateHz / m;
  const bandwidth = env.bandHz[1] - env.bandHz[0];
  const fmax = Math.min(options.fmaxHz ?? Math.min(1000, bandwidth), env.sampleRateHz / 2);
  if (!(fmax > 0)) throw new RangeError(`envelope fmaxHz must be positive, got ${fmax}`);
  const lines = Math.min(Math.floor(m / 2), Math.floor(fmax / df + 1e-9)) + 1;
  const amplitude = new Float64Array(lines);
  for (let k = 0; k < lines; k++) {
    const re = out[2 * k]!;
    const im = out[2 * k + 1]!;
    const mag = Math.sqrt(re * re + im * im);
    amplitude[k] = ((k === 0 ? 1 : 2) * mag) / window.sum;
  }
  return {
    amplitude,
    mean,
    dfHz: df,
    bandHz: env.bandHz,
    window: windowName,
    enbwBins: window.enbwBins,
  };
}

/**
 * The point's envelope band as this capture can hold it: its top limited to the alias-free
 * fs/2.56; a band that leaves nothing below that (a capture at a lower rate than the band
 * was set for) falls back to the default from the sample rate. The band used is reported.
 */
export function envelopeBandFor(
  band: readonly [number, number] | undefined,
  fs: number,
): readonly [number, number] {
  if (band === undefined) return defaultEnvelopeBandHz(fs);
  const [lo, hi] = band;
  if (!(lo >= 0) || !(hi > lo) || !Number.isFinite(hi))
    throw new RangeError(`envelopeBandHz must satisfy 0 ≤ lo < hi, got [${lo}, ${hi}]`);
  const top = Math.min(hi, fs / 2.56);
  return top > lo ? [lo, top] : defaultEnvelopeBandHz(fs);
}
