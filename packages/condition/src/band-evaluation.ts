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
  bandClearAfterHours,
  bandClearLevel,
  bandClearPersistence,
  bandHysteresis,
  bandPersistence,
  levelsInForce,
} from './effective-levels.ts';
import type { QualityVerdict } from './quality.ts';

const HOUR_MS = 3_600_000;

/** Slices an off-delay window is counted in (see `BandState.offDelay`). */
export const OFF_DELAY_BUCKETS = 12;

/**
 * Largest share of the values over the off-delay that may reach h × the clear level (h² × the
 * alert level) for a raised band to clear: 5 %, i.e. that level lies above the recent values'
 * 95th percentile. Common practice, no source.
 */
export const OFF_DELAY_SHARE = 0.05;

type OffDelay = NonNullable<BandState['offDelay']>;

/** Adds one value to the off-delay slices (a new window when the width changed). */
function countOffDelay(
  window: OffDelay | null,
  widthMs: number,
  takenAt: number,
  high: boolean,
): OffDelay {
  const index = Math.floor(takenAt / widthMs);
  const slices = (window?.widthMs === widthMs ? window.slices : []).filter(
    ([i]) => i > index - OFF_DELAY_BUCKETS,
  );
  const last = slices[slices.length - 1];
  if (last !== undefined && last[0] === index) {
    slices[slices.length - 1] = [index, last[1] + 1, last[2] + (high ? 1 : 0)];
  } else slices.push([index, 1, high ? 1 : 0]);
  return { widthMs, slices };
}

/** Share of the counted values at or above the clear level. */
function offDelayShare(window: OffDelay): number {
  let values = 0;
  let high = 0;
  for (const [, n, h] of window.slices) {
    values += n;
    high += h;
  }
  return values === 0 ? 0 : high / values;
}

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
  /**
   * takenAt (epoch ms) of the latest value at which the raise rule held: a run of
   * `persistence` or more values at or above the alert level in force. The clear off-delay
   * (`clearAfterHours`) counts from it. Null before any; absent in states stored before it
   * was kept (read as null: no off-delay for an alert raised before).
   */
  readonly raiseHeldAt?: number | null;
  /**
   * While raised with an off-delay: how many values, and how many of them at or above h × the
   * clear level, fell in each of the latest {@link OFF_DELAY_BUCKETS} slices of
   * `clearAfterHours` (`[slice index, values, at or above]`, slice = ⌊takenAt / width⌋). Null
   * while normal; absent in states stored before it was kept (read as null).
   */
  readonly offDelay?: {
    readonly widthMs: number;
    readonly slices: [number, number, number][];
  } | null;
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
  raiseHeldAt: null,
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

/** An `unusable` snapshot's notice: the band event, and the alert change it passes on as it is. */
export interface QualityNotice {
  readonly kind: 'quality-notice';
  readonly takenAt: number;
  readonly value: number;
  readonly reason: string | null;
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
  | QualityNotice
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
 * 6. Clearing. A raised band (alert or danger) clears when its latest `clearPersistence`
 *    values lie **strictly below** h × the alert level in force (hysteresis h, default 0.9)
 *    **and** the raise rule (rule 5's run of `persistence` values at or above the alert level)
 *    has not held for at least `clearAfterHours` (an alarm off-delay, re-armed by every run
 *    that would raise) **and** at most 5 % of the values over the last `clearAfterHours`
 *    reached h × the clear level (h² × alert, 0.81 × with h = 0.9; counted in {@link OFF_DELAY_BUCKETS} slices of it, so the window
 *    is `clearAfterHours` to 11/12 of it long): an `inside-limits` event. A value at or above
 *    the clear level resets the count, so a value scattering around its level, or a slow
 *    degradation wandering across it, raises and clears once, not every few days; the rare
 *    high values of a healthy band's scatter stay under 5 %, so a fault that went away still
 *    clears. Deadband (hysteresis) and off-delay against
 *    chattering alarms: ANSI/ISA-18.2-2016 and EEMUA 191 (from memory); the values are
 *    Turnstone's, common practice, no source.
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
  const clearBelow = bandClearLevel(band, levels);
  const below = state.condition !== 'normal' && sample.value < clearBelow;
  let clearRun = below ? (state.clearRun ?? 0) + 1 : 0;
  const raiseHeldAt = alertRun >= n ? sample.takenAt : (state.raiseHeldAt ?? null);
  const offDelayMs = bandClearAfterHours(band) * HOUR_MS;
  // the off-delay's own deadband: one more hysteresis step below the clear level
  const quietBelow = bandHysteresis(band) * clearBelow;
  let offDelay: OffDelay | null =
    state.condition !== 'normal' && offDelayMs > 0
      ? countOffDelay(
          state.offDelay ?? null,
          offDelayMs / OFF_DELAY_BUCKETS,
          sample.takenAt,
          sample.value >= quietBelow,
        )
      : null;
  const clears =
    below &&
    clearRun >= bandClearPersistence(band) &&
    (offDelay === null ||
      ((raiseHeldAt === null || sample.takenAt - raiseHeldAt >= offDelayMs) &&
        offDelayShare(offDelay) <= OFF_DELAY_SHARE));
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
  } else if (condition !== 'normal' && clears) {
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
    offDelay = null;
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
      raiseHeldAt,
      offDelay,
      baseline,
      baselineComplete: complete,
      lastTakenAt: sample.takenAt,
    },
    events,
  };
}
