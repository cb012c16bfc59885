/**
 * The Machine and Point analysis views: machine data with fault frequencies, point detail,
 * the analyses list, stored spectra (one compact BLOB, sent as base64 float32), the time waveform from
 * the raw snapshot, the waterfall, the band trend with levels and projection, and downloads.
 * Services take the signed-in user and check per-site access; they never see req/res.
 */
import { faultFrequencies } from '@turnstone/dsp';

import { isoZoneBoundaries, levelsInForce, type BandDefinition } from '@turnstone/condition';
import type {
  AnalysisSummary,
  CurrentDiagnosis,
  Diagnosis,
  ShaftVectorItem,
  QualityFinding,
  MachineDetail,
  PointBand,
  PointDetail,
} from '@turnstone/contracts/points';

import type { NodeStatus } from '@turnstone/contracts/fleet';
import type { SnapshotStatus } from '@turnstone/contracts/uploads';
import type { Db } from '@turnstone/db/client';
import { forbidden, notFound } from '../../lib/app-error.ts';
import type { AppContext } from '../../lib/context.ts';
import { accessiblePoint } from '../places/point-access.ts';
import { canSeeSite, type SessionUser } from '../../lib/session-user.ts';
import { loadLimitSet } from '../limits/limit-set-repository.ts';
import { pointStatus, QUALITY_MARK_MS, worst } from '../fleet/fleet-service.ts';
import * as repo from './points-repository.ts';
import { pinsOf } from './pins-repository.ts';
import { openAlertBands } from './governing-bands-repository.ts';
import { readStoredSummary } from './stored-summary.ts';
import { machineComponentsOf } from './machine-components.ts';

/** Projection fits the values of this many days before the latest (recent behaviour, not last year's). Common practice, no source. */
export const PROJECTION_WINDOW_DAYS = 60;
/** Overall velocity band key that the machine page's small trends follow. */
export const SPARK_BAND = 'overall-velocity';
export const SPARK_POINTS = 50;

const iso = (d: Date) => d.toISOString();

/** Where a band sits in the spectrum, as the point detail states it (see `pointBandSchema.range`). */
function bandRange(b: BandDefinition): PointBand['range'] {
  switch (b.kind) {
    case 'overall':
      return { kind: 'overall', fromHz: b.fromHz ?? null, toHz: b.toHz ?? null };
    case 'hz':
      return { kind: 'hz', fromHz: b.fromHz, toHz: b.toHz };
    case 'order':
      return { kind: 'order', fromOrder: b.fromOrder, toOrder: b.toOrder };
    case 'fault':
      return {
        kind: 'fault',
        fault: b.fault,
        halfWidth: b.halfWidth,
        halfWidthUnit: b.halfWidthUnit,
        harmonics: b.harmonics ?? 1,
      };
  }
}

function summaryOf(r: repo.AnalysisSummaryRow): AnalysisSummary {
  const stored = readStoredSummary(r.summary);
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
      accelBandHz: stored.accelBandHz ?? null,
      velocityBandHz: stored.isoBandHz ?? null,
    },
    diagnosis: (r.diagnosis as Diagnosis | null) ?? null,
    shaftVectors: (r.shaftVectors as ShaftVectorItem[] | null) ?? null,
    spectraThinned: r.spectraThinnedAt !== null,
    findings: (r.qualityFindings as QualityFinding[] | null) ?? [],
  };
}

/** The hints of the point's newest capture, for the alert detail and the alert mail. */
export async function currentDiagnosis(db: Db, pointId: number): Promise<CurrentDiagnosis | null> {
  const row = await repo.latestDiagnosis(db, pointId);
  return row
    ? { analysisId: row.id, takenAt: iso(row.takenAt), diagnosis: row.diagnosis as Diagnosis }
    : null;
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

/** The machine with its place, when the user may see its site (404 / 403 otherwise). */
export async function accessibleMachine(db: Db, user: SessionUser, machineId: number) {
  const row = await repo.machineWithPlace(db, machineId);
  if (!row) throw notFound('Machine');
  if (!canSeeSite(user, row.site.id))
    throw forbidden('This machine belongs to a site you are not assigned to.');
  return row;
}

function governingOf(
  band: { bandKey: string; bandName: string; unit: string; level: 'alert' | 'danger' } | undefined,
  values: { t: string; v: number }[],
) {
  return band
    ? { key: band.bandKey, name: band.bandName, unit: band.unit, level: band.level, values }
    : { key: SPARK_BAND, name: 'Overall velocity', unit: 'mm/s', level: null, values };
}

/** The ISO 20816-3 zone boundaries of a machine's class (packages/condition); null if none. */
function isoBoundariesOf(group: number, foundation: 'rigid' | 'flexible') {
  if (group !== 1 && group !== 2) return null;
  const b = isoZoneBoundaries(group, foundation);
  return { ab: b.ab, bc: b.bc, cd: b.cd };
}

export async function machineDetail(
  db: Db,
  user: SessionUser,
  machineId: number,
  now = Date.now(),
): Promise<MachineDetail> {
  const row = await accessibleMachine(db, user, machineId);
  const { machine } = row;
  const [components, pointRows] = await Promise.all([
    repo.machineComponents(db, machineId),
    repo.machinePoints(db, machineId),
  ]);
  const ids = pointRows.map((p) => p.id);
  const [latest, statuses, sparks, alertBands] = await Promise.all([
    repo.latestAnalyses(db, ids),
    statusesOf(db, pointRows, now),
    Promise.all(ids.map((id) => repo.recentBandValues(db, id, SPARK_BAND, SPARK_POINTS))),
    openAlertBands(db, ids),
  ]);
  // The governing band's recent values where it is not overall velocity (already read).
  const governingValues = await Promise.all(
    ids.map((id, i) => {
      const band = alertBands.get(id);
      return band && band.bandKey !== SPARK_BAND
        ? repo.recentBandValues(db, id, band.bandKey, SPARK_POINTS)
        : Promise.resolve(sparks[i] ?? []);
    }),
  );
  const oldestFirst = (rows: { takenAt: Date; value: number }[]) =>
    rows
      .slice()
      .reverse()
      .map((v) => ({ t: iso(v.takenAt), v: v.value }));
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
      recentVelocity: oldestFirst(sparks[i] ?? []),
      governing: governingOf(alertBands.get(p.id), oldestFirst(governingValues[i] ?? [])),
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
    isoBoundaries: isoBoundariesOf(machine.isoGroup, machine.foundation),
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
      machineComponentsOf(machine, components),
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
        range: bandRange(b),
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
  const pins = await pinsOf(
    ctx.db,
    rows.map((r) => r.id),
  );
  return {
    items: rows.map((r) => {
      const pin = pins.get(r.id);
      return { ...summaryOf(r), pinned: pin ? { ...pin, at: iso(pin.at) } : null };
    }),
  };
}

/** The analysis, if the user may see its point. */
export async function accessibleAnalysis(ctx: AppContext, user: SessionUser, analysisId: number) {
  const a = await repo.analysisRow(ctx.db, analysisId);
  if (!a) throw notFound('Analysis');
  const access = await accessiblePoint(ctx.db, user, a.pointId);
  return { analysis: a, ...access };
}

/** A snapshot's status and, once analysed, its analysis (the upload screen polls this). */
export async function snapshotStatus(
  ctx: AppContext,
  user: SessionUser,
  snapshotId: number,
): Promise<SnapshotStatus> {
  const s = await repo.snapshotStatusRow(ctx.db, snapshotId);
  if (!s) throw notFound('Snapshot');
  await accessiblePoint(ctx.db, user, s.pointId);
  const a = await repo.analysisOfSnapshot(ctx.db, snapshotId);
  const summary = a ? summaryOf(a) : null;
  return {
    ...s,
    takenAt: iso(s.takenAt),
    receivedAt: iso(s.receivedAt),
    analysis: summary ? { ...summary, findings: summary.findings ?? [] } : null,
  };
}
