import { bandLines, type PowerSpectrum } from './band-rms.ts';
import { integrationGain, type VibrationUnit } from './units.ts';
import { welch } from './welch.ts';

/**
 * The power spectrum of a whole record at its full resolution Δf = fs / n: one
 * Hann-windowed periodogram (mean removed), unit² per line, as
 * `scipy.signal.periodogram(x, fs, window='hann', scaling='spectrum')`.
 *
 * Hann because its leakage falls fast: a tone two lines or more from a band edge puts
 * less than 0.03 % of its power across the edge (1.6 % of its amplitude), so an ideal
 * band read from these lines needs no roll-off of its own.
 *
 * Source: Harris 1978, Proc. IEEE 66(1):51–83 (Hann window, ENBW 1.5 bins, sidelobe fall-off).
 */
export function recordSpectrum(input: ArrayLike<number>, sampleRateHz: number): PowerSpectrum {
  const s = welch(input, {
    sampleRateHz,
    nperseg: input.length,
    window: 'hann',
    scaling: 'spectrum',
    detrend: 'constant',
  });
  return { power: s.power, dfHz: s.dfHz, enbwBins: s.enbwBins };
}

/** Options for {@link idealBandRms}. */
export interface IdealBandRmsOptions {
  /** Lower band edge, Hz (> 0 when integrating). Lines at or above it count in full. */
  loHz: number;
  /** Upper band edge, Hz. Lines at or below it count in full. */
  hiHz: number;
  /** Unit of the spectrum's lines. @default 'g' */
  from?: VibrationUnit;
  /** Unit of the result: the same quantity, or one or two integrations lower. @default 'mm/s' */
  to?: VibrationUnit;
}

/**
 * RMS over an ideal band — full weight inside [loHz, hiHz], none outside — of a power
 * spectrum, integrated line by line: √(Σ P_k · G(f_k)² / ENBW), G = 1/(2πf) per
 * integration with the unit factors (v = a/(2πf), d = a/(2πf)²). On a
 * {@link recordSpectrum} the lines are 1/T apart, so the band edge is as sharp as the
 * record allows: a tone two lines or more inside the edge reads within 0.1 % (and within
 * about (Δf/f)² of the 1/f weight across Hann's main lobe), one two lines or more outside
 * reads under 2 % of its amplitude. "Two lines" is 2/T: a short record blurs the edge — at
 * T = 0.5 s (lines 2 Hz apart) a tone on the 10 Hz edge line reads 88 % of its velocity and
 * one at 8 Hz still 33 %, because the Hann main lobe spans the lines k − 1 … k + 1 and each
 * is counted wholly on its own side of the edge.
 *
 * Source: Parseval / ENBW (Harris 1978); integration of a sinusoid (e.g. Randall,
 * "Vibration-based Condition Monitoring", Wiley 2011, ch. 2); ideal band edges:
 * ISO 20816-1 states the overall band by its edges (from memory).
 */
export function idealBandRms(spectrum: PowerSpectrum, options: IdealBandRmsOptions): number {
  const { power, dfHz, enbwBins } = spectrum;
  if (!(dfHz > 0)) throw new RangeError(`dfHz must be positive, got ${dfHz}`);
  if (!(enbwBins > 0)) throw new RangeError(`enbwBins must be positive, got ${enbwBins}`);
  const { loHz, hiHz } = options;
  const from = options.from ?? 'g';
  const to = options.to ?? 'mm/s';
  if (!(loHz >= 0) || !(hiHz > loHz)) {
    throw new RangeError(`band must satisfy 0 ≤ loHz < hiHz, got [${loHz}, ${hiHz}]`);
  }
  const integrating = integrationGain(1, from, to) !== integrationGain(2, from, to);
  if (integrating && !(loHz > 0)) {
    throw new RangeError(`integrating from ${from} to ${to} needs loHz > 0, got ${loHz}`);
  }
  const [first, last] = bandLines(power.length, dfHz, loHz, hiHz);
  // integrationGain(f) = integrationGain(1 Hz) / f^steps: units looked up once, not per line.
  const gainAt1Hz = integrationGain(1, from, to);
  const steps = integrating ? Math.round(Math.log2(gainAt1Hz / integrationGain(2, from, to))) : 0;
  let sum = 0;
  for (let k = Math.max(first, 1); k <= last; k++) {
    const gain = gainAt1Hz / (k * dfHz) ** steps;
    sum += power[k]! * gain * gain;
  }
  return Math.sqrt(sum / enbwBins);
}
