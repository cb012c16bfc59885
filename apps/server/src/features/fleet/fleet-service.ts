import type { Db } from '@turnstone/db/client';
import type { Fleet, FleetMachine, FleetSite, NodeStatus } from '@turnstone/contracts/fleet';
import type { SessionUser } from '../../lib/session-user.ts';
import * as repo from './fleet-repository.ts';

/** A point with no capture for this long shows "no recent data". */
export const STALE_AFTER_MS = 24 * 3600 * 1000;
/** Unreviewed quality notices older than this no longer mark the tree. */
export const QUALITY_MARK_MS = 7 * 24 * 3600 * 1000;

/** Worst first: a node shows the worst status among its children. */
export const STATUS_RANK: Record<NodeStatus, number> = {
  danger: 5,
  alert: 4,
  quality: 3,
  stale: 2,
  ok: 1,
  none: 0,
};
export const worst = (a: NodeStatus, b: NodeStatus): NodeStatus =>
  STATUS_RANK[b] > STATUS_RANK[a] ? b : a;

export function pointStatus(
  alertLevel: 'alert' | 'danger' | undefined,
  qualityOpen: boolean,
  lastVerdict: string | null,
  lastTakenAt: Date | null,
  now: number,
): NodeStatus {
  if (alertLevel) return alertLevel;
  if (!lastTakenAt) return 'none';
  // "Data quality" clears once the notices are reviewed or the captures recover (the newest
  // capture passes its checks again). Every capture that fails a check writes a new notice,
  // so a later bad capture marks the point again.
  if (qualityOpen && lastVerdict !== 'ok') return 'quality';
  if (now - lastTakenAt.getTime() > STALE_AFTER_MS) return 'stale';
  return 'ok';
}

export async function listSites(db: Db, user: SessionUser) {
  const rows = await repo.listSites(db, user.siteIds);
  return {
    items: rows.map((s) => ({ id: s.id, name: s.name, code: s.code, timeZone: s.timeZone })),
  };
}

export async function fleetTree(db: Db, user: SessionUser, now = Date.now()): Promise<Fleet> {
  const [siteRows, rows, alertLevels, qualityPoints] = await Promise.all([
    repo.listSites(db, user.siteIds),
    repo.treeRows(db, user.siteIds),
    repo.openAlertLevels(db),
    repo.openQualityPoints(db, new Date(now - QUALITY_MARK_MS)),
  ]);
  const bySite = new Map<number, FleetSite>();
  for (const s of siteRows)
    bySite.set(s.id, { id: s.id, name: s.name, code: s.code, timeZone: s.timeZone, areas: [] });
  const areaIndex = new Map<number, FleetSite['areas'][number]>();
  const machineIndex = new Map<number, FleetMachine>();
  for (const r of rows) {
    const site = bySite.get(r.siteId);
    if (!site) continue;
    let area = areaIndex.get(r.areaId);
    if (!area) {
      area = { id: r.areaId, name: r.areaName, machines: [] };
      areaIndex.set(r.areaId, area);
      site.areas.push(area);
    }
    let machine = machineIndex.get(r.machineId);
    if (!machine) {
      machine = {
        id: r.machineId,
        name: r.machineName,
        type: r.machineType,
        nominalRpm: r.nominalRpm,
        status: 'none',
        points: [],
      };
      machineIndex.set(r.machineId, machine);
      area.machines.push(machine);
    }
    if (r.pointId === null || r.pointTag === null || r.pointName === null || r.direction === null)
      continue;
    const status = pointStatus(
      alertLevels.get(r.pointId),
      qualityPoints.has(r.pointId),
      r.lastVerdict,
      r.lastTakenAt,
      now,
    );
    machine.status = worst(machine.status, status);
    machine.points.push({
      id: r.pointId,
      tag: r.pointTag,
      name: r.pointName,
      direction: r.direction,
      status,
      lastTakenAt: r.lastTakenAt ? r.lastTakenAt.toISOString() : null,
    });
  }
  return { items: [...bySite.values()] };
}
