import { describe, it, expect } from 'vitest';
import { replayLimitSet, type ReplayEntry } from './replay.ts';
import { evaluateSnapshot, type PointState } from './snapshot-evaluation.ts';
import { overallAcceleration, overallVelocity } from './test-bands.ts';

const T0 = Date.UTC(2025, 3, 1);
const DAY = 86_400_000;

// Levels 4 / 8 mm/s and 1 / 2 g, common practice, no source.
const velocity = overallVelocity(4, 8);
const acceleration = overallAcceleration(1, 2);

// Day: velocity, acceleration, quality
const rows: [number, number, ReplayEntry['quality']][] = [
  [2, 0.5, 'ok'], // 0
  [5, 0.5, 'ok'], // 1 velocity alert raised
  [6, 0.6, 'ok'], // 2
  [9, 0.6, 'ok'], // 3 velocity escalated to danger
  [30, 30, 'unusable'], // 4 quality notice only
  [2, 0.5, 'ok'], // 5 velocity cleared
  [9, 1.5, 'ok'], // 6 new velocity alert straight at danger; acceleration alert raised
  [1, 0.4, 'ok'], // 7 both clear
];
const history: ReplayEntry[] = rows.map(([v, a, quality], day) => ({
  takenAt: T0 + day * DAY,
  quality,
  values: { 'overall-velocity': v, 'overall-acceleration': a },
}));

describe('replayLimitSet', () => {
  it('when replayed, it counts the alerts per band and level, with their times', () => {
    const report = replayLimitSet([velocity, acceleration], history);
    const v = report.bands.find((b) => b.bandKey === 'overall-velocity');
    expect(v?.byLevel).toEqual({ alert: 1, danger: 2 });
    expect(v?.occurrences).toEqual([
      { level: 'alert', at: T0 + DAY, value: 5, how: 'raised' },
      { level: 'danger', at: T0 + 3 * DAY, value: 9, how: 'escalated' },
      { level: 'danger', at: T0 + 6 * DAY, value: 9, how: 'raised' },
    ]);
    expect(v?.alerts).toEqual([
      {
        sequence: 1,
        raisedLevel: 'alert',
        raisedAt: T0 + DAY,
        raisedValue: 5,
        escalatedAt: T0 + 3 * DAY,
        clearedAt: T0 + 5 * DAY,
        peakValue: 9,
        peakAt: T0 + 3 * DAY,
        suspect: false,
      },
      {
        sequence: 2,
        raisedLevel: 'danger',
        raisedAt: T0 + 6 * DAY,
        raisedValue: 9,
        escalatedAt: null,
        clearedAt: T0 + 7 * DAY,
        peakValue: 9,
        peakAt: T0 + 6 * DAY,
        suspect: false,
      },
    ]);
    const a = report.bands.find((b) => b.bandKey === 'overall-acceleration');
    expect(a?.byLevel).toEqual({ alert: 1, danger: 0 });
    expect(report.totals).toEqual({ alerts: 3, reachedDanger: 2 });
  });

  it('when the history holds an unusable snapshot, it reports one quality notice and raises nothing from it', () => {
    const report = replayLimitSet([velocity, acceleration], history);
    expect(report.qualityNotices).toEqual([T0 + 4 * DAY]);
    expect(report.bands.find((b) => b.bandKey === 'overall-acceleration')?.evaluated).toBe(7);
  });

  it('when a stricter limit set is proposed, the replay shows more alerts', () => {
    const stricter = { ...velocity, alertLevel: 1.5, dangerLevel: 20 };
    const report = replayLimitSet([stricter], history);
    // raised day 0 (2 ≥ 1.5); 2 is not below 0.9·1.5 = 1.35 on day 5, so it stays; clears day 7 (1 < 1.35)
    expect(report.bands[0]?.occurrences.map((o) => [o.level, (o.at - T0) / DAY])).toEqual([
      ['alert', 0],
    ]);
    expect(report.bands[0]?.alerts[0]?.clearedAt).toBe(T0 + 7 * DAY);
  });

  it('when persistence is raised to 2, single exceedances no longer raise', () => {
    const report = replayLimitSet([{ ...acceleration, persistence: 2 }], history);
    expect(report.totals.alerts).toBe(0);
  });

  it('when the history is given out of order, the replay is the same as in time order', () => {
    const shuffled = [
      history[5]!,
      history[0]!,
      history[7]!,
      history[2]!,
      history[1]!,
      history[6]!,
      history[3]!,
      history[4]!,
    ];
    expect(replayLimitSet([velocity], shuffled)).toEqual(replayLimitSet([velocity], history));
  });

  it('when the worker evaluates the same history snapshot by snapshot, it ends in the same state (one set of rules)', () => {
    let state: PointState = {};
    for (const entry of history)
      state = evaluateSnapshot([velocity, acceleration], state, entry).state;
    expect(replayLimitSet([velocity, acceleration], history).finalState).toEqual(state);
  });

  it('when the history is empty, every band reports no alerts', () => {
    const report = replayLimitSet([velocity], []);
    expect(report.bands).toEqual([
      {
        bandKey: 'overall-velocity',
        bandName: 'Overall velocity',
        alerts: [],
        occurrences: [],
        byLevel: { alert: 0, danger: 0 },
        evaluated: 0,
      },
    ]);
    expect(report.totals).toEqual({ alerts: 0, reachedDanger: 0 });
  });
});
