import type { AlertLevel, BandEvent, QualityNotice } from './band-evaluation.ts';

/** Lifecycle of one alert. */
export type AlertLifecycle = 'raised' | 'acknowledged' | 'cleared';

/** Who acknowledged an alert, when, and what they wrote. */
export interface Acknowledgement {
  /** The acknowledging user (id or name, as the server stores it). */
  readonly by: string;
  readonly note: string;
  /** Epoch milliseconds. */
  readonly at: number;
}

/**
 * One alert of one band of one point: the row the worker keeps in `alerts`. Plain JSON.
 * A band has at most one alert that is not cleared; the reducer's state is the band's latest
 * alert (or null before the first).
 */
export interface AlertState {
  /** 1 for the band's first alert, +1 for every new alert after a clearing. */
  readonly sequence: number;
  /** Highest level reached; never steps down. */
  readonly level: AlertLevel;
  readonly state: AlertLifecycle;
  /** The level value exceeded when raised or, after escalation, the danger level. */
  readonly limit: number;
  /** When raised (= firstAt). */
  readonly raisedAt: number;
  /** When escalated to danger; null if raised at danger or never escalated. */
  readonly escalatedAt: number | null;
  /** When cleared; null while open. */
  readonly clearedAt: number | null;
  /** The value that cleared it; null while open. */
  readonly clearedValue: number | null;
  readonly firstValue: number;
  readonly firstAt: number;
  /** Latest value while open (the clearing value is not counted). */
  readonly lastValue: number;
  readonly lastAt: number;
  /** Highest value while open, and when (the first time it was reached). */
  readonly peakValue: number;
  readonly peakAt: number;
  /** The acknowledgement in force; reset by an escalation to danger. */
  readonly acknowledgement: Acknowledgement | null;
  /** Whether the values that raised or escalated it included `suspect` ones. */
  readonly suspect: boolean;
}

/** What a person does to an alert. */
export interface AcknowledgeEvent {
  readonly kind: 'acknowledge';
  readonly by: string;
  readonly note: string;
  /** Epoch milliseconds. */
  readonly at: number;
}

/** Input of {@link reduceAlert}: a band event from `evaluateBand`, or an acknowledgement. */
export type AlertEvent = BandEvent | AcknowledgeEvent;

/**
 * What the worker (or the acknowledge service) must persist and mail.
 * - `raised`: insert a new alert row; mail subscribers.
 * - `escalated`: update the row (level danger, state raised again); mail subscribers.
 *   `resetAcknowledgement` is the acknowledgement that the escalation withdrew, if any.
 * - `acknowledged`: update the row; write the audit log.
 * - `updated`: last/peak value changed; update the row, no mail.
 * - `cleared`: update the row; mail subscribers.
 * - `quality-notice`: store a data-quality notice and tell the engineer.
 * - `ignored`: an acknowledgement that could not apply (the API answers 409 with `reason`).
 */
export type AlertChange =
  | { readonly kind: 'raised'; readonly alert: AlertState }
  | {
      readonly kind: 'escalated';
      readonly alert: AlertState;
      readonly resetAcknowledgement: Acknowledgement | null;
    }
  | {
      readonly kind: 'acknowledged';
      readonly alert: AlertState;
      readonly acknowledgement: Acknowledgement;
    }
  | { readonly kind: 'updated'; readonly alert: AlertState }
  | { readonly kind: 'cleared'; readonly alert: AlertState }
  | QualityNotice
  | {
      readonly kind: 'ignored';
      readonly reason: 'no-alert' | 'already-acknowledged';
    };

/** Result of {@link reduceAlert}. */
export interface AlertTransition {
  readonly state: AlertState | null;
  readonly changes: AlertChange[];
}

function isOpen(alert: AlertState | null): alert is AlertState {
  return alert !== null && alert.state !== 'cleared';
}

function withValue(alert: AlertState, value: number, at: number): AlertState {
  const peak = value > alert.peakValue;
  return {
    ...alert,
    lastValue: value,
    lastAt: at,
    peakValue: peak ? value : alert.peakValue,
    peakAt: peak ? at : alert.peakAt,
  };
}

/**
 * The alert state machine of one band, as a pure reducer: `(state, event) → { state, changes }`.
 *
 * States raised → acknowledged → cleared; levels alert and danger. Rules (Turnstone's, from
 * issue 5 and what a practitioner expects; no external source):
 * - An `exceedance` with no open alert (none yet, or the latest cleared) raises a **new**
 *   alert (sequence + 1) at the event's level, with first = last = peak = the event's value.
 * - An `exceedance` at danger while an alert-level alert is raised or acknowledged
 *   **escalates** it: level danger, limit the danger level, state back to `raised`, and the
 *   acknowledgement withdrawn — the operator acknowledged an alert, not a danger, so danger
 *   needs a new acknowledgement. Any other exceedance while open counts as an observation.
 * - An `observation` while open updates last (and peak, if higher) value and time.
 * - `inside-limits` while open clears it (from raised or acknowledged: an alert that clears
 *   unacknowledged stays visible as cleared with no acknowledgement).
 * - `acknowledge` on a raised alert records who, note and time and moves it to acknowledged;
 *   on a cleared alert never acknowledged it records the acknowledgement and it stays
 *   cleared (the operator notes an overnight alert after the fact). Otherwise it is ignored
 *   with a reason: `already-acknowledged`, or `no-alert` when there is none.
 * - `quality-notice` passes through as a change; the alert is untouched.
 * - `baseline-complete` and `late` change nothing here.
 */
export function reduceAlert(alert: AlertState | null, event: AlertEvent): AlertTransition {
  switch (event.kind) {
    case 'exceedance': {
      if (alert === null || alert.state === 'cleared') {
        const raised: AlertState = {
          sequence: (alert?.sequence ?? 0) + 1,
          level: event.level,
          state: 'raised',
          limit: event.limit,
          raisedAt: event.takenAt,
          escalatedAt: null,
          clearedAt: null,
          clearedValue: null,
          firstValue: event.value,
          firstAt: event.takenAt,
          lastValue: event.value,
          lastAt: event.takenAt,
          peakValue: event.value,
          peakAt: event.takenAt,
          acknowledgement: null,
          suspect: event.suspect,
        };
        return { state: raised, changes: [{ kind: 'raised', alert: raised }] };
      }
      if (event.level === 'danger' && alert.level === 'alert') {
        const escalated: AlertState = {
          ...withValue(alert, event.value, event.takenAt),
          level: 'danger',
          state: 'raised',
          limit: event.limit,
          escalatedAt: event.takenAt,
          acknowledgement: null,
          suspect: alert.suspect || event.suspect,
        };
        return {
          state: escalated,
          changes: [
            {
              kind: 'escalated',
              alert: escalated,
              resetAcknowledgement: alert.acknowledgement,
            },
          ],
        };
      }
      const updated = withValue(alert, event.value, event.takenAt);
      return { state: updated, changes: [{ kind: 'updated', alert: updated }] };
    }
    case 'observation': {
      if (!isOpen(alert)) return { state: alert, changes: [] };
      const updated = withValue(alert, event.value, event.takenAt);
      return { state: updated, changes: [{ kind: 'updated', alert: updated }] };
    }
    case 'inside-limits': {
      if (!isOpen(alert)) return { state: alert, changes: [] };
      const cleared: AlertState = {
        ...alert,
        state: 'cleared',
        clearedAt: event.takenAt,
        clearedValue: event.value,
      };
      return { state: cleared, changes: [{ kind: 'cleared', alert: cleared }] };
    }
    case 'acknowledge': {
      if (alert === null)
        return { state: alert, changes: [{ kind: 'ignored', reason: 'no-alert' }] };
      if (alert.acknowledgement !== null) {
        return { state: alert, changes: [{ kind: 'ignored', reason: 'already-acknowledged' }] };
      }
      const acknowledgement: Acknowledgement = { by: event.by, note: event.note, at: event.at };
      const acknowledged: AlertState = {
        ...alert,
        state: alert.state === 'cleared' ? 'cleared' : 'acknowledged',
        acknowledgement,
      };
      return {
        state: acknowledged,
        changes: [{ kind: 'acknowledged', alert: acknowledged, acknowledgement }],
      };
    }
    case 'quality-notice':
      return {
        state: alert,
        changes: [event],
      };
    case 'baseline-complete':
    case 'late':
      return { state: alert, changes: [] };
  }
}
