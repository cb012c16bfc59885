/**
 * One analysis job: the raw snapshot → `analyzeSnapshot` (dsp) → one transaction that
 * stores the analysis and band values, applies the condition step, updates the point and
 * marks the job done under its lease. The heavy computation runs outside the transaction.
 */
import { promisify } from 'node:util';
import { inflateRaw } from 'node:zlib';
import { eq } from 'drizzle-orm';
import { analyzeSnapshot, decodeSamples, type SnapshotAnalysis } from '@turnstone/dsp';
import { isoZone, type BandDefinition as LimitBand } from '@turnstone/condition';
import type { AppContext } from '../../lib/context.ts';
import { completeJobIn, LeaseLostError, type JobRow } from '../worker/queue-repository.ts';
import * as repo from './analysis-repository.ts';
import { combineBandValues, toDspBands } from './band-mapping.ts';
import { applyCondition } from './condition-step.ts';
import { templateBandsFor } from '../limits/limits-service.ts';

const inflate = promisify(inflateRaw);

export class PermanentJobError extends Error {}

const f32 = (a: Float32Array | null | undefined) =>
  a ? Buffer.from(a.buffer, a.byteOffset, a.byteLength) : null;

/** The point's limit set, created from its machine type's template the first time. */
export async function ensureLimitSet(
  ctx: AppContext,
  pointId: number,
  machine: repo.MachineRow,
): Promise<repo.StoredLimitSet> {
  const existing = await repo.loadLimitSet(ctx.db, pointId);
  if (existing) return existing;
  // A machine-type template an engineer stored wins over the built-in one.
  const template = await templateBandsFor(ctx, machine);
  await ctx.db.transaction((tx) =>
    repo.saveLimitSet(tx, pointId, `${machine.type} template`, template.bands, null),
  );
  return (await repo.loadLimitSet(ctx.db, pointId))!;
}

export interface AnalysisOutcome {
  snapshotId: number;
  analysisId: number | null;
  verdict: string;
}

export async function runAnalysisJob(
  ctx: AppContext,
  job: JobRow,
  owner: string,
): Promise<AnalysisOutcome> {
  if (!job.snapshotId) throw new PermanentJobError('analysis job without a snapshot');
  const snap = await repo.loadSnapshot(ctx.db, job.snapshotId);
  if (!snap) throw new PermanentJobError(`snapshot ${job.snapshotId} no longer exists`);
  if (!snap.samples) throw new PermanentJobError('raw samples have expired');
  const pc = await repo.loadPointContext(ctx.db, snap.pointId);
  if (!pc) throw new PermanentJobError(`point ${snap.pointId} no longer exists`);
  const limitSet = await ensureLimitSet(ctx, pc.point.id, pc.machine);

  const bytes = await inflate(snap.samples);
  const samples = decodeSamples(
    new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength),
    snap.encoding,
  );
  const bearingList = pc.bearings.map((b) => ({
    name: b.name,
    rollingElements: b.rollingElements,
    ballDiameterMm: b.ballDiameterMm,
    pitchDiameterMm: b.pitchDiameterMm,
    contactAngleDeg: b.contactAngleDeg,
    speedRatio: b.speedRatio,
  }));
  const machine = {
    bearings: bearingList,
    gears: pc.gears.map((g) => ({ name: g.name, teeth: g.teeth, speedRatio: g.speedRatio })),
    ...(pc.machine.bladeCount
      ? { blades: pc.machine.bladeCount }
      : pc.machine.vaneCount
        ? { blades: pc.machine.vaneCount }
        : {}),
  };
  const pointBearing = pc.bearings.find((b) => b.id === pc.point.bearingId)?.name ?? null;
  const dspBands = toDspBands(
    limitSet.bands,
    { machine, pointBearing },
    pc.machine.nominalRpm / 60,
  );
  const fmaxHz = Math.min(pc.point.fmaxHz, snap.sampleRateHz / 2.56);

  let analysis: SnapshotAnalysis;
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
    });
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
  const verdict = analysis.quality.verdict;

  const analysisId = await ctx.db.transaction(async (tx) => {
    const [row] = await tx
      .insert(repo.analyses)
      .values({
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
        qualityVerdict: verdict,
        bitsUsed: analysis.quality.bitsUsed,
        qualityFindings: analysis.quality.findings,
        summary: summaryOf(analysis),
        accelSpectrum: f32(analysis.spectra.acceleration.values),
        velocitySpectrum: f32(analysis.spectra.velocity.values),
        envelopeSpectrum: f32(analysis.spectra.envelope?.values),
        orderSpectrum: f32(analysis.spectra.order?.values),
      })
      .$returningId();
    const id = row!.id;
    const bandRows = Object.entries(values)
      .filter((e): e is [string, number] => e[1] !== null && Number.isFinite(e[1]))
      .map(([bandKey, value]) => ({
        analysisId: id,
        pointId: snap.pointId,
        bandKey,
        takenAt: snap.takenAt,
        value,
        qualityVerdict: verdict,
      }));
    if (bandRows.length) await tx.insert(repo.bandValues).values(bandRows);

    await applyCondition(ctx, tx, {
      pointId: snap.pointId,
      analysisId: id,
      snapshotId: snap.id,
      takenAt: snap.takenAt,
      verdict,
      findings: analysis.quality.findings,
      bands: limitSet.bands as LimitBand[],
      limitSetVersion: limitSet.version,
      values,
    });

    const newer = !pc.point.lastTakenAt || snap.takenAt >= pc.point.lastTakenAt;
    if (newer)
      await tx
        .update(repo.points)
        .set({ lastTakenAt: snap.takenAt, lastVerdict: verdict })
        .where(eq(repo.points.id, snap.pointId));
    await tx
      .update(repo.snapshots)
      .set({ status: 'done', statusReason: null })
      .where(eq(repo.snapshots.id, snap.id));
    if (!(await completeJobIn(tx, job.id, owner))) throw new LeaseLostError(job.id);
    return id;
  });
  return { snapshotId: snap.id, analysisId, verdict };
}

/** What the web app needs to draw the stored spectra, besides the float32 arrays. */
function summaryOf(a: SnapshotAnalysis) {
  return {
    schemaVersion: a.schemaVersion,
    sampleRateHz: a.sampleRateHz,
    sampleCount: a.sampleCount,
    durationS: a.durationS,
    fmaxHz: a.fmaxHz,
    isoBand: a.overall.isoBand,
    isoBandHz: a.overall.isoBandHz,
    snrDb: a.quality.snrDb,
    qualityMetrics: a.quality.metrics,
    speed: a.speed,
    spectra: {
      acceleration: {
        unit: a.spectra.acceleration.unit,
        scale: a.spectra.acceleration.scale,
        dfHz: a.spectra.acceleration.dfHz,
        window: a.spectra.acceleration.window,
        nperseg: a.spectra.acceleration.nperseg,
        averages: a.spectra.acceleration.averages,
        lines: a.spectra.acceleration.values.length,
      },
      velocity: {
        unit: a.spectra.velocity.unit,
        scale: a.spectra.velocity.scale,
        dfHz: a.spectra.velocity.dfHz,
        lowCutoffHz: a.spectra.velocity.lowCutoffHz,
        lines: a.spectra.velocity.values.length,
      },
      envelope: a.spectra.envelope
        ? {
            unit: a.spectra.envelope.unit,
            scale: a.spectra.envelope.scale,
            dfHz: a.spectra.envelope.dfHz,
            bandHz: a.spectra.envelope.bandHz,
            lines: a.spectra.envelope.values.length,
          }
        : null,
      order: a.spectra.order
        ? {
            unit: a.spectra.order.unit,
            scale: a.spectra.order.scale,
            dOrder: a.spectra.order.dOrder,
            method: a.spectra.order.method,
            lines: a.spectra.order.values.length,
          }
        : null,
    },
    peaks: a.peaks,
    faultFrequencies: a.faultFrequencies,
  };
}
