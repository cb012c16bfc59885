import type { Fleet, FleetMachine, NodeStatus } from '@turnstone/contracts/fleet';
import { describe, expect, it } from 'vitest';
import { buildFleetRows, summariseFleet } from './build-fleet-rows.ts';

// Hand-made fixture; expectations follow from the filter rules documented in the module.
function machine(
  id: number,
  name: string,
  status: NodeStatus,
  points: [string, NodeStatus][],
): FleetMachine {
  return {
    id,
    name,
    type: 'pump',
    nominalRpm: 1480,
    status,
    points: points.map(([tag, s], i) => ({
      id: id * 10 + i,
      tag,
      name: `Point ${tag}`,
      direction: 'H',
      status: s,
      lastTakenAt: s === 'none' ? null : `2026-01-01T00:0${i}:00Z`,
    })),
  };
}

const fleet: Fleet = {
  items: [
    {
      id: 1,
      name: 'North',
      code: 'N',
      timeZone: 'UTC',
      areas: [
        {
          id: 11,
          name: 'Intake',
          machines: [
            machine(101, 'Intake pump', 'danger', [
              ['P101-H', 'ok'],
              ['P101-V', 'alert'],
              ['P101-A', 'danger'],
            ]),
            machine(102, 'Spare pump', 'ok', [['P102-H', 'ok']]),
          ],
        },
        { id: 12, name: 'Empty area', machines: [] },
      ],
    },
    {
      id: 2,
      name: 'South',
      code: 'S',
      timeZone: 'UTC',
      areas: [
        {
          id: 21,
          name: 'Fans',
          machines: [machine(201, 'Exhaust fan', 'alert', [['F201-H', 'alert']])],
        },
      ],
    },
  ],
};

const keys = (rows: { key: string }[]) => rows.map((r) => r.key);
const noFilter = { query: '', status: null };

describe('buildFleetRows', () => {
  it('without a filter lists every node in tree order, with site status the worst of its machines', () => {
    const { rows, machineMatches } = buildFleetRows(fleet, noFilter, new Set());
    expect(keys(rows)).toEqual([
      'site:1',
      'area:11',
      'machine:101',
      'point:1010',
      'point:1011',
      'point:1012',
      'machine:102',
      'point:1020',
      'area:12',
      'site:2',
      'area:21',
      'machine:201',
      'point:2010',
    ]);
    expect(rows[0]?.status).toBe('danger');
    expect(rows.find((r) => r.key === 'area:12')?.status).toBe('none');
    expect(machineMatches).toBe(3);
  });

  it('when the text matches only a point tag, keeps that machine with just the matching point', () => {
    const { rows } = buildFleetRows(fleet, { query: 'p101-v', status: null }, new Set());
    expect(keys(rows)).toEqual(['site:1', 'area:11', 'machine:101', 'point:1011']);
  });

  it('when the text matches a machine name, keeps all of its points', () => {
    const { rows } = buildFleetRows(fleet, { query: 'SPARE', status: null }, new Set());
    expect(keys(rows)).toEqual(['site:1', 'area:11', 'machine:102', 'point:1020']);
  });

  it('filters by the machine status the counts show, and narrows points to that status', () => {
    const { rows, machineMatches } = buildFleetRows(
      fleet,
      { query: '', status: 'alert' },
      new Set(),
    );
    // Intake pump has an alert point but is itself in danger, so it is not an "alert" machine.
    expect(keys(rows)).toEqual(['site:2', 'area:21', 'machine:201', 'point:2010']);
    expect(machineMatches).toBe(summariseFleet(fleet).machines.alert);
  });

  it('hides the children of collapsed nodes but still counts their matching machines', () => {
    const { rows, machineMatches } = buildFleetRows(
      fleet,
      noFilter,
      new Set(['site:1', 'machine:201']),
    );
    expect(keys(rows)).toEqual(['site:1', 'site:2', 'area:21', 'machine:201']);
    expect(rows[0]).toMatchObject({ kind: 'site', expanded: false });
    expect(machineMatches).toBe(3);
  });

  it('gives each row its tree position for assistive technology', () => {
    const { rows } = buildFleetRows(fleet, noFilter, new Set());
    const point = rows.find((r) => r.key === 'point:1011');
    expect(point).toMatchObject({ level: 4, posInSet: 2, setSize: 3, parentKey: 'machine:101' });
  });

  it('uses the newest point snapshot as the machine age', () => {
    const { rows } = buildFleetRows(fleet, noFilter, new Set());
    expect(rows.find((r) => r.key === 'machine:101')).toMatchObject({
      lastTakenAt: '2026-01-01T00:02:00Z',
    });
  });
});

describe('summariseFleet', () => {
  it('counts machines by their own status and totals points', () => {
    const summary = summariseFleet(fleet);
    expect(summary).toMatchObject({ machineTotal: 3, pointTotal: 5 });
    expect(summary.machines).toEqual({ danger: 1, alert: 1, quality: 0, stale: 0, ok: 1, none: 0 });
  });
});
