/**
 * The Machine and Point analysis views: machine data with fault frequencies, point detail,
 * the analyses list, stored spectra (float32 BLOBs sent as base64), the time waveform from
 * the raw snapshot, the waterfall, the band trend with levels and projection, and downloads.
 * Services take the signed-in user and check per-site access; they never see req/res.
 */
import {
  decodeSamples,
  faultFrequencies,
  scaleToAcceleration,
  writeWav,
  type FaultFrequency,
  type MachineComponents,
} from '@turnstone/dsp';
import { decimateTrend } from '@turnstone/condition/trend-decimation';
import { levelsInForce, projectTrend } from '@turnstone/condition';
import type {
  AnalysisSummary,
  CurrentDiagnosis,
  Diagnosis,
  ShaftVectorItem,
  MachineDetail,
  PointDetail,
  Spectrum,
  SpectrumKind,
  Waterfall,
  Waveform,
} from '@turnstone/contracts/points';
import type { TrendResponse } from '@turnstone/contracts/trend';
import { bandHzOf } from '@turnstone/contracts/band-label';
import type { NodeStatus } from '@turnstone/contracts/fleet';
import type { Db } from '@turnstone/db/client';
import { AppError, forbidden, notFound } from '../../lib/app-error.ts';
import type { AppContext } from '../../lib/context.ts';
import { accessiblePoint } from '../../lib/point-access.ts';
import { canSeeSite, type SessionUser } from '../../lib/session-user.ts';
import { loadLimitSet } from '../analysis/analysis-repository.ts';
import { pointStatus, QUALITY_MARK_MS, worst } from '../fleet/fleet-service.ts';
import * as repo from './points-repository.ts';
import { storedSampleBytesAsync } from '../ingest/sample-storage.ts';

const DAY_MS = 86_400_000;
/** Default trend period when none is given (the trend contract says 90 days). */
export const DEFAULT_TREND_DAYS = 90;
/** Projection fits the values of this many days before the latest (recent behaviour, not last year's). Common practice, no source. */
export const PROJECTION_WINDOW_DAYS = 60;
/** Overall velocity band key that the machine page's small trends follow. */
export const SPARK_BAND = 'overall-velocity';
export const SPARK_POINTS = 50;

const iso = (d: Date) => d.toISOString();

/** A [lo, hi] band in Hz from a stored summary field, or null (analyses stored before it). */
const bandHz = bandHzOf;

function summaryOf(r: repo.AnalysisSummaryRow): AnalysisSummary {
  return {
    id: r.id,
    snapshotId: r.snapshotId,
    takenAt: iso(r.takenAt),
    verdict: r.qualityVerdict,
    isoZone: r.isoZone,
    speedRpm: r.speedRpm,
    speedSource: r.speedSource,
    bitsUsed: r.bitsUsed,
    overall: {
      accelRmsG: r.accelRmsG,
      accelPeakG: r.accelPeakG,
      velocityRmsMmS: r.velocityRmsMmS,
      displacementPkPkUm: r.displacementPkPkUm,
      crestFactor: r.crestFactor,
      kurtosis: r.kurtosis,
      accelBandHz: bandHz(r.summary.accelBandHz),
      velocityBandHz: bandHz(r.summary.isoBandHz),
    },
    diagnosis: (r.diagnosis as Diagnosis | null) ?? null,
    shaftVectors: (r.shaftVectors as ShaftVectorItem[] | null) ?? null,
  };
}

/** The hints of the point's newest capture, for the alert detail and the alert mail. */
export async function currentDiagnosis(db: Db, pointId: number): Promise<CurrentDiagnosis | null> {
  const row = await repo.latestDiagnosis(db, pointId);
  return row
    ? { analysisId: row.id, takenAt: iso(row.takenAt), diagnosis: row.diagnosis as Diagnosis }
    : null;
}

function componentsOf(
  machine: { bladeCount: number | null; vaneCount: number | null },
  c: Awaited<ReturnType<typeof repo.machineComponents>>,
): MachineComponents {
  const blades = machine.bladeCount ?? machine.vaneCount ?? undefined;
  return {
    bearings: c.bearings.map((b) => ({
      name: b.name,
      rollingElements: b.rollingElements,
      ballDiameterMm: b.ballDiameterMm,
      pitchDiameterMm: b.pitchDiameterMm,
      contactAngleDeg: b.contactAngleDeg,
      speedRatio: b.speedRatio,
    })),
    gears: c.gears.map((g) => ({ name: g.name, teeth: g.teeth, speedRatio: g.speedRatio })),
    ...(blades ? { blades } : {}),
  };
}

async function statusesOf(
  db: Db,
  pointRows: { id: number; lastVerdict: string | null; lastTakenAt: Date | null }[],
  now: number,
) {
  const ids = pointRows.map((p) => p.id);
  const [levels, quality] = await Promise.all([
    repo.openAlertLevels(db, ids),
    repo.openQualityPoints(db, ids, new Date(now - QUALITY_MARK_MS)),
  ]);
  const out = new Map<number, NodeStatus>();
  for (const p of pointRows)
    out.set(
      p.id,
      pointStatus(levels.get(p.id), quality.has(p.id), p.lastVerdict, p.lastTakenAt, now),
    );
  return out;
}

export async function machineDetail(
  db: Db,
  user: SessionUser,
  machineId: number,
  now = Date.now(),
): Promise<MachineDetail> {
  const row = await repo.machineWithPlace(db, machineId);
  if (!row) throw notFound('Machine');
  if (!canSeeSite(user, row.site.id))
    throw forbidden('This machine belongs to a site you are not assigned to.');
  const { machine } = row;
  const [components, pointRows] = await Promise.all([
    repo.machineComponents(db, machineId),
    repo.machinePoints(db, machineId),
  ]);
  const ids = pointRows.map((p) => p.id);
  const [latest, statuses, sparks] = await Promise.all([
    repo.latestAnalyses(db, ids),
    statusesOf(db, pointRows, now),
    Promise.all(ids.map((id) => repo.recentBandValues(db, id, SPARK_BAND, SPARK_POINTS))),
  ]);
  let status: NodeStatus = 'none';
  const bearingName = new Map(components.bearings.map((b) => [b.id, b.name]));
  const pointsOut = pointRows.map((p, i) => {
    const s = statuses.get(p.id) ?? 'none';
    status = worst(status, s);
    const l = latest.get(p.id);
    return {
      id: p.id,
      tag: p.tag,
      name: p.name,
      location: p.location,
      direction: p.direction,
      bearing: p.bearingId === null ? null : (bearingName.get(p.bearingId) ?? null),
      status: s,
      latest: l ? summaryOf(l) : null,
      recentVelocity: (sparks[i] ?? [])
        .slice()
        .reverse()
        .map((v) => ({ t: iso(v.takenAt), v: v.value })),
    };
  });
  return {
    id: machine.id,
    name: machine.name,
    type: machine.type,
    nominalRpm: machine.nominalRpm,
    isoGroup: machine.isoGroup,
    foundation: machine.foundation,
    criticality: machine.criticality,
    powerKw: machine.powerKw,
    bladeCount: machine.bladeCount,
    vaneCount: machine.vaneCount,
    lineHz: machine.lineHz,
    notes: machine.notes,
    site: { id: row.site.id, name: row.site.name, code: row.site.code },
    area: { id: row.area.id, name: row.area.name },
    status,
    bearings: components.bearings.map((b) => ({
      id: b.id,
      name: b.name,
      designation: b.designation,
      rollingElements: b.rollingElements,
      ballDiameterMm: b.ballDiameterMm,
      pitchDiameterMm: b.pitchDiameterMm,
      contactAngleDeg: b.contactAngleDeg,
      speedRatio: b.speedRatio,
    })),
    gears: components.gears.map((g) => ({
      id: g.id,
      name: g.name,
      teeth: g.teeth,
      mateTeeth: g.mateTeeth,
      speedRatio: g.speedRatio,
    })),
    faultFrequencies: faultFrequencies(
      componentsOf(machine, components),
      machine.nominalRpm > 0 ? machine.nominalRpm / 60 : null,
    ),
    points: pointsOut,
  };
}

export async function pointDetail(
  ctx: AppContext,
  user: SessionUser,
  pointId: number,
  now = Date.now(),
): Promise<PointDetail> {
  const { point, machine } = await accessiblePoint(ctx.db, user, pointId);
  const place = await repo.machineWithPlace(ctx.db, machine.id);
  const [latest, statuses, limitSet, components, bandStates] = await Promise.all([
    repo.latestAnalyses(ctx.db, [pointId]),
    statusesOf(ctx.db, [point], now),
    loadLimitSet(ctx.db, pointId),
    repo.machineComponents(ctx.db, machine.id),
    repo.bandStatesOf(ctx.db, pointId),
  ]);
  const l = latest.get(pointId);
  return {
    id: point.id,
    tag: point.tag,
    name: point.name,
    location: point.location,
    direction: point.direction,
    sensitivityMvPerG: point.sensitivityMvPerG,
    fmaxHz: point.fmaxHz,
    lines: point.lines,
    bearing: components.bearings.find((b) => b.id === point.bearingId)?.name ?? null,
    status: statuses.get(pointId) ?? 'none',
    machine: {
      id: machine.id,
      name: machine.name,
      type: machine.type,
      nominalRpm: machine.nominalRpm,
      siteName: place?.site.name ?? '',
      areaName: place?.area.name ?? '',
    },
    latest: l ? summaryOf(l) : null,
    bands: (limitSet?.bands ?? []).map((b) => {
      const lv = levelsInForce(b, bandStates.get(b.key));
      return {
        key: b.key,
        name: b.name,
        kind: b.kind,
        spectrum: b.spectrum,
        unit: b.unit,
        alertLevel: lv.alertLevel,
        dangerLevel: lv.dangerLevel,
        levelSource: lv.source,
      };
    }),
  };
}

export async function listAnalyses(
  ctx: AppContext,
  user: SessionUser,
  pointId: number,
  q: { from?: string; to?: string; limit: number },
) {
  await accessiblePoint(ctx.db, user, pointId);
  const rows = await repo.listAnalyses(
    ctx.db,
    pointId,
    q.from ? new Date(q.from) : undefined,
    q.to ? new Date(q.to) : undefined,
    q.limit,
  );
  return { items: rows.map(summaryOf) };
}

/** The analysis, if the user may see its point. */
async function accessibleAnalysis(ctx: AppContext, user: SessionUser, analysisId: number) {
  const a = await repo.analysisRow(ctx.db, analysisId);
  if (!a) throw notFound('Analysis');
  const access = await accessiblePoint(ctx.db, user, a.pointId);
  return { analysis: a, ...access };
}

interface StoredSummary {
  speed?: { rpm: number | null; hz: number | null; source: 'tach' | 'rpm' | 'estimated' | 'none' };
  spectra?: Record<
    string,
    { unit: string; scale: 'rms' | 'peak'; dfHz?: number; dOrder?: number; lines: number } | null
  >;
  peaks?: { hz: number; order: number | null; amplitude: number }[];
  faultFrequencies?: FaultFrequency[];
}

const columnOf = {
  acceleration: 'accelSpectrum',
  velocity: 'velocitySpectrum',
  envelope: 'envelopeSpectrum',
  order: 'orderSpectrum',
} as const;

/** Largest local maxima of a stored spectrum (line values, no interpolation), largest first. */
export function simplePeaks(
  values: Float32Array,
  count = 10,
): { index: number; amplitude: number }[] {
  const found: { index: number; amplitude: number }[] = [];
  for (let i = 2; i < values.length - 1; i++) {
    const v = values[i]!;
    if (v > values[i - 1]! && v >= values[i + 1]!) found.push({ index: i, amplitude: v });
  }
  return found.sort((a, b) => b.amplitude - a.amplitude).slice(0, count);
}

function float32Of(blob: Buffer | null | undefined): Float32Array | null {
  if (!blob) return null;
  const copy = new Uint8Array(blob.byteLength);
  copy.set(blob);
  return new Float32Array(copy.buffer, 0, Math.floor(copy.byteLength / 4));
}

export async function spectrum(
  ctx: AppContext,
  user: SessionUser,
  analysisId: number,
  kind: SpectrumKind,
): Promise<Spectrum> {
  const { analysis } = await accessibleAnalysis(ctx, user, analysisId);
  const summary = analysis.summary as StoredSummary;
  const meta = summary.spectra?.[kind] ?? null;
  const blob = analysis[columnOf[kind]];
  const values = float32Of(blob);
  if (!meta || !values)
    throw new AppError(
      'spectrum_unavailable',
      kind === 'order'
        ? 'This capture has no order spectrum: its running speed was not known.'
        : `This capture has no ${kind} spectrum.`,
      404,
    );
  const axis = kind === 'order' ? 'order' : 'hz';
  const speed = summary.speed ?? { rpm: analysis.speedRpm, hz: null, source: analysis.speedSource };
  const shaftHz = speed.hz ?? (speed.rpm ? speed.rpm / 60 : null);
  const step = axis === 'order' ? (meta.dOrder ?? 0) : (meta.dfHz ?? 0);
  const peaks =
    kind === 'acceleration' && summary.peaks
      ? summary.peaks.map((p) => ({ hz: p.hz, order: p.order, amplitude: p.amplitude }))
      : simplePeaks(values).map((p) => {
          const x = p.index * step;
          return axis === 'order'
            ? { hz: shaftHz ? x * shaftHz : null, order: x, amplitude: p.amplitude }
            : { hz: x, order: shaftHz ? x / shaftHz : null, amplitude: p.amplitude };
        });
  return {
    analysisId: analysis.id,
    takenAt: iso(analysis.takenAt),
    kind,
    unit: meta.unit,
    scale: meta.scale,
    axis,
    dfHz: axis === 'hz' ? step : null,
    dOrder: axis === 'order' ? step : null,
    lines: values.length,
    values: Buffer.from(values.buffer, values.byteOffset, values.byteLength).toString('base64'),
    peaks,
    faultFrequencies: (summary.faultFrequencies ?? []).map((f) => ({
      name: f.name,
      kind: f.kind,
      hz: f.hz,
      order: f.order,
    })),
    speed: { rpm: speed.rpm, hz: shaftHz, source: speed.source },
  };
}

/** The raw counts of an analysis' snapshot, or 410 when retention has dropped them. */
async function rawCounts(ctx: AppContext, user: SessionUser, analysisId: number) {
  const found = await accessibleAnalysis(ctx, user, analysisId);
  const snap = await repo.snapshotRow(ctx.db, found.analysis.snapshotId);
  if (!snap) throw notFound('Snapshot');
  if (!snap.samples)
    throw new AppError(
      'samples_expired',
      `The raw samples of this capture were removed by the retention policy${
        snap.samplesExpiredAt ? ` on ${snap.samplesExpiredAt.toISOString().slice(0, 10)}` : ''
      }; its spectra and trend values are kept.`,
      410,
    );
  const bytes = await storedSampleBytesAsync(snap.samples, snap.samplesCodec);
  const counts = decodeSamples(
    new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength),
    snap.encoding,
  );
  return { ...found, snap, counts };
}

export async function waveform(
  ctx: AppContext,
  user: SessionUser,
  analysisId: number,
): Promise<Waveform> {
  const { analysis, snap, counts } = await rawCounts(ctx, user, analysisId);
  const scale = {
    encoding: snap.encoding,
    bits: snap.adcBits,
    fullScaleV: snap.fullScaleV,
    sensitivityMvPerG: snap.sensitivityMvPerG,
  };
  const g = Float32Array.from(scaleToAcceleration(counts, scale));
  // Integer encodings: codes −2^(bits−1) … 2^(bits−1)−1 (bipolar ADC, Kester MT-001);
  // float32 samples are volts, so the rails are ± full scale.
  const half = 2 ** (snap.adcBits - 1);
  const [lowG, highG] =
    snap.encoding === 'float32'
      ? Array.from(scaleToAcceleration([-snap.fullScaleV, snap.fullScaleV], scale))
      : Array.from(scaleToAcceleration([-half, half - 1], scale));
  const findings = (analysis.qualityFindings ?? []) as Waveform['findings'];
  return {
    analysisId: analysis.id,
    takenAt: iso(analysis.takenAt),
    unit: 'g',
    sampleRateHz: snap.sampleRateHz,
    sampleCount: g.length,
    values: Buffer.from(g.buffer, g.byteOffset, g.byteLength).toString('base64'),
    rails: { lowG: lowG!, highG: highG! },
    clipped: findings.some((f) => f.code === 'clipped'),
    adcBits: snap.adcBits,
    bitsUsed: analysis.bitsUsed,
    verdict: analysis.qualityVerdict,
    findings,
  };
}

/** A file name safe for Content-Disposition: tag and UTC time, no spaces or colons. */
export function fileStem(tag: string, takenAt: Date): string {
  const t = takenAt
    .toISOString()
    .replace(/\.\d+Z$/, 'Z')
    .replace(/[:]/g, '');
  return `${tag.replace(/[^A-Za-z0-9._-]+/g, '_')}_${t}`;
}

/** The raw capture as a WAV file of its own counts (PCM) or volts (float32). */
export async function waveformWav(ctx: AppContext, user: SessionUser, analysisId: number) {
  const { point, snap, counts } = await rawCounts(ctx, user, analysisId);
  return {
    fileName: `${fileStem(point.tag, snap.takenAt)}.wav`,
    bytes: writeWav(counts, Math.round(snap.sampleRateHz), snap.encoding),
  };
}

/** The capture as CSV: time in seconds and acceleration in g, with a header row. */
export async function waveformCsv(ctx: AppContext, user: SessionUser, analysisId: number) {
  const { point, snap, counts } = await rawCounts(ctx, user, analysisId);
  const g = scaleToAcceleration(counts, {
    encoding: snap.encoding,
    bits: snap.adcBits,
    fullScaleV: snap.fullScaleV,
    sensitivityMvPerG: snap.sensitivityMvPerG,
  });
  const lines = ['time_s,acceleration_g'];
  for (let i = 0; i < g.length; i++)
    lines.push(`${(i / snap.sampleRateHz).toPrecision(9)},${g[i]!.toPrecision(7)}`);
  return { fileName: `${fileStem(point.tag, snap.takenAt)}.csv`, text: lines.join('\n') + '\n' };
}

export async function waterfall(
  ctx: AppContext,
  user: SessionUser,
  pointId: number,
  kind: SpectrumKind,
  limit: number,
): Promise<Waterfall> {
  await accessiblePoint(ctx.db, user, pointId);
  const rows = await repo.recentSpectra(ctx.db, pointId, columnOf[kind], limit);
  const axis = kind === 'order' ? 'order' : 'hz';
  let unit = kind === 'velocity' ? 'mm/s' : 'g';
  const items: Waterfall['items'] = [];
  for (const r of rows) {
    const meta = (r.summary as StoredSummary).spectra?.[kind];
    const values = float32Of(r.values);
    if (!meta || !values) continue;
    unit = meta.unit;
    items.push({
      analysisId: r.id,
      takenAt: iso(r.takenAt),
      step: (axis === 'order' ? meta.dOrder : meta.dfHz) ?? 0,
      values: Buffer.from(values.buffer, values.byteOffset, values.byteLength).toString('base64'),
    });
  }
  return { kind, unit, axis, items };
}

// ---------------------------------------------------------------- trend

async function trendBand(ctx: AppContext, pointId: number, bandKey: string) {
  const set = await loadLimitSet(ctx.db, pointId);
  const band = set?.bands.find((b) => b.key === bandKey);
  if (!band)
    throw new AppError('unknown_band', `This point has no band "${bandKey}".`, 404, [
      { path: 'band', message: `no band "${bandKey}" on this point` },
    ]);
  return band;
}

function period(q: { from?: string; to?: string }, now: number) {
  const to = q.to ? new Date(q.to) : new Date(now);
  const from = q.from ? new Date(q.from) : new Date(to.getTime() - DEFAULT_TREND_DAYS * DAY_MS);
  if (!(from.getTime() < to.getTime()))
    throw new AppError('validation_failed', '"from" must be before "to".', 400, [
      { path: 'from', message: 'must be before "to"' },
    ]);
  return { from, to };
}

/**
 * Indices of the values behind alert transitions: the latest value taken at or before each
 * event (rows oldest first), so thinning a long trend never hides why an alert changed.
 */
function valuesAt(rows: readonly { t: unknown }[], events: readonly { at: Date }[]): Set<number> {
  const keep = new Set<number>();
  for (const e of events) {
    const at = e.at.getTime();
    let lo = 0;
    let hi = rows.length - 1;
    let found = -1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      if (Number(rows[mid]!.t) <= at) {
        found = mid;
        lo = mid + 1;
      } else hi = mid - 1;
    }
    if (found >= 0) keep.add(found);
  }
  return keep;
}

export async function trend(
  ctx: AppContext,
  user: SessionUser,
  pointId: number,
  q: { band: string; from?: string; to?: string },
  now = Date.now(),
): Promise<TrendResponse> {
  const { from, to } = period(q, now);
  // All reads at once (the trend budget is 200 ms at p95); nothing is answered before the
  // access check has passed, and its error wins over any other.
  const [access, bandResult, rowsResult, eventsResult, findingsResult, stateResult] =
    await Promise.allSettled([
      accessiblePoint(ctx.db, user, pointId),
      trendBand(ctx, pointId, q.band),
      repo.bandTrend(ctx.db, pointId, q.band, from, to),
      repo.alertEventsOf(ctx.db, pointId, q.band, from, to),
      repo.findingsOf(ctx.db, pointId, q.band, from, to),
      repo.bandStatesOf(ctx.db, pointId),
    ]);
  const settled = <T>(r: PromiseSettledResult<T>): T => {
    if (r.status === 'rejected') throw r.reason;
    return r.value;
  };
  settled(access);
  const band = settled(bandResult);
  const rows = settled(rowsResult);
  const events = settled(eventsResult);
  const findingRows = settled(findingsResult);
  // the levels the worker alerts at (statistical once the baseline is complete), drawn and
  // projected to by the trend page
  const levels = levelsInForce(band, settled(stateResult).get(band.key));
  const thinned = decimateTrend(
    rows.map((r) => ({ t: Number(r.t), v: r.value, row: r })),
    { from: from.getTime(), to: to.getTime(), keep: valuesAt(rows, events) },
  );
  const items = thinned.items.map(({ row: r }) => ({
    t: new Date(Number(r.t)).toISOString(),
    v: r.value,
    q: r.quality,
    analysisId: r.analysisId,
  }));
  const latestAt = rows.length ? Number(rows[rows.length - 1]!.t) : 0;
  const recent = [];
  for (let i = rows.length - 1; i >= 0; i--) {
    const r = rows[i]!;
    const t = Number(r.t);
    if (latestAt - t > PROJECTION_WINDOW_DAYS * DAY_MS) break;
    recent.push({ takenAt: t, value: r.value, quality: r.quality });
  }
  const p = projectTrend(recent, levels, { now: Math.min(now, to.getTime()) });
  return {
    pointId,
    band: { key: band.key, name: band.name, unit: band.unit, spectrum: band.spectrum },
    levels: { alert: levels.alertLevel, danger: levels.dangerLevel, source: levels.source },
    baseline: levels.baseline
      ? { mean: levels.baseline.mean, sigma: levels.baseline.sigma, count: levels.baseline.count }
      : null,
    items,
    decimation: thinned.decimation,
    projection: {
      outcome: p.outcome,
      model: p.fit?.model ?? null,
      r2: p.fit?.r2 ?? null,
      target: p.target ? { level: p.target.level, value: p.target.value } : null,
      crossingAt: p.crossingAt === null ? null : new Date(p.crossingAt).toISOString(),
      overdue: p.overdue,
      window: p.window && {
        from: new Date(p.window.fromAt).toISOString(),
        to: new Date(p.window.toAt).toISOString(),
        points: p.window.points,
        changed: p.window.changed,
      },
    },
    events: events.map((e) => ({ t: iso(e.at), kind: e.kind, level: e.level, alertId: e.alertId })),
    findings: findingRows.map((f) => ({
      t: iso(f.createdAt),
      title: f.title,
      workOrderRef: f.workOrderRef,
    })),
  };
}

export async function trendCsv(
  ctx: AppContext,
  user: SessionUser,
  pointId: number,
  q: { band: string; from?: string; to?: string },
  now = Date.now(),
) {
  const { point } = await accessiblePoint(ctx.db, user, pointId);
  const band = await trendBand(ctx, pointId, q.band);
  const { from, to } = period(q, now);
  const rows = await repo.bandTrend(ctx.db, pointId, band.key, from, to);
  const unit = band.unit === 'um' ? 'um' : band.unit.replace('/', '_per_');
  // an overall value's band, per row (it follows each capture's speed and sample rate)
  const own =
    band.kind === 'overall' && band.fromHz !== undefined && band.toHz !== undefined
      ? ([band.fromHz, band.toHz] as [number, number])
      : null;
  const bands =
    band.kind === 'overall' && own === null && band.spectrum !== 'envelope'
      ? await repo.analysisBandsOf(
          ctx.db,
          rows.map((r) => r.analysisId),
        )
      : null;
  const bandOf = (analysisId: number) => {
    if (own !== null) return own;
    const b = bands?.get(analysisId);
    if (b === undefined) return null;
    return bandHzOf(band.spectrum === 'acceleration' ? b.accelBandHz : b.isoBandHz);
  };
  const overall = band.kind === 'overall';
  const lines = [
    `taken_at_utc,${band.key}_${unit},quality${overall ? ',band_from_hz,band_to_hz' : ''}`,
  ];
  for (const r of rows) {
    const hz = overall ? bandOf(r.analysisId) : null;
    const tail = overall ? `,${hz?.[0] ?? ''},${hz?.[1] ?? ''}` : '';
    lines.push(`${new Date(Number(r.t)).toISOString()},${r.value},${r.quality}${tail}`);
  }
  const safeTag = point.tag.replace(/[^A-Za-z0-9._-]+/g, '_');
  return {
    fileName: `${safeTag}_${band.key}_${iso(from).slice(0, 10)}_${iso(to).slice(0, 10)}.csv`,
    text: lines.join('\n') + '\n',
  };
}
