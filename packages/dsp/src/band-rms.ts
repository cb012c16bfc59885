/** A one-sided power spectrum (unit², as welch with scaling 'spectrum') and its axis. */
export interface PowerSpectrum {
  /** Power per bin, unit² (each line holds the mean square of a bin-centred tone). */
  power: ArrayLike<number>;
  /** Bin spacing (Hz, or orders for an order spectrum). */
  dfHz: number;
  /** Equivalent noise bandwidth of the window, in bins. */
  enbwBins: number;
}

/** Options for {@link bandRms}. */
export interface BandRmsOptions {
  /**
   * Lower band edge (same axis as dfHz); lines at or above it count.
   * @default 0
   */
  loHz?: number;
  /**
   * Upper band edge; lines at or below it count.
   * @default the last line
   */
  hiHz?: number;
}

/**
 * RMS over a band of a power spectrum: √(Σ P_k / ENBW) over the lines k·df in
 * [loHz, hiHz]. Dividing by the ENBW turns the window-broadened lines back into power,
 * so a tone and broadband noise are both read right (Parseval).
 *
 * Source: Harris 1978, Proc. IEEE 66(1) (equivalent noise bandwidth); scipy.signal.welch
 * 'spectrum' / 'density' = ENBW · Δf (computed from scipy's definitions).
 */
export function bandRms(spectrum: PowerSpectrum, options: BandRmsOptions = {}): number {
  const { power, dfHz, enbwBins } = spectrum;
  if (!(dfHz > 0)) throw new RangeError(`dfHz must be positive, got ${dfHz}`);
  if (!(enbwBins > 0)) throw new RangeError(`enbwBins must be positive, got ${enbwBins}`);
  const lo = options.loHz ?? 0;
  const hi = options.hiHz ?? (power.length - 1) * dfHz;
  if (!(hi >= lo)) throw new RangeError(`band upper edge ${hi} is below its lower edge ${lo}`);
  const [first, last] = bandLines(power.length, dfHz, lo, hi);
  let sum = 0;
  for (let k = first; k <= last; k++) sum += power[k]!;
  return Math.sqrt(sum / enbwBins);
}

/**
 * Index range [first, last] of the lines k·df that lie in [lo, hi] (a tolerance of
 * 1e-9 bins keeps edges that sit exactly on a line). Empty when first > last.
 */
export function bandLines(lines: number, df: number, lo: number, hi: number): [number, number] {
  const first = Math.max(0, Math.ceil(lo / df - 1e-9));
  const last = Math.min(lines - 1, Math.floor(hi / df + 1e-9));
  return [first, last];
}

/**
 * Largest single line in a band of a power spectrum, as a sine amplitude (peak):
 * √(2 · max P_k). Source: common practice, no source.
 */
export function bandPeak(spectrum: PowerSpectrum, options: BandRmsOptions = {}): number {
  const { power, dfHz } = spectrum;
  const lo = options.loHz ?? 0;
  const hi = options.hiHz ?? (power.length - 1) * dfHz;
  const [first, last] = bandLines(power.length, dfHz, lo, hi);
  let max = 0;
  for (let k = first; k <= last; k++) if (power[k]! > max) max = power[k]!;
  return Math.sqrt(2 * max);
}
