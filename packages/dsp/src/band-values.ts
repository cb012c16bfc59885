import { bandLines, bandPeak, bandRms, type PowerSpectrum } from './band-rms.ts';
import type { FaultFrequency } from './fault-frequencies.ts';

/** Unit a band value is reported in. */
export type BandUnit = 'g' | 'mm/s' | 'um';

/**
 * A band to trend and to set limits on. `kind` says how its edges are found:
 * - `overall`: the overall value (see {@link bandValues} for the exact figure); with
 *   loHz/hiHz, the overall value over that span instead of the ISO band;
 * - `hz`: lines in [loHz, hiHz];
 * - `order`: lines in [loOrder, hiOrder] × shaft speed (null without a speed);
 * - `fault`: lines within ±widthPercent of harmonic × a named fault frequency (null
 *   without a speed or when the name is not among the machine's fault frequencies).
 */
export interface BandDefinition {
  /** Stable identifier stored with each value. */
  key: string;
  kind: 'overall' | 'hz' | 'order' | 'fault';
  /** `hz` bands: lower edge, Hz; `overall` bands: lower edge of their own span (both edges or neither). */
  loHz?: number;
  /** `hz` bands: upper edge, Hz; `overall` bands: upper edge of their own span. */
  hiHz?: number;
  /** `order` bands: lower edge, orders. */
  loOrder?: number;
  /** `order` bands: upper edge, orders. */
  hiOrder?: number;
  /** `fault` bands: the fault frequency's name, e.g. "1×", "DE 6205 BPFO", "input GMF". */
  fault?: string;
  /** `fault` bands: which harmonic of the fault frequency. @default 1 */
  harmonic?: number;
  /** `fault` bands: half-width as a percentage of the centre (bearings slip 1–2 %). @default 3 */
  widthPercent?: number;
  /** `rms`: band RMS (ENBW applied); `peak`: largest line as a sine amplitude. @default 'rms' */
  measure?: 'rms' | 'peak';
  /** @default 'mm/s' for `overall`, 'g' otherwise */
  unit?: BandUnit;
  /** Read the band from the acceleration/velocity/displacement spectrum or the envelope spectrum (g only). @default 'spectrum' */
  source?: 'spectrum' | 'envelope';
}

/** One band's value for one snapshot. */
export interface BandValue {
  key: string;
  /** null when the band cannot be read (speed unknown, fault not found, band outside the spectrum). */
  value: number | null;
  unit: BandUnit;
}

/** Everything {@link bandValues} reads from. */
export interface BandContext {
  /** Power spectra (unit² per line) of each unit, all on the same Hz axis. */
  spectra: Record<BandUnit, PowerSpectrum>;
  /** Envelope spectrum as power per line (g²), or null when not computed. */
  envelope: PowerSpectrum | null;
  /** Shaft speed in Hz, or null. */
  shaftHz: number | null;
  faultFrequencies: FaultFrequency[];
  /**
   * Overall value over a span of the record, for `overall` bands with loHz/hiHz: `rms` over
   * the ideal band, `peak` from the band-limited waveform (µm: half its peak-to-peak), or
   * null when the record holds nothing of the span. Without it such bands read null.
   */
  overallOver?: (
    unit: BandUnit,
    measure: 'rms' | 'peak',
    loHz: number,
    hiHz: number,
  ) => number | null;
  /** Overall figures: `overall` bands without a span report these. */
  overall: {
    accelRmsG: number;
    accelPeakG: number;
    velocityRmsMmS: number;
    displacementPkPkUm: number;
    /** Displacement RMS over the ISO band, µm. */
    displacementRmsUm: number;
  };
}

/** Checks a list of band definitions and throws a RangeError/TypeError naming the first bad one. */
export function checkBands(bands: readonly BandDefinition[]): void {
  const keys = new Set<string>();
  for (const b of bands) {
    if (typeof b.key !== 'string' || b.key === '')
      throw new TypeError('every band needs a non-empty key');
    if (keys.has(b.key)) throw new RangeError(`band key "${b.key}" is used twice`);
    keys.add(b.key);
    if (!['overall', 'hz', 'order', 'fault'].includes(b.kind)) {
      throw new TypeError(`band "${b.key}": kind must be overall, hz, order or fault`);
    }
    if (b.measure !== undefined && b.measure !== 'rms' && b.measure !== 'peak') {
      throw new TypeError(`band "${b.key}": measure must be rms or peak`);
    }
    if (b.unit !== undefined && !['g', 'mm/s', 'um'].includes(b.unit)) {
      throw new TypeError(`band "${b.key}": unit must be g, mm/s or um`);
    }
    if (b.source === 'envelope' && (b.unit ?? 'g') !== 'g') {
      throw new RangeError(`band "${b.key}": envelope bands are in g`);
    }
    if (b.kind === 'hz' && !(b.loHz! >= 0 && b.hiHz! > b.loHz!)) {
      throw new RangeError(`band "${b.key}": needs 0 ≤ loHz < hiHz`);
    }
    if (
      b.kind === 'overall' &&
      (b.loHz !== undefined || b.hiHz !== undefined) &&
      !(b.loHz! >= 0 && b.hiHz! > b.loHz!)
    ) {
      throw new RangeError(`band "${b.key}": an overall span needs 0 ≤ loHz < hiHz`);
    }
    if (b.kind === 'order' && !(b.loOrder! >= 0 && b.hiOrder! > b.loOrder!)) {
      throw new RangeError(`band "${b.key}": needs 0 ≤ loOrder < hiOrder`);
    }
    if (b.kind === 'fault') {
      if (typeof b.fault !== 'string')
        throw new TypeError(`band "${b.key}": needs the fault frequency's name`);
      if (b.harmonic !== undefined && !(Number.isInteger(b.harmonic) && b.harmonic >= 1)) {
        throw new RangeError(`band "${b.key}": harmonic must be a positive integer`);
      }
      if (b.widthPercent !== undefined && !(b.widthPercent > 0 && b.widthPercent < 50)) {
        throw new RangeError(`band "${b.key}": widthPercent must be in (0, 50)`);
      }
    }
  }
}

/**
 * Band levels of one snapshot. `rms` is the band RMS √(Σ P / ENBW); `peak` the largest
 * line as a sine amplitude √(2·max P). `overall` bands report the overall figures:
 * g rms → accelRmsG, g peak → accelPeakG (true peak), mm/s rms → velocityRmsMmS,
 * mm/s peak → √2 × velocityRmsMmS, µm rms → displacement RMS over the ISO band,
 * µm peak → displacementPkPkUm / 2. `overall` bands with their own span [loHz, hiHz]
 * report {@link BandContext.overallOver} over that span instead (so a 10–5000 Hz velocity
 * band is not the ISO value, and a displacement band's peak is the waveform's, not the
 * largest line's).
 *
 * Source: Harris 1978 (ENBW); ISO 20816-1 (overall velocity band); fault-band width:
 * Randall & Antoni 2011 (1–2 % slip), widened to ±3 % by default (common practice, no source).
 */
export function bandValues(bands: readonly BandDefinition[], context: BandContext): BandValue[] {
  checkBands(bands);
  return bands.map((band) => {
    const unit: BandUnit = band.unit ?? (band.kind === 'overall' ? 'mm/s' : 'g');
    const measure = band.measure ?? 'rms';
    const value = readBand(band, unit, measure, context);
    return { key: band.key, value: value === null || !Number.isFinite(value) ? null : value, unit };
  });
}

function readBand(
  band: BandDefinition,
  unit: BandUnit,
  measure: 'rms' | 'peak',
  context: BandContext,
): number | null {
  const o = context.overall;
  if (band.kind === 'overall' && band.source !== 'envelope') {
    if (band.loHz !== undefined && band.hiHz !== undefined) {
      return context.overallOver ? context.overallOver(unit, measure, band.loHz, band.hiHz) : null;
    }
    if (unit === 'g') return measure === 'rms' ? o.accelRmsG : o.accelPeakG;
    if (unit === 'mm/s')
      return measure === 'rms' ? o.velocityRmsMmS : Math.SQRT2 * o.velocityRmsMmS;
    return measure === 'rms' ? o.displacementRmsUm : o.displacementPkPkUm / 2;
  }
  const spectrum = band.source === 'envelope' ? context.envelope : context.spectra[unit];
  if (!spectrum) return null;
  let lo: number;
  let hi: number;
  if (band.kind === 'overall') {
    lo = band.loHz ?? spectrum.dfHz;
    hi = band.hiHz ?? (spectrum.power.length - 1) * spectrum.dfHz;
  } else if (band.kind === 'hz') {
    lo = band.loHz!;
    hi = band.hiHz!;
  } else if (band.kind === 'order') {
    if (context.shaftHz === null) return null;
    lo = band.loOrder! * context.shaftHz;
    hi = band.hiOrder! * context.shaftHz;
  } else {
    const fault = context.faultFrequencies.find((f) => f.name === band.fault);
    if (!fault || fault.hz === null) return null;
    const centre = fault.hz * (band.harmonic ?? 1);
    const half = Math.max(((band.widthPercent ?? 3) / 100) * centre, 1.5 * spectrum.dfHz);
    lo = centre - half;
    hi = centre + half;
  }
  const [first, last] = bandLines(spectrum.power.length, spectrum.dfHz, lo, hi);
  if (first > last) return null;
  return measure === 'rms'
    ? bandRms(spectrum, { loHz: lo, hiHz: hi })
    : bandPeak(spectrum, { loHz: lo, hiHz: hi });
}
