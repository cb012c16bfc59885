import type {
  Fleet,
  FleetArea,
  FleetMachine,
  FleetPoint,
  FleetSite,
  NodeStatus,
} from '@turnstone/contracts/fleet';
import { statusOrder, worstStatus } from '../../../lib/node-status.ts';

interface RowBase {
  /** Unique within the tree: `site:1`, `area:4`, `machine:17`, `point:230`. */
  key: string;
  parentKey: string | null;
  /** 1-based depth, as aria-level wants it. */
  level: number;
  /** Position among visible siblings, 1-based, and their count (aria-posinset/setsize). */
  posInSet: number;
  setSize: number;
  status: NodeStatus;
}
export interface SiteRow extends RowBase {
  kind: 'site';
  site: FleetSite;
  machineCount: number;
  expanded: boolean;
}
export interface AreaRow extends RowBase {
  kind: 'area';
  area: FleetArea;
  machineCount: number;
  expanded: boolean;
}
export interface MachineRow extends RowBase {
  kind: 'machine';
  machine: FleetMachine;
  /** Newest `lastTakenAt` of its points, or null when none has data. */
  lastTakenAt: string | null;
  expanded: boolean;
}
export interface PointRow extends RowBase {
  kind: 'point';
  point: FleetPoint;
}
export type FleetRow = SiteRow | AreaRow | MachineRow | PointRow;

export interface FleetFilter {
  /** Case-insensitive text matched against machine names, point names and point tags. */
  query: string;
  status: NodeStatus | null;
}

export type StatusCounts = Record<NodeStatus, number>;

export interface FleetSummary {
  machines: StatusCounts;
  machineTotal: number;
  pointTotal: number;
}

function emptyCounts(): StatusCounts {
  return Object.fromEntries(statusOrder.map((s) => [s, 0])) as StatusCounts;
}

/** Machine counts per status (the machine's own worst status) and totals. */
export function summariseFleet(fleet: Fleet): FleetSummary {
  const machines = emptyCounts();
  let machineTotal = 0;
  let pointTotal = 0;
  for (const site of fleet.items)
    for (const area of site.areas)
      for (const machine of area.machines) {
        machines[machine.status] += 1;
        machineTotal += 1;
        pointTotal += machine.points.length;
      }
  return { machines, machineTotal, pointTotal };
}

function newest(points: FleetPoint[]): string | null {
  let best: string | null = null;
  let bestMs = -Infinity;
  for (const p of points) {
    if (!p.lastTakenAt) continue;
    const ms = Date.parse(p.lastTakenAt);
    if (ms > bestMs) {
      bestMs = ms;
      best = p.lastTakenAt;
    }
  }
  return best;
}

const includes = (text: string, needle: string) => text.toLowerCase().includes(needle);

/**
 * The points of `machine` that pass the filter, or null when the machine does not pass.
 * Text: a machine passes by its own name (then all its points stay) or through matching
 * points. Status: a machine passes by its own worst status, the same figure the counts show;
 * of its points, those with that status are shown (all of them when none has it).
 */
function filterMachine(machine: FleetMachine, needle: string, status: NodeStatus | null) {
  if (status && machine.status !== status) return null;
  let points = machine.points;
  if (needle && !includes(machine.name, needle)) {
    points = points.filter((p) => includes(p.name, needle) || includes(p.tag, needle));
    if (points.length === 0) return null;
  }
  if (status) {
    const matching = points.filter((p) => p.status === status);
    if (matching.length > 0) points = matching;
  }
  return points;
}

/**
 * Flattens the fleet into the visible rows of the tree, applying the filter and the
 * collapsed nodes. Site and area status is the worst of all their machines (unfiltered),
 * so a filter never hides how bad a site really is.
 */
export function buildFleetRows(
  fleet: Fleet,
  filter: FleetFilter,
  collapsed: ReadonlySet<string>,
): { rows: FleetRow[]; machineMatches: number } {
  const needle = filter.query.trim().toLowerCase();
  const rows: FleetRow[] = [];
  let machineMatches = 0;

  const sites = fleet.items
    .map((site) => {
      const areas = site.areas
        .map((area) => {
          const machines = area.machines
            .map((machine) => ({ machine, points: filterMachine(machine, needle, filter.status) }))
            .filter((m): m is { machine: FleetMachine; points: FleetPoint[] } => m.points !== null);
          return { area, machines };
        })
        .filter((a) => a.machines.length > 0 || (!needle && !filter.status));
      return { site, areas };
    })
    .filter((s) => s.areas.length > 0 || (!needle && !filter.status));

  sites.forEach(({ site, areas }, siteIndex) => {
    const siteKey = `site:${site.id}`;
    const siteMachines = site.areas.flatMap((a) => a.machines);
    const siteExpanded = !collapsed.has(siteKey);
    rows.push({
      kind: 'site',
      key: siteKey,
      parentKey: null,
      level: 1,
      posInSet: siteIndex + 1,
      setSize: sites.length,
      status: worstStatus(siteMachines.map((m) => m.status)),
      site,
      machineCount: siteMachines.length,
      expanded: siteExpanded,
    });
    areas.forEach(({ area, machines }, areaIndex) => {
      machineMatches += machines.length;
      if (!siteExpanded) return;
      const areaKey = `area:${area.id}`;
      const areaExpanded = !collapsed.has(areaKey);
      rows.push({
        kind: 'area',
        key: areaKey,
        parentKey: siteKey,
        level: 2,
        posInSet: areaIndex + 1,
        setSize: areas.length,
        status: worstStatus(area.machines.map((m) => m.status)),
        area,
        machineCount: area.machines.length,
        expanded: areaExpanded,
      });
      if (!areaExpanded) return;
      machines.forEach(({ machine, points }, machineIndex) => {
        const machineKey = `machine:${machine.id}`;
        const machineExpanded = !collapsed.has(machineKey);
        rows.push({
          kind: 'machine',
          key: machineKey,
          parentKey: areaKey,
          level: 3,
          posInSet: machineIndex + 1,
          setSize: machines.length,
          status: machine.status,
          machine,
          lastTakenAt: newest(machine.points),
          expanded: machineExpanded,
        });
        if (!machineExpanded) return;
        points.forEach((point, pointIndex) => {
          rows.push({
            kind: 'point',
            key: `point:${point.id}`,
            parentKey: machineKey,
            level: 4,
            posInSet: pointIndex + 1,
            setSize: points.length,
            status: point.status,
            point,
          });
        });
      });
    });
  });

  return { rows, machineMatches };
}

/** Keys of every machine, for "collapse to machines". */
export function allMachineKeys(fleet: Fleet): string[] {
  return fleet.items.flatMap((s) =>
    s.areas.flatMap((a) => a.machines.map((m) => `machine:${m.id}`)),
  );
}
