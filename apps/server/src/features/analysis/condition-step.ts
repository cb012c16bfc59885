/**
 * The condition step of the worker: the point's limit bands and condition state
 * (`@turnstone/condition`, pure) → alert rows, alert history, data-quality notices. Runs
 * inside the analysis transaction with the point's state row locked, so captures of one
 * point are judged one at a time and in order.
 */
import { eq } from 'drizzle-orm';
import {
  evaluateSnapshot,
  type AlertState,
  type BandDefinition as LimitBand,
  type PointChange,
  type PointState,
} from '@turnstone/condition';
import type { AppContext } from '../../lib/context.ts';
import * as repo from './analysis-repository.ts';
import { queueAlertMail } from './alert-mail-hook.ts';

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

export async function applyCondition(
  ctx: AppContext,
  tx: repo.Tx,
  input: ConditionInput,
): Promise<PointChange[]> {
  const row = await repo.lockPointState(tx, input.pointId);
  if (row.evaluatedTakenAt && input.takenAt < row.evaluatedTakenAt) {
    // A capture older than one already judged: trended, but judging it now would replay
    // history out of order.
    return [];
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
  for (const change of evaluation.changes) await persistChange(ctx, tx, input, change, names);
  await repo.savePointState(
    tx,
    input.pointId,
    evaluation.state as unknown as Record<string, unknown>,
    input.takenAt,
    input.limitSetVersion,
  );
  return evaluation.changes;
}

async function persistChange(
  ctx: AppContext,
  tx: repo.Tx,
  input: ConditionInput,
  change: PointChange,
  bands: Map<string, LimitBand>,
) {
  if (change.kind === 'quality-notice') {
    await tx.insert(repo.qualityNotices).values({
      pointId: input.pointId,
      analysisId: input.analysisId,
      snapshotId: input.snapshotId,
      verdict: input.verdict,
      findings: input.findings,
      takenAt: input.takenAt,
    });
    return;
  }
  if (change.kind === 'ignored') return;
  const band = bands.get(change.bandKey);
  const a: AlertState = change.alert;
  if (change.kind === 'raised') {
    const [ins] = await tx
      .insert(repo.alerts)
      .values({
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
      })
      .$returningId();
    await tx.insert(repo.alertEvents).values({
      alertId: ins!.id,
      kind: 'raised',
      level: a.level,
      value: a.lastValue,
      at: d(a.lastAt),
    });
    await queueAlertMail(ctx, tx, { alertId: ins!.id, kind: 'raised' });
    return;
  }
  const open = await repo.openAlert(tx, input.pointId, change.bandKey);
  if (!open) return;
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
    await tx.update(repo.alerts).set(common).where(eq(repo.alerts.id, open.id));
  } else if (change.kind === 'escalated') {
    // An escalation to danger needs a fresh acknowledgement.
    await tx
      .update(repo.alerts)
      .set({
        ...common,
        state: 'raised',
        acknowledgedBy: null,
        acknowledgedAt: null,
        acknowledgeNote: null,
      })
      .where(eq(repo.alerts.id, open.id));
    await tx.insert(repo.alertEvents).values({
      alertId: open.id,
      kind: 'escalated',
      level: a.level,
      value: a.lastValue,
      at: d(a.lastAt),
    });
    await queueAlertMail(ctx, tx, { alertId: open.id, kind: 'escalated' });
  } else if (change.kind === 'cleared') {
    await tx
      .update(repo.alerts)
      .set({ ...common, state: 'cleared', clearedAt: d(a.clearedAt ?? a.lastAt) })
      .where(eq(repo.alerts.id, open.id));
    await tx.insert(repo.alertEvents).values({
      alertId: open.id,
      kind: 'cleared',
      level: a.level,
      value: a.clearedValue ?? a.lastValue,
      at: d(a.clearedAt ?? a.lastAt),
    });
    await queueAlertMail(ctx, tx, { alertId: open.id, kind: 'cleared' });
  }
}
