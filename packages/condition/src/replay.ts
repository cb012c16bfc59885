import type { BandDefinition } from './band-definition.ts';
import type { AlertLevel } from './band-evaluation.ts';
import { evaluateSnapshot, type PointState, type SnapshotValues } from './snapshot-evaluation.ts';

/** One stored snapshot of a point's history, as replay reads it. */
export type ReplayEntry = SnapshotValues;

/** One alert the proposed limit set would have raised. */
export interface ReplayAlert {
  readonly sequence: number;
  /** The level it was raised at. */
  readonly raisedLevel: AlertLevel;
  readonly raisedAt: number;
  readonly raisedValue: number;
  /** When it would have escalated to danger, if it did. */
  readonly escalatedAt: number | null;
  /** When it would have cleared; null if still open at the end of the history. */
  readonly clearedAt: number | null;
  readonly peakValue: number;
  readonly peakAt: number;
  readonly suspect: boolean;
}

/** When a level was entered: a new alert raised at it, or an escalation to danger. */
export interface ReplayOccurrence {
  readonly level: AlertLevel;
  readonly at: number;
  readonly value: number;
  readonly how: 'raised' | 'escalated';
}

/** Replay result for one band. */
export interface ReplayBandReport {
  readonly bandKey: string;
  readonly bandName: string;
  /** Alerts in time order. */
  readonly alerts: ReplayAlert[];
  /** Every time a level was entered, in time order. */
  readonly occurrences: ReplayOccurrence[];
  /**
   * Times each level was entered: `alert` = new alerts raised at alert level; `danger` = new
   * alerts raised directly at danger plus escalations.
   */
  readonly byLevel: Readonly<Record<AlertLevel, number>>;
  /** Values of this band that were evaluated (usable and in time order). */
  readonly evaluated: number;
}

/** Result of {@link replayLimitSet}. */
export interface ReplayReport {
  readonly bands: ReplayBandReport[];
  /** Number of alerts over all bands, and how many of them reached danger. */
  readonly totals: { readonly alerts: number; readonly reachedDanger: number };
  /** takenAt of the `unusable` snapshots, each of which would have raised a quality notice. */
  readonly qualityNotices: number[];
  /** The point state at the end of the history. */
  readonly finalState: PointState;
}

interface MutableBandReport {
  bandKey: string;
  bandName: string;
  alerts: ReplayAlert[];
  occurrences: ReplayOccurrence[];
  byLevel: Record<AlertLevel, number>;
  evaluated: number;
}

/**
 * Runs a proposed limit set over a point's stored history with the same code the worker uses
 * ({@link evaluateSnapshot}: `evaluateBand` + `reduceAlert`), starting from an empty state
 * (or `options.initialState`), and reports the alerts it would have raised, and when, per band
 * and level. The history is evaluated in takenAt order whatever order it is given in.
 * Acknowledgements play no part: they do not change when alerts are raised or cleared.
 *
 * Source: Turnstone rules, no external source.
 */
export function replayLimitSet(
  bands: readonly BandDefinition[],
  history: readonly ReplayEntry[],
  options: { initialState?: PointState } = {},
): ReplayReport {
  const reports = new Map<string, MutableBandReport>();
  for (const band of bands) {
    reports.set(band.key, {
      bandKey: band.key,
      bandName: band.name,
      alerts: [],
      occurrences: [],
      byLevel: { alert: 0, danger: 0 },
      evaluated: 0,
    });
  }
  const ordered = [...history].sort((a, b) => a.takenAt - b.takenAt);
  let state: PointState = options.initialState ?? {};
  const qualityNotices: number[] = [];

  for (const entry of ordered) {
    const result = evaluateSnapshot(bands, state, entry);
    state = result.state;
    const notEvaluated = new Set(
      result.events
        .filter(({ event }) => event.kind === 'late' || event.kind === 'quality-notice')
        .map(({ bandKey }) => bandKey),
    );
    for (const report of reports.values()) {
      const value = entry.values[report.bandKey];
      if (value !== null && value !== undefined && !notEvaluated.has(report.bandKey)) {
        report.evaluated += 1;
      }
    }
    for (const change of result.changes) {
      if (change.kind === 'quality-notice') {
        qualityNotices.push(change.takenAt);
        continue;
      }
      if (change.kind === 'ignored') continue;
      const report = reports.get(change.bandKey);
      if (report === undefined) continue;
      const alert = change.alert;
      if (change.kind === 'raised') {
        report.byLevel[alert.level] += 1;
        report.occurrences.push({
          level: alert.level,
          at: alert.raisedAt,
          value: alert.firstValue,
          how: 'raised',
        });
      } else if (change.kind === 'escalated') {
        report.byLevel.danger += 1;
        report.occurrences.push({
          level: 'danger',
          at: alert.escalatedAt ?? alert.lastAt,
          value: alert.lastValue,
          how: 'escalated',
        });
      }
      const index = report.alerts.findIndex((a) => a.sequence === alert.sequence);
      const previous = index >= 0 ? report.alerts[index] : undefined;
      const summary: ReplayAlert = {
        sequence: alert.sequence,
        raisedLevel: previous?.raisedLevel ?? alert.level,
        raisedAt: alert.raisedAt,
        raisedValue: alert.firstValue,
        escalatedAt: alert.escalatedAt,
        clearedAt: alert.clearedAt,
        peakValue: alert.peakValue,
        peakAt: alert.peakAt,
        suspect: alert.suspect,
      };
      if (index >= 0) report.alerts[index] = summary;
      else report.alerts.push(summary);
    }
  }

  const bandReports = [...reports.values()];
  const alerts = bandReports.flatMap((r) => r.alerts);
  return {
    bands: bandReports,
    totals: {
      alerts: alerts.length,
      reachedDanger: alerts.filter((a) => a.raisedLevel === 'danger' || a.escalatedAt !== null)
        .length,
    },
    qualityNotices,
    finalState: state,
  };
}
