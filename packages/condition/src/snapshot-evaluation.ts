import type { BandDefinition } from './band-definition.ts';
import {
  evaluateBand,
  INITIAL_BAND_STATE,
  type BandEvent,
  type BandState,
} from './band-evaluation.ts';
import { reduceAlert, type AlertChange, type AlertState } from './alert-machine.ts';
import type { QualityVerdict } from './quality.ts';

/** What is remembered per band of a point: its evaluation state and its latest alert. */
export interface BandTrack {
  readonly band: BandState;
  readonly alert: AlertState | null;
}

/** A point's remembered state, by band key. A missing key means a band never evaluated. */
export type PointState = Readonly<Record<string, BandTrack>>;

/** The band values of one analysed snapshot. */
export interface SnapshotValues {
  /** When the snapshot was taken, epoch milliseconds (UTC). */
  readonly takenAt: number;
  readonly quality: QualityVerdict;
  /** The quality findings in words, when `suspect` or `unusable`. */
  readonly qualityReason?: string;
  /** Band values by band key; a band without a value (null/absent) is not evaluated. */
  readonly values: Readonly<Record<string, number | null | undefined>>;
}

/** A change for one band (see {@link AlertChange}), or one data-quality notice per snapshot. */
export type PointChange =
  | (Exclude<AlertChange, { kind: 'quality-notice' }> & { readonly bandKey: string })
  | {
      readonly kind: 'quality-notice';
      readonly takenAt: number;
      readonly reason: string | null;
      /** The bands whose values were held back. */
      readonly bandKeys: string[];
    };

/** Result of {@link evaluateSnapshot}. */
export interface SnapshotEvaluation {
  readonly state: PointState;
  /** What to persist and mail, in band order. */
  readonly changes: PointChange[];
  /** Every band event, for logs and replay. */
  readonly events: { readonly bandKey: string; readonly event: BandEvent }[];
}

/**
 * Evaluates one snapshot's band values against a point's limit set: for each band with a
 * value, {@link evaluateBand} then {@link reduceAlert} on each of its events. The per-band
 * data-quality notices of an `unusable` snapshot are merged into one notice for the snapshot
 * (one notice, even when the limit set has no band). This is the one place the worker and
 * {@link replayLimitSet} run the rules.
 *
 * Source: Turnstone rules, no external source.
 */
export function evaluateSnapshot(
  bands: readonly BandDefinition[],
  state: PointState,
  snapshot: SnapshotValues,
): SnapshotEvaluation {
  const next: Record<string, BandTrack> = { ...state };
  const changes: PointChange[] = [];
  const events: { bandKey: string; event: BandEvent }[] = [];
  const heldBack: string[] = [];

  for (const band of bands) {
    const value = snapshot.values[band.key];
    if (value === null || value === undefined) continue;
    const track = next[band.key] ?? { band: INITIAL_BAND_STATE, alert: null };
    const evaluation = evaluateBand(band, track.band, {
      takenAt: snapshot.takenAt,
      value,
      quality: snapshot.quality,
      ...(snapshot.qualityReason === undefined ? {} : { qualityReason: snapshot.qualityReason }),
    });
    let alert = track.alert;
    for (const event of evaluation.events) {
      events.push({ bandKey: band.key, event });
      const transition = reduceAlert(alert, event);
      alert = transition.state;
      for (const change of transition.changes) {
        if (change.kind === 'quality-notice') heldBack.push(band.key);
        else changes.push({ ...change, bandKey: band.key });
      }
    }
    next[band.key] = { band: evaluation.state, alert };
  }

  if (snapshot.quality === 'unusable') {
    changes.push({
      kind: 'quality-notice',
      takenAt: snapshot.takenAt,
      reason: snapshot.qualityReason ?? null,
      bandKeys: heldBack,
    });
  }
  return { state: next, changes, events };
}

/**
 * Applies a person's acknowledgement to a band's alert (the acknowledge service's half of the
 * state machine). Source: Turnstone rules, see {@link reduceAlert}.
 */
export function acknowledgeAlert(
  state: PointState,
  bandKey: string,
  acknowledgement: { by: string; note: string; at: number },
): { state: PointState; changes: PointChange[] } {
  const track = state[bandKey];
  const transition = reduceAlert(track?.alert ?? null, { kind: 'acknowledge', ...acknowledgement });
  const changes: PointChange[] = [];
  for (const change of transition.changes) {
    if (change.kind !== 'quality-notice') changes.push({ ...change, bandKey });
  }
  if (track === undefined) return { state, changes };
  return { state: { ...state, [bandKey]: { ...track, alert: transition.state } }, changes };
}
