/**
 * Band definitions of a limit set: which quantity is watched, where in the spectrum, and at
 * which levels it raises an alert or danger.
 *
 * Source: Turnstone DESIGN.md ("limit_sets and bands"); the band kinds (overall, frequency
 * range, order range, window around a fault frequency) are common practice in vibration
 * condition monitoring, no source.
 */

/** Spectrum (or time signal, for overall values) a band is measured on. */
export type BandSpectrum = 'acceleration' | 'velocity' | 'displacement' | 'envelope';

/**
 * How a band's amplitude is expressed. `peak-to-peak` is added for displacement (µm p-p is
 * the usual way to state it); otherwise `rms` or `peak`.
 */
export type BandMeasure = 'rms' | 'peak' | 'peak-to-peak';

/** Engineering unit of a band value: g (acceleration, envelope), mm/s (velocity), µm. */
export type BandUnit = 'g' | 'mm/s' | 'um';

/**
 * Named fault frequencies a band can be centred on (computed by `@turnstone/dsp`):
 * running-speed harmonics, bearing defect frequencies (Randall & Antoni 2011), gear mesh
 * (teeth × shaft speed) and blade/vane pass (blades × shaft speed).
 */
export type FaultFrequencyName =
  '1x' | '2x' | '3x' | 'bpfo' | 'bpfi' | 'bsf' | 'ftf' | 'gear-mesh' | 'blade-pass';

/** Unit of a fault window's half-width. `percent` is relative to the fault frequency. */
export type HalfWidthUnit = 'hz' | 'order' | 'percent';

/** Overall value over a frequency span (e.g. ISO overall velocity 10–1000 Hz). */
export interface OverallRange {
  readonly kind: 'overall';
  /** Lower edge of the span, Hz; when absent, the analysis' own overall span. */
  readonly fromHz?: number;
  /** Upper edge of the span, Hz. */
  readonly toHz?: number;
}

/** Band between two frequencies in Hz, lower edge inclusive, upper edge exclusive. */
export interface HzRange {
  readonly kind: 'hz';
  readonly fromHz: number;
  readonly toHz: number;
}

/** Band between two orders of running speed, lower edge inclusive, upper edge exclusive. */
export interface OrderRange {
  readonly kind: 'order';
  readonly fromOrder: number;
  readonly toOrder: number;
}

/** Window of ± halfWidth around a named fault frequency and, optionally, its harmonics. */
export interface FaultWindow {
  readonly kind: 'fault';
  readonly fault: FaultFrequencyName;
  /** Half-width of the window (the window is frequency ± halfWidth). */
  readonly halfWidth: number;
  readonly halfWidthUnit: HalfWidthUnit;
  /** Number of harmonics included (1 = the fundamental only). @default 1 */
  readonly harmonics?: number;
  /**
   * Which component the fault frequency belongs to (bearing or gear mesh id), when the point
   * sees more than one; when absent, the bearing the point sits on / the machine's only mesh.
   */
  readonly component?: string;
}

/** Where in the spectrum a band sits. */
export type BandRange = OverallRange | HzRange | OrderRange | FaultWindow;

/** The kind of a band: `overall`, `hz` (range), `order` (range), `fault` (window). */
export type BandKind = BandRange['kind'];

/** Where a baseline for a statistical level is taken from. */
export type BaselineSource =
  /** The first `count` usable values after the limit set takes effect. */
  | { readonly from: 'first-n'; readonly count: number }
  /** Every usable value with `fromAt ≤ takenAt < toAt` (epoch milliseconds). */
  | { readonly from: 'period'; readonly fromAt: number; readonly toAt: number };

/** A baseline's statistics (see {@link computeBaseline}). */
export interface BaselineStats {
  /** Number of values. */
  readonly count: number;
  readonly mean: number;
  /** Sample standard deviation (n − 1 in the denominator). */
  readonly sigma: number;
  /**
   * Mean and sample standard deviation (n − 1) of ln(value): the statistical level is set in
   * the log domain. Absent in baselines stored before it was kept; then derived from mean
   * and σ by the log-normal moments (see {@link logStatsOf}).
   */
  readonly logMean?: number;
  readonly logSigma?: number;
  /** Days between the first and the last value (absent in baselines stored before). */
  readonly spanDays?: number;
}

/**
 * How a statistical level and the fixed level of a band combine into the effective level.
 * - `min`: the lower of the two (the earlier warning; the fixed level is a ceiling).
 * - `max`: the higher of the two (the fixed level is a floor that noisy-but-healthy machines
 *   cannot undercut).
 * - `statistical`: the statistical level alone.
 */
export type StatisticalCombine = 'min' | 'max' | 'statistical';

/**
 * Statistical level: mean + k·σ of a baseline. Until the baseline is complete the fixed
 * levels apply. See {@link effectiveLevels}.
 */
export interface StatisticalRule {
  /** k for the alert level (alert = mean + kAlert·σ). Typical 3. */
  readonly kAlert: number;
  /** k for the danger level; when absent the danger level stays fixed. */
  readonly kDanger?: number;
  /** Where the baseline comes from. */
  readonly baseline: BaselineSource;
  /**
   * A baseline already computed (e.g. by the server over a past period with
   * {@link computeBaseline}); when present it is used as is and nothing is accumulated.
   */
  readonly established?: BaselineStats;
  /** Include `suspect` values in the baseline (`unusable` ones never are). @default true */
  readonly includeSuspect?: boolean;
  /** How the statistical and fixed levels combine. @default 'min' */
  readonly combine?: StatisticalCombine;
}

/** Fields shared by every band definition. */
interface BandCommon {
  /**
   * Stable key of the band within its limit set, e.g. `overall-velocity`; it names the band's
   * values in `band_values` and in {@link ReplayEntry.values}.
   */
  readonly key: string;
  /** Name shown to people, e.g. "Overall velocity (ISO 10–1000 Hz)". */
  readonly name: string;
  readonly spectrum: BandSpectrum;
  readonly measure: BandMeasure;
  readonly unit: BandUnit;
  /** Fixed alert level, in `unit`. A value at or above it exceeds it. */
  readonly alertLevel: number;
  /** Fixed danger level, in `unit`; must be above `alertLevel`. */
  readonly dangerLevel: number;
  /** Consecutive exceedances needed to raise (or escalate). @default 1 */
  readonly persistence?: number;
  /**
   * Consecutive values strictly below h × the alert level needed to clear a raised band
   * (persistence on clearing, as on raising). @default 1 (new bands and templates: 3)
   */
  readonly clearPersistence?: number;
  /**
   * Alarm off-delay, hours: a raised band clears only when the raise rule (`persistence`
   * values in a row at or above the alert level) has not held for this long, as well as after
   * `clearPersistence` values below the clear level. A slow degradation with scatter wanders
   * across its level for weeks; counted in values alone it clears and raises again many times
   * over one fault, with the off-delay it raises once. Every run that would raise re-arms it.
   * @default 0 (new bands and templates: {@link NEW_BAND_RULES}.clearAfterHours)
   */
  readonly clearAfterHours?: number;
  /**
   * Hysteresis fraction h (0 < h ≤ 1): a raised band clears when a value falls strictly below
   * h × the alert level. @default 0.9
   */
  readonly hysteresis?: number;
  /** Optional statistical rule (baseline mean + k·σ). */
  readonly statistical?: StatisticalRule;
  /** Where the levels came from, for people (e.g. "ISO 20816-3 B/C, from memory"). */
  readonly levelSource?: string;
}

/**
 * One band of a limit set. Source: Turnstone DESIGN.md; defaults common practice, no source.
 */
export type BandDefinition = BandCommon & BandRange;

/**
 * Persistence when a stored band does not set it (bands saved before it had a default of its
 * own keep behaving as they did). New bands get {@link NEW_BAND_RULES}. Common practice, no
 * source.
 */
export const DEFAULT_PERSISTENCE = 1;
/** Clear persistence when a stored band does not set it (as before it existed). */
export const DEFAULT_CLEAR_PERSISTENCE = 1;
/** Clear off-delay when a stored band does not set it (as before it existed), hours. */
export const DEFAULT_CLEAR_AFTER_HOURS = 0;
/**
 * Persistence a new band (and every template band) starts with: raise on 2 consecutive
 * values, so one spike (a knock, a loose cable) does not alarm while a real step is still
 * seen on its second value; clear after 3 consecutive values below the clear level, so a
 * value scattering around its level raises and clears once, not every few days, and only
 * once the raise rule has been quiet for 5 days with at most 5 % of those days' values at
 * h × the clear level (a slow degradation drifting through its level with 15–30 % scatter then
 * raises once: tests/bench/alarm-bench.ts, 1.00 raise per degradation at 4 and 24 values a
 * day, against 4–32 without; episodes 3 weeks apart still raise each).
 * Common practice, no source.
 */
export const NEW_BAND_RULES = {
  persistence: 2,
  clearPersistence: 3,
  clearAfterHours: 120,
  hysteresis: 0.9,
} as const;
/**
 * Smallest baseline a statistical level is set from: at least 30 usable values spread over at
 * least 7 days (fewer values make σ, and so mean + kσ, mostly noise; a shorter span misses
 * the machine's daily cycle of load and temperature). Common practice, no source.
 */
export const MIN_BASELINE = { count: 30, days: 7 } as const;
/** Hysteresis fraction when a band does not set it. Common practice, no source. */
export const DEFAULT_HYSTERESIS = 0.9;

/** A point's set of bands. */
export interface LimitSet {
  readonly bands: readonly BandDefinition[];
  /** The machine-type template the set was created from, if any. */
  readonly template?: string;
}

/**
 * Problems with a band definition, as readable sentences keyed by field; empty when the band
 * can be evaluated. Rules: finite levels with 0 ≤ alert < danger, integer persistence and
 * clear persistence ≥ 1, 0 < hysteresis ≤ 1, ranges with from < to, positive half-width and
 * harmonics, k > 0, kDanger > kAlert, a baseline of at least {@link MIN_BASELINE} (count, and
 * period length or established baseline), period from < to.
 *
 * Source: Turnstone rules, no external source.
 */
export function checkBandDefinition(band: BandDefinition): { field: string; message: string }[] {
  const problems: { field: string; message: string }[] = [];
  const bad = (field: string, message: string) => problems.push({ field, message });
  if (band.key.trim() === '') bad('key', 'key must not be empty');
  if (!Number.isFinite(band.alertLevel) || band.alertLevel < 0)
    bad('alertLevel', 'alert level must be a finite value ≥ 0');
  if (!Number.isFinite(band.dangerLevel) || !(band.dangerLevel > band.alertLevel))
    bad('dangerLevel', 'danger level must be above the alert level');
  const persistence = band.persistence ?? DEFAULT_PERSISTENCE;
  if (!Number.isInteger(persistence) || persistence < 1)
    bad('persistence', 'persistence must be a whole number ≥ 1');
  const clearPersistence = band.clearPersistence ?? DEFAULT_CLEAR_PERSISTENCE;
  if (!Number.isInteger(clearPersistence) || clearPersistence < 1)
    bad('clearPersistence', 'clear persistence must be a whole number ≥ 1');
  const clearAfterHours = band.clearAfterHours ?? DEFAULT_CLEAR_AFTER_HOURS;
  if (!(Number.isFinite(clearAfterHours) && clearAfterHours >= 0 && clearAfterHours <= 8760))
    bad('clearAfterHours', 'clear off-delay must be between 0 and 8760 hours (a year)');
  const hysteresis = band.hysteresis ?? DEFAULT_HYSTERESIS;
  if (!(hysteresis > 0 && hysteresis <= 1))
    bad('hysteresis', 'hysteresis must be a fraction above 0 and at most 1');
  switch (band.kind) {
    case 'overall':
      if (band.fromHz !== undefined && band.toHz !== undefined && !(band.fromHz < band.toHz))
        bad('toHz', 'upper edge must be above the lower edge');
      break;
    case 'hz':
      if (!(band.fromHz >= 0 && band.fromHz < band.toHz))
        bad('toHz', 'upper edge must be above the lower edge (≥ 0 Hz)');
      break;
    case 'order':
      if (!(band.fromOrder >= 0 && band.fromOrder < band.toOrder))
        bad('toOrder', 'upper order must be above the lower order (≥ 0)');
      break;
    case 'fault':
      if (!(band.halfWidth > 0)) bad('halfWidth', 'half-width must be above 0');
      if (
        band.harmonics !== undefined &&
        !(Number.isInteger(band.harmonics) && band.harmonics >= 1)
      )
        bad('harmonics', 'harmonics must be a whole number ≥ 1');
      break;
  }
  const rule = band.statistical;
  if (rule !== undefined) {
    if (!(rule.kAlert > 0)) bad('statistical.kAlert', 'k for alert must be above 0');
    if (rule.kDanger !== undefined && !(rule.kDanger > rule.kAlert))
      bad('statistical.kDanger', 'k for danger must be above k for alert');
    const least = `a statistical level needs a baseline of at least ${MIN_BASELINE.count} usable values over at least ${MIN_BASELINE.days} days`;
    if (rule.baseline.from === 'first-n') {
      if (!(Number.isInteger(rule.baseline.count) && rule.baseline.count >= MIN_BASELINE.count))
        bad(
          'statistical.baseline.count',
          `${least}; ${rule.baseline.count} value(s) would make mean + kσ mostly noise`,
        );
    } else if (!(rule.baseline.fromAt < rule.baseline.toAt)) {
      bad('statistical.baseline.toAt', 'the baseline period must end after it starts');
    } else if (rule.baseline.toAt - rule.baseline.fromAt < MIN_BASELINE.days * 86_400_000) {
      bad('statistical.baseline.toAt', `${least}; this period is shorter`);
    }
    const est = rule.established;
    if (est !== undefined && est.count < MIN_BASELINE.count)
      bad(
        'statistical.established.count',
        `${least}; the given baseline has ${est.count} value(s)`,
      );
    else if (est !== undefined && est.spanDays !== undefined && est.spanDays < MIN_BASELINE.days)
      bad(
        'statistical.established.spanDays',
        `${least}; the given baseline spans ${est.spanDays.toFixed(1)} days`,
      );
  }
  return problems;
}
