/**
 * Analysis jobs: raw snapshots → `analyzeSnapshot` (dsp) → one transaction per batch that
 * stores the analyses and band values, applies the condition step, updates the points and
 * marks the jobs done under their leases. Reads take a few statements per batch, the heavy
 * computation runs outside the transaction, and the batch commits once (one fsync).
 */
import { analyzeSnapshot, decodeSamples, type SnapshotAnalysis } from '@turnstone/dsp';
import { encodeSpectra } from '@turnstone/db/spectra-codec';
import { isoZone, type BandDefinition as LimitBand } from '@turnstone/condition';
import type { AppContext } from '../../lib/context.ts';
import {
  completeJobsIn,
  LeaseLostError,
  QUEUE_TX,
  type JobRow,
} from '../queue/queue-repository.ts';
import * as repo from './analysis-repository.ts';
import * as limitSets from '../limits/limit-set-repository.ts';
import { storedAnalysisOf, type StoredSummary } from '../points/stored-summary.ts';
import { diagnosisOf } from './diagnosis-step.ts';
import { machineComponentsOf } from '../points/machine-components.ts';
import { combineBandValues, toDspBands } from './band-mapping.ts';
import { startConditionBatch } from '../condition/condition-step.ts';
import { queueAlertMail } from '../notify/alert-change-hook.ts';
import { templateBandsFor } from '../limits/limits-service.ts';
import { storedSampleBytes } from '../ingest/sample-storage.ts';
import { addBandDaySums } from './band-day-sums-repository.ts';
import { refreshBandHours } from './band-hours-repository.ts';
import { daySumsOf } from './band-day-sums.ts';

export class PermanentJobError extends Error {}

/** The points' limit sets, each created from its machine type's template the first time. */
async function ensureLimitSets(
  ctx: AppContext,
  contexts: repo.PointContext[],
): Promise<Map<number, limitSets.StoredLimitSet>> {
  const sets = await limitSets.loadLimitSets(
    ctx.db,
    contexts.map((pc) => pc.point.id),
  );
  const missing = contexts.filter((pc) => !sets.has(pc.point.id));
  for (const pc of missing) {
    // A machine-type template an engineer stored wins over the built-in one.
    const template = await templateBandsFor(ctx, pc.machine);
    await ctx.db.transaction((tx) =>
      limitSets.saveLimitSet(tx, pc.point.id, `${pc.machine.type} template`, template.bands, null),
    );
  }
  if (missing.length) {
    const created = await limitSets.loadLimitSets(
      ctx.db,
      missing.map((pc) => pc.point.id),
    );
    for (const [pointId, set] of created) sets.set(pointId, set);
  }
  return sets;
}

export interface AnalysisOutcome {
  snapshotId: number;
  analysisId: number | null;
  verdict: string;
}

/** A job whose analysis is computed and waits to be written. */
export interface PreparedAnalysis {
  job: JobRow;
  snap: repo.SnapshotRow;
  pc: repo.PointContext;
  limitSet: limitSets.StoredLimitSet;
  analysis: SnapshotAnalysis;
  /** The analysis's spectra in their stored form (one compact BLOB, with their detail). */
  spectra: Buffer;
  /** The summary kept for ever (stored-summary.ts). */
  summary: StoredSummary;
  values: Record<string, number | null>;
  zone: 'A' | 'B' | 'C' | 'D' | null;
}

export interface JobFailure {
  job: JobRow;
  error: unknown;
}

/**
 * Reads what a batch needs (snapshots, points, limit sets: a few statements for the whole
 * batch) and runs the analyses, outside any transaction. A job that cannot be analysed is
 * returned as a failure; the others go on.
 */
export async function prepareAnalyses(
  ctx: AppContext,
  jobs: JobRow[],
): Promise<{ prepared: PreparedAnalysis[]; failures: JobFailure[] }> {
  const failures: JobFailure[] = [];
  const snaps = await repo.loadSnapshots(
    ctx.db,
    jobs.flatMap((j) => (j.snapshotId ? [j.snapshotId] : [])),
  );
  const contexts = await repo.loadPointContexts(ctx.db, [
    ...new Set([...snaps.values()].map((s) => s.pointId)),
  ]);
  const limitSets = await ensureLimitSets(ctx, [...contexts.values()]);
  const prepared: PreparedAnalysis[] = [];
  for (const job of jobs) {
    try {
      prepared.push(prepareOne(job, snaps, contexts, limitSets));
    } catch (error) {
      failures.push({ job, error });
    }
    // Analysis is CPU work on this thread: let waiting HTTP requests in between jobs.
    await new Promise((r) => setImmediate(r));
  }
  return { prepared, failures };
}

function prepareOne(
  job: JobRow,
  snaps: Map<number, repo.SnapshotRow>,
  contexts: Map<number, repo.PointContext>,
  limitSets: Map<number, limitSets.StoredLimitSet>,
): PreparedAnalysis {
  if (!job.snapshotId) throw new PermanentJobError('analysis job without a snapshot');
  const snap = snaps.get(job.snapshotId);
  if (!snap) throw new PermanentJobError(`snapshot ${job.snapshotId} no longer exists`);
  if (!snap.samples) throw new PermanentJobError('raw samples have expired');
  const pc = contexts.get(snap.pointId);
  if (!pc) throw new PermanentJobError(`point ${snap.pointId} no longer exists`);
  const limitSet = limitSets.get(pc.point.id)!;

  // Synchronous: ~16 kB inflate in well under a millisecond; the thread pool round trip
  // and stream machinery of the async form cost more than the work.
  const bytes = storedSampleBytes(snap.samples, snap.samplesCodec);
  const machine = machineComponentsOf(pc.machine, pc);
  const pointBearing = pc.bearings.find((b) => b.id === pc.point.bearingId)?.name ?? null;
  const dspBands = toDspBands(
    limitSet.bands,
    { machine, pointBearing },
    pc.machine.nominalRpm / 60,
  );
  const fmaxHz = Math.min(pc.point.fmaxHz, snap.sampleRateHz / 2.56);

  const samples = decodeSamples(
    new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength),
    snap.encoding,
  );
  let analysis: SnapshotAnalysis;
  let spectra: Buffer;
  let summary: StoredSummary;
  try {
    analysis = analyzeSnapshot({
      samples,
      encoding: snap.encoding,
      sampleRateHz: snap.sampleRateHz,
      adc: { bits: snap.adcBits, fullScaleV: snap.fullScaleV },
      sensor: { sensitivityMvPerG: snap.sensitivityMvPerG },
      ...(snap.speedRpm ? { speedRpm: snap.speedRpm } : {}),
      ...(snap.tach ? { tach: snap.tach } : {}),
      nominalRpm: pc.machine.nominalRpm,
      machine,
      fmaxHz,
      lines: pc.point.lines,
      bands: dspBands,
      ...(pc.point.envelopeLoHz !== null && pc.point.envelopeHiHz !== null
        ? { envelopeBandHz: [pc.point.envelopeLoHz, pc.point.envelopeHiHz] as const }
        : {}),
    });
    // Encoded here, outside the batch's transaction: a spectrum the code cannot hold (a
    // NaN line) fails its own job, not the batch.
    const stored = storedAnalysisOf(analysis);
    summary = stored.summary;
    spectra = encodeSpectra(
      {
        acceleration: analysis.spectra.acceleration.values,
        velocity: analysis.spectra.velocity.values,
        envelope: analysis.spectra.envelope?.values,
        order: analysis.spectra.order?.values,
      },
      stored.detail,
    );
  } catch (err) {
    if (err instanceof RangeError || err instanceof TypeError)
      throw new PermanentJobError(`analysis refused the snapshot: ${err.message}`);
    throw err;
  }
  const values = combineBandValues(limitSet.bands, analysis.bandValues);
  const group = pc.machine.isoGroup === 1 ? 1 : 2;
  const zone = Number.isFinite(analysis.overall.velocityRmsMmS)
    ? isoZone(analysis.overall.velocityRmsMmS, group, pc.machine.foundation)
    : null;
  return { job, snap, pc, limitSet, analysis, spectra, summary, values, zone };
}

/**
 * The batch as judged by the limit sets in force. A batch is computed before its write
 * transaction, and an engineer may save a point's limits in between. Saving locks the
 * point's condition state before writing the set, so with the batch's states locked (as
 * they are when this runs) the versions read here are the latest. A capture computed
 * against an older version is computed again with the saved bands: its band values and
 * verdicts then follow the set the engineer saw saved. One statement per batch; the
 * recomputation happens only after a save.
 */
async function withLimitsInForce(
  tx: Parameters<typeof limitSets.loadLimitSets>[0],
  batch: PreparedAnalysis[],
): Promise<PreparedAnalysis[]> {
  const pointIds = [...new Set(batch.map((p) => p.snap.pointId))];
  const versions = await limitSets.limitSetVersions(tx, pointIds);
  const stale = pointIds.filter((id) => {
    const v = versions.get(id);
    return v !== undefined && batch.some((p) => p.snap.pointId === id && p.limitSet.version !== v);
  });
  if (stale.length === 0) return batch;
  const sets = await limitSets.loadLimitSets(tx, stale);
  return batch.map((p) => {
    const set = sets.get(p.snap.pointId);
    if (!set || set.version === p.limitSet.version) return p;
    return prepareOne(
      p.job,
      new Map([[p.snap.id, p.snap]]),
      new Map([[p.pc.point.id, p.pc]]),
      new Map([[p.pc.point.id, set]]),
    );
  });
}

/**
 * Writes a batch of computed analyses in one transaction: the jobs are marked done first,
 * fenced by their lease (a worker that lost any of them throws `LeaseLostError` and writes
 * nothing), then the point states are locked (ascending point id), and analyses, band
 * values, condition changes, points and snapshots written with multi-row statements where
 * the rows are alike. Captures are judged in job order.
 */
export async function storeAnalyses(
  ctx: AppContext,
  computed: PreparedAnalysis[],
  owner: string,
): Promise<AnalysisOutcome[]> {
  if (computed.length === 0) return [];
  return ctx.db.transaction(async (tx) => {
    const jobIds = computed.map((p) => p.job.id);
    if (!(await completeJobsIn(tx, jobIds, owner))) throw new LeaseLostError(jobIds);
    const condition = await startConditionBatch(
      ctx,
      tx,
      computed.map((p) => p.snap.pointId),
      (change) => queueAlertMail(ctx, tx, change),
    );
    const batch = await withLimitsInForce(tx, computed);
    const ids = await repo.insertAnalyses(
      tx,
      batch.map((p) => {
        const { snap, analysis, spectra, summary, zone } = p;
        return {
          snapshotId: snap.id,
          pointId: snap.pointId,
          takenAt: snap.takenAt,
          accelRmsG: analysis.overall.accelRmsG,
          accelPeakG: analysis.overall.accelPeakG,
          velocityRmsMmS: analysis.overall.velocityRmsMmS,
          displacementPkPkUm: analysis.overall.displacementPkPkUm,
          crestFactor: analysis.overall.crestFactor,
          kurtosis: analysis.overall.kurtosis,
          speedRpm: analysis.speed.rpm,
          speedSource: analysis.speed.source,
          isoZone: zone,
          qualityVerdict: analysis.quality.verdict,
          bitsUsed: analysis.quality.bitsUsed,
          qualityFindings: analysis.quality.findings,
          summary,
          spectra,
          diagnosis: diagnosisOf(p, condition.stateOf(snap.pointId)),
          shaftVectors: analysis.shaftVectors as unknown as Record<string, unknown>[] | null,
        };
      }),
    );
    const analysisId = (p: PreparedAnalysis) => ids.get(p.snap.id)!;
    const bandRows = batch.flatMap((p) =>
      Object.entries(p.values)
        .filter((e): e is [string, number] => e[1] !== null && Number.isFinite(e[1]))
        .map(([bandKey, value]) => ({
          analysisId: analysisId(p),
          pointId: p.snap.pointId,
          bandKey,
          takenAt: p.snap.takenAt,
          value,
          qualityVerdict: p.analysis.quality.verdict,
        })),
    );
    await repo.insertBandValues(tx, bandRows);
    // the hours these values fall in, recomputed (a late capture lands in an old hour)
    await refreshBandHours(
      tx,
      bandRows.map((r) => ({ pointId: r.pointId, hourAt: r.takenAt })),
    );
    const zoneOf = new Map(batch.map((p) => [p.snap.pointId, p.pc.siteTimeZone]));
    await addBandDaySums(
      tx,
      daySumsOf(bandRows.map((r) => ({ ...r, timeZone: zoneOf.get(r.pointId)! }))),
    );

    const newest = new Map<number, PreparedAnalysis>();
    for (const p of batch) {
      const { snap, analysis, limitSet } = p;
      await condition.judge({
        pointId: snap.pointId,
        analysisId: analysisId(p),
        snapshotId: snap.id,
        takenAt: snap.takenAt,
        verdict: analysis.quality.verdict,
        findings: analysis.quality.findings,
        bands: limitSet.bands as LimitBand[],
        limitSetVersion: limitSet.version,
        values: p.values,
      });
      const last = newest.get(snap.pointId);
      if (!last || snap.takenAt >= last.snap.takenAt) newest.set(snap.pointId, p);
    }
    await condition.finish();
    for (const [pointId, p] of newest)
      await repo.markPointTaken(tx, pointId, p.snap.takenAt, p.analysis.quality.verdict);
    await repo.markSnapshotsDone(
      tx,
      batch.map((p) => p.snap.id),
    );
    return batch.map((p) => ({
      snapshotId: p.snap.id,
      analysisId: analysisId(p),
      verdict: p.analysis.quality.verdict,
    }));
  }, QUEUE_TX);
}

/**
 * Runs a claimed batch of analysis jobs and commits their results together. Jobs that
 * cannot be analysed come back as failures (the others are stored); when the write itself
 * fails (a lost lease, a deadlock, a row the database refuses) nothing of the batch is
 * stored and the error is thrown, so the caller can run the jobs one by one.
 */
export async function runAnalysisJobs(
  ctx: AppContext,
  jobs: JobRow[],
  owner: string,
): Promise<{ outcomes: AnalysisOutcome[]; failures: JobFailure[] }> {
  const { prepared, failures } = await prepareAnalyses(ctx, jobs);
  const outcomes = await storeAnalyses(ctx, prepared, owner);
  return { outcomes, failures };
}

/** One job alone: its outcome, or the error it failed with. */
export async function runAnalysisJob(
  ctx: AppContext,
  job: JobRow,
  owner: string,
): Promise<AnalysisOutcome> {
  const { outcomes, failures } = await runAnalysisJobs(ctx, [job], owner);
  if (failures[0]) throw failures[0].error;
  return outcomes[0]!;
}
