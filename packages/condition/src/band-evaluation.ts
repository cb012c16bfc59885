import type { BandDefinition, BaselineStats } from './band-definition.ts';
import {
  addToBaseline,
  baselineComplete,
  baselineStats,
  baselineTakes,
  EMPTY_BASELINE,
  type BaselineAccumulator,
} from './baseline.ts';
import {
  bandClearPersistence,
  bandHysteresis,
  bandPersistence,
  levelsInForce,
} from './effective-levels.ts';
import type { QualityVerdict } from './quality.ts';

/** Alert levels, in increasing severity. */
export type AlertLevel = 'alert' | 'danger';

/** What a band has raised and not yet cleared: nothing, alert, or danger. */
export type BandCondition = 'normal' | AlertLevel;

/**
 * Everything limit evaluation must remember about one band between snapshots. Plain JSON
 * (numbers, booleans, strings, null), so it can be stored in one JSON column per point and
 * band.
 */
export interface BandState {
  /** What the band has raised and not yet cleared. */
  readonly condition: BandCondition;
  /** Consecutive usable values at or above the alert level in force. */
  readonly alertRun: number;
  /** Consecutive usable values at or above the danger level in force. */
  readonly dangerRun: number;
  /** Whether any value of the current alert run was `suspect`. */
  readonly alertRunSuspect: boolean;
  /** Whether any value of the current danger run was `suspect`. */
  readonly dangerRunSuspect: boolean;
  /**
   * Consecutive usable values strictly below the clear level while raised (absent in states
   * stored before it was kept: read as 0).
   */
  readonly clearRun?: number;
  /** The baseline collected so far for a statistical rule. */
  readonly baseline: BaselineAccumulator;
  /** Whether the collected baseline is complete (then it no longer changes). */
  readonly baselineComplete: boolean;
  /** takenAt (epoch ms) of the latest usable value evaluated; null before the first. */
  readonly lastTakenAt: number | null;
}

/** State of a band that has seen no values. */
export const INITIAL_BAND_STATE: BandState = {
  condition: 'normal',
  alertRun: 0,
  dangerRun: 0,
  alertRunSuspect: false,
  dangerRunSuspect: false,
  clearRun: 0,
  baseline: EMPTY_BASELINE,
  baselineComplete: false,
  lastTakenAt: null,
};

/** One band value of one snapshot. */
export interface BandSample {
  /** When the snapshot was taken, epoch milliseconds (UTC). */
  readonly takenAt: number;
  /** The band value, in the band's unit. */
  readonly value: number;
  /** The snapshot's quality verdict. */
  readonly quality: QualityVerdict;
  /** Why the snapshot is `suspect` or `unusable` (the quality findings, for people). */
  readonly qualityReason?: string;
}

/** What one band value caused. */
export type BandEvent =
  /** The band rose to `level` after `run` consecutive values at or above `limit`. */
  | {
      readonly kind: 'exceedance';
      readonly level: AlertLevel;
      readonly value: number;
      readonly limit: number;
      readonly takenAt: number;
      readonly run: number;
      /** Some value of the run was `suspect`. */
      readonly suspect: boolean;
    }
  /** A value while the band is raised that neither escalates nor clears it. */
  | {
      readonly kind: 'observation';
      readonly value: number;
      readonly takenAt: number;
      readonly suspect: boolean;
    }
  /**
   * The band is back inside limits: `run` consecutive values (the clear persistence) strictly
   * below `limit` = h × alert level; `value` is the latest of them.
   */
  | {
      readonly kind: 'inside-limits';
      readonly value: number;
      readonly limit: number;
      readonly takenAt: number;
      readonly suspect: boolean;
      readonly run?: number;
    }
  /** An `unusable` snapshot: nothing was evaluated; the engineer should look at the data. */
  | {
      readonly kind: 'quality-notice';
      readonly takenAt: number;
      readonly value: number;
      readonly reason: string | null;
    }
  /** A statistical rule's baseline became complete; its levels apply from this value on. */
  | {
      readonly kind: 'baseline-complete';
      readonly takenAt: number;
      readonly stats: BaselineStats;
    }
  /** A value not later than the latest one evaluated; ignored (see {@link evaluateBand}). */
  | {
      readonly kind: 'late';
      readonly takenAt: number;
      readonly lastTakenAt: number;
    };

/** Result of {@link evaluateBand}. */
export interface BandEvaluation {
  readonly state: BandState;
  readonly events: BandEvent[];
}

/**
 * Evaluates one new value of one band against its levels, with persistence, hysteresis and
 * quality gating. Pure.
 *
 * Rules (Turnstone's; persistence and hysteresis as such are common practice, no source):
 * 1. Quality gating. An `unusable` value changes nothing — no counter moves, nothing raises
 *    or clears, the baseline does not take it; it is as if the snapshot had not been taken —
 *    and yields a `quality-notice` event. A `suspect` value is evaluated like an `ok` one and
 *    every event it takes part in carries `suspect: true`.
 * 2. Order. A usable value whose takenAt is not after the latest evaluated one yields a
 *    `late` event and changes nothing: limit evaluation needs time order, and a late value
 *    must not re-open or clear a present alert.
 * 3. Baseline. A statistical rule's baseline takes the value first (see `baselineTakes`); the
 *    levels in force are then computed by `levelsInForce` (the one function the trend page
 *    and review use too).
 * 4. Exceedance. A value **at or above** a level exceeds it (the same "on the boundary is the
 *    higher side" rule as `isoZone`). Each level counts its consecutive exceedances; a value
 *    below the level resets its count.
 * 5. Raising and escalation. When the count for danger reaches the band's persistence n and
 *    the band is not at danger, an `exceedance` at danger follows (raising directly, or
 *    escalating from alert); otherwise when the count for alert reaches n and the band is
 *    normal, an `exceedance` at alert follows.
 * 6. Clearing. A raised band (alert or danger) clears after `clearPersistence` (default 3)
 *    consecutive values **strictly below** h × the alert level in force (hysteresis h,
 *    default 0.9): an `inside-limits` event. A value at or above the clear level resets the
 *    count, so a value scattering around its level raises and clears once, not every day.
 *    A raised band never steps down from danger to alert; it stays at its highest level
 *    until it clears.
 * 7. Any other value while raised is an `observation` (for last and peak values).
 */
export function evaluateBand(
  band: BandDefinition,
  state: BandState,
  sample: BandSample,
): BandEvaluation {
  if (sample.quality === 'unusable') {
    return {
      state,
      events: [
        {
          kind: 'quality-notice',
          takenAt: sample.takenAt,
          value: sample.value,
          reason: sample.qualityReason ?? null,
        },
      ],
    };
  }
  if (!Number.isFinite(sample.value)) {
    throw new RangeError(`band ${band.key}: value must be finite, got ${sample.value}`);
  }
  if (state.lastTakenAt !== null && sample.takenAt <= state.lastTakenAt) {
    return {
      state,
      events: [{ kind: 'late', takenAt: sample.takenAt, lastTakenAt: state.lastTakenAt }],
    };
  }

  const events: BandEvent[] = [];
  const suspect = sample.quality === 'suspect';

  // 3. baseline
  let baseline = state.baseline;
  let complete = state.baselineComplete;
  const rule = band.statistical;
  if (rule !== undefined && rule.established === undefined && !complete) {
    if (baselineTakes(rule.baseline, baseline, sample, rule.includeSuspect ?? true)) {
      baseline = addToBaseline(baseline, sample.value, sample.takenAt);
    }
    if (baselineComplete(rule.baseline, baseline, sample.takenAt)) {
      complete = true;
      const stats = baselineStats(baseline);
      if (stats !== null)
        events.push({ kind: 'baseline-complete', takenAt: sample.takenAt, stats });
    }
  }
  const levels = levelsInForce(band, { baseline, baselineComplete: complete });

  // 4. consecutive exceedances per level
  const overAlert = sample.value >= levels.alertLevel;
  const overDanger = sample.value >= levels.dangerLevel;
  const alertRun = overAlert ? state.alertRun + 1 : 0;
  const dangerRun = overDanger ? state.dangerRun + 1 : 0;
  const alertRunSuspect = overAlert && ((state.alertRun > 0 && state.alertRunSuspect) || suspect);
  const dangerRunSuspect =
    overDanger && ((state.dangerRun > 0 && state.dangerRunSuspect) || suspect);

  const n = bandPersistence(band);
  const clearBelow = bandHysteresis(band) * levels.alertLevel;
  const below = state.condition !== 'normal' && sample.value < clearBelow;
  let clearRun = below ? (state.clearRun ?? 0) + 1 : 0;
  let condition = state.condition;

  if (condition !== 'danger' && dangerRun >= n) {
    condition = 'danger';
    events.push({
      kind: 'exceedance',
      level: 'danger',
      value: sample.value,
      limit: levels.dangerLevel,
      takenAt: sample.takenAt,
      run: dangerRun,
      suspect: dangerRunSuspect,
    });
  } else if (condition === 'normal' && alertRun >= n) {
    condition = 'alert';
    events.push({
      kind: 'exceedance',
      level: 'alert',
      value: sample.value,
      limit: levels.alertLevel,
      takenAt: sample.takenAt,
      run: alertRun,
      suspect: alertRunSuspect,
    });
  } else if (condition !== 'normal' && below && clearRun >= bandClearPersistence(band)) {
    condition = 'normal';
    events.push({
      kind: 'inside-limits',
      value: sample.value,
      limit: clearBelow,
      takenAt: sample.takenAt,
      suspect,
      run: clearRun,
    });
    clearRun = 0;
  } else if (condition !== 'normal') {
    events.push({ kind: 'observation', value: sample.value, takenAt: sample.takenAt, suspect });
  }

  return {
    state: {
      condition,
      alertRun,
      dangerRun,
      alertRunSuspect,
      dangerRunSuspect,
      clearRun,
      baseline,
      baselineComplete: complete,
      lastTakenAt: sample.takenAt,
    },
    events,
  };
}
