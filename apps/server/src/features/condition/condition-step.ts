/**
 * The condition step of the worker: the point's limit bands and condition state
 * (`@turnstone/condition`, pure) → alert rows, alert history, data-quality notices. Runs
 * inside the analysis transaction with the points' state rows locked, so captures of one
 * point are judged one at a time and in order. One `ConditionBatch` per transaction: the
 * states and open alerts of all its points are read once, an alert updated by several
 * captures is written once (its row holds the latest state), and each changed point state
 * is saved once at the end.
 */
import type { Tx } from '@turnstone/db/client';

import {
  evaluateSnapshot,
  type AlertState,
  type BandDefinition as LimitBand,
  type PointChange,
  type PointState,
} from '@turnstone/condition';
import type { AppContext } from '../../lib/context.ts';
import * as repo from './condition-repository.ts';

export interface ConditionInput {
  pointId: number;
  analysisId: number;
  snapshotId: number;
  takenAt: Date;
  verdict: 'ok' | 'suspect' | 'unusable';
  findings: { code: string; severity: string; message: string; value: number }[];
  bands: LimitBand[];
  limitSetVersion: number;
  values: Record<string, number | null>;
}

const d = (ms: number) => new Date(ms);

export interface ConditionBatch {
  /** Judges one capture; false when it is older than one already judged (trended only). */
  judge(input: ConditionInput): Promise<boolean>;
  /** Writes the deferred alert updates and the changed point states. */
  finish(): Promise<void>;
  /** The point's condition state as judged so far (locked; null before its first capture). */
  stateOf(pointId: number): PointState | null;
}

/** Locks the points' condition states (ascending point id) and reads their open alerts. */
/**
 * What happens when an alert is raised, escalated or cleared, inside the batch's transaction
 * (the caller queues its mail; the condition step does not know about mail).
 */
export type AlertChangeHook = (change: {
  alertId: number;
  kind: 'raised' | 'escalated' | 'cleared';
}) => Promise<void>;

export async function startConditionBatch(
  ctx: AppContext,
  tx: Tx,
  pointIds: number[],
  onAlertChange: AlertChangeHook,
): Promise<ConditionBatch> {
  const states = await repo.lockPointStates(tx, pointIds);
  const open = new Map<string, number>();
  for (const a of await repo.openAlerts(tx, [...states.keys()])) {
    const k = alertKey(a.pointId, a.bandKey);
    if (!open.has(k)) open.set(k, a.id);
  }
  const w: AlertWrites = { open, pending: new Map(), onAlertChange };
  const judged = new Set<number>();
  const verdicts = await repo.lastVerdicts(tx, [...states.keys()]);
  return {
    stateOf(pointId) {
      return (states.get(pointId)?.state as unknown as PointState | undefined) ?? null;
    },
    async judge(input) {
      const row = states.get(input.pointId)!;
      if (row.evaluatedTakenAt && input.takenAt < row.evaluatedTakenAt) {
        // A capture older than one already judged: trended, but judging it now would
        // replay history out of order.
        return false;
      }
      const qualityReason =
        input.findings
          .filter((f) => f.severity === 'unusable')
          .map((f) => f.message)
          .join('; ') || undefined;
      const evaluation = evaluateSnapshot(input.bands, row.state as unknown as PointState, {
        takenAt: input.takenAt.getTime(),
        quality: input.verdict,
        ...(qualityReason ? { qualityReason } : {}),
        values: input.values,
      });
      const names = new Map(input.bands.map((b) => [b.key, b]));
      for (const change of evaluation.changes)
        await persistChange(ctx, tx, w, input, change, names);
      // An unusable capture is a notice of its own (above). A suspect one is judged as
      // usual, with its alerts marked suspect; the engineer is told once, when the point's
      // captures turn suspect, not on every capture while they stay so.
      const previous = verdicts.get(input.pointId) ?? null;
      if (input.verdict === 'suspect' && (previous === 'ok' || previous === null))
        await insertQualityNotice(tx, input);
      verdicts.set(input.pointId, input.verdict);
      row.state = evaluation.state as unknown as Record<string, unknown>;
      row.evaluatedTakenAt = input.takenAt;
      row.limitSetVersion = input.limitSetVersion;
      judged.add(input.pointId);
      return true;
    },
    async finish() {
      for (const [id, set] of w.pending) await repo.changeAlert(tx, id, set);
      w.pending.clear();
      for (const pointId of judged) {
        const row = states.get(pointId)!;
        await repo.savePointState(
          tx,
          pointId,
          row.state,
          row.evaluatedTakenAt!,
          row.limitSetVersion,
        );
      }
      judged.clear();
    },
  };
}

const alertKey = (pointId: number, bandKey: string) => `${pointId}:${bandKey}`;

type AlertFields = repo.AlertChange;
interface AlertWrites {
  /** Open alert id by point and band. */
  open: Map<string, number>;
  /** Alert rows whose update waits for the end of the batch (the last state wins). */
  pending: Map<number, AlertFields>;
  onAlertChange: AlertChangeHook;
}

/** A data-quality notice for the engineer (the Review screen lists the week's). */
async function insertQualityNotice(tx: Tx, input: ConditionInput): Promise<void> {
  await repo.insertQualityNotice(tx, {
    pointId: input.pointId,
    analysisId: input.analysisId,
    snapshotId: input.snapshotId,
    verdict: input.verdict,
    findings: input.findings,
    takenAt: input.takenAt,
  });
}

async function persistChange(
  ctx: AppContext,
  tx: Tx,
  w: AlertWrites,
  input: ConditionInput,
  change: PointChange,
  bands: Map<string, LimitBand>,
) {
  if (change.kind === 'quality-notice') {
    await insertQualityNotice(tx, input);
    return;
  }
  if (change.kind === 'ignored') return;
  const band = bands.get(change.bandKey);
  const a: AlertState = change.alert;
  if (change.kind === 'raised') {
    const alertId = await repo.raiseAlert(
      tx,
      {
        pointId: input.pointId,
        bandKey: change.bandKey,
        bandName: band?.name ?? change.bandKey,
        level: a.level,
        state: 'raised',
        unit: band?.unit ?? '',
        limitValue: a.limit,
        firstValue: a.firstValue,
        lastValue: a.lastValue,
        peakValue: a.peakValue,
        firstAt: d(a.firstAt),
        lastAt: d(a.lastAt),
        peakAt: d(a.peakAt),
        suspect: a.suspect,
      },
      { level: a.level, value: a.lastValue, at: d(a.lastAt) },
    );
    w.open.set(alertKey(input.pointId, change.bandKey), alertId);
    await w.onAlertChange({ alertId, kind: 'raised' });
    return;
  }
  const key = alertKey(input.pointId, change.bandKey);
  const openId = w.open.get(key);
  if (openId === undefined) return;
  const open = { id: openId };
  const common = {
    level: a.level,
    limitValue: a.limit,
    lastValue: a.lastValue,
    lastAt: d(a.lastAt),
    peakValue: a.peakValue,
    peakAt: d(a.peakAt),
    suspect: a.suspect,
  };
  if (change.kind === 'updated') {
    // Deferred: a later change of this alert in the batch carries the newer state.
    w.pending.set(open.id, common);
    return;
  }
  // The mail composed below reads the alert row; this write carries the whole state, so a
  // deferred update of the same alert is superseded.
  w.pending.delete(open.id);
  if (change.kind === 'escalated') {
    // An escalation to danger needs a fresh acknowledgement.
    await repo.changeAlert(
      tx,
      open.id,
      {
        ...common,
        state: 'raised',
        acknowledgedBy: null,
        acknowledgedAt: null,
        acknowledgeNote: null,
      },
      { kind: 'escalated', level: a.level, value: a.lastValue, at: d(a.lastAt) },
    );
    await w.onAlertChange({ alertId: open.id, kind: 'escalated' });
  } else if (change.kind === 'cleared') {
    await repo.changeAlert(
      tx,
      open.id,
      { ...common, state: 'cleared', clearedAt: d(a.clearedAt ?? a.lastAt) },
      {
        kind: 'cleared',
        level: a.level,
        value: a.clearedValue ?? a.lastValue,
        at: d(a.clearedAt ?? a.lastAt),
      },
    );
    w.open.delete(key);
    await w.onAlertChange({ alertId: open.id, kind: 'cleared' });
  }
}
