import {
  DEFAULT_CLEAR_AFTER_HOURS,
  DEFAULT_CLEAR_PERSISTENCE,
  DEFAULT_HYSTERESIS,
  DEFAULT_PERSISTENCE,
  type BandDefinition,
  type BaselineStats,
  type StatisticalCombine,
} from './band-definition.ts';
import { baselineStats, statisticalLevel, type BaselineAccumulator } from './baseline.ts';

/** The levels in force for a band at one moment. */
export interface EffectiveLevels {
  readonly alertLevel: number;
  readonly dangerLevel: number;
  /** `fixed` until a statistical rule has a complete baseline, then `statistical`. */
  readonly source: 'fixed' | 'statistical';
  /** The baseline used, when `source` is `statistical`. */
  readonly baseline: BaselineStats | null;
}

function combine(fixed: number, statistical: number, how: StatisticalCombine): number {
  if (how === 'min') return Math.min(fixed, statistical);
  if (how === 'max') return Math.max(fixed, statistical);
  return statistical;
}

/**
 * Alert and danger levels in force for a band, given the baseline available (an established
 * one on the rule, else the accumulated one once complete, else none).
 *
 * Rule: without a statistical rule or baseline, the fixed levels. With one, alert =
 * combine(fixed alert, L(kAlert)) and, when `kDanger` is set, danger =
 * combine(fixed danger, L(kDanger)), L(k) the log-domain k-sigma level of
 * {@link statisticalLevel}, where combine is `min` (default: the earlier
 * warning, fixed level as ceiling), `max` (fixed level as floor) or `statistical` (statistical
 * level alone). If the combined alert level ends above the danger level, it is lowered to the
 * danger level, so danger is never easier to reach than alert is.
 *
 * Source: mean + k·σ levels are common practice, no source; the combination rule is Turnstone's.
 */
export function effectiveLevels(
  band: BandDefinition,
  baseline: BaselineStats | null,
): EffectiveLevels {
  const rule = band.statistical;
  const stats = rule?.established ?? baseline;
  if (rule === undefined || stats === null) {
    return {
      alertLevel: band.alertLevel,
      dangerLevel: band.dangerLevel,
      source: 'fixed',
      baseline: null,
    };
  }
  const how = rule.combine ?? 'min';
  const dangerLevel =
    rule.kDanger === undefined
      ? band.dangerLevel
      : combine(band.dangerLevel, statisticalLevel(stats, rule.kDanger), how);
  const alertLevel = Math.min(
    combine(band.alertLevel, statisticalLevel(stats, rule.kAlert), how),
    dangerLevel,
  );
  return { alertLevel, dangerLevel, source: 'statistical', baseline: stats };
}

/** What {@link levelsInForce} reads of a band's evaluation state (see `BandState`). */
export interface BaselineProgress {
  readonly baseline: BaselineAccumulator;
  readonly baselineComplete: boolean;
}

/**
 * The levels in force for a band given its stored evaluation state (or null before its first
 * value): {@link effectiveLevels} with the rule's established baseline, else the collected
 * one once complete. The **one** place that decides which levels apply: the worker
 * (`evaluateBand`), the trend answer and chart, the projection and the weekly review all call
 * it, so they draw, project and alarm to the same levels.
 *
 * Source: Turnstone rule, no external source.
 */
export function levelsInForce(
  band: BandDefinition,
  state: BaselineProgress | null | undefined,
): EffectiveLevels {
  const collected =
    state !== null && state !== undefined && state.baselineComplete
      ? baselineStats(state.baseline)
      : null;
  return effectiveLevels(band, collected);
}

/** Persistence of a band with its default applied. Common practice, no source. */
export function bandPersistence(band: BandDefinition): number {
  return band.persistence ?? DEFAULT_PERSISTENCE;
}

/** Clear persistence of a band with its default applied. Common practice, no source. */
export function bandClearPersistence(band: BandDefinition): number {
  return band.clearPersistence ?? DEFAULT_CLEAR_PERSISTENCE;
}

/** Clear off-delay of a band in hours, with its default applied. Common practice, no source. */
export function bandClearAfterHours(band: BandDefinition): number {
  return band.clearAfterHours ?? DEFAULT_CLEAR_AFTER_HOURS;
}

/** Hysteresis fraction of a band with its default applied. Common practice, no source. */
export function bandHysteresis(band: BandDefinition): number {
  return band.hysteresis ?? DEFAULT_HYSTERESIS;
}

/**
 * The clear level of a raised band: h × the alert level in force; a value strictly below it
 * counts towards clearing (`evaluateBand` rule 6). Common practice, no source.
 */
export function bandClearLevel(band: BandDefinition, levels: EffectiveLevels): number {
  return bandHysteresis(band) * levels.alertLevel;
}
