import { describe, it, expect } from 'vitest';
import { reduceAlert, type AlertEvent, type AlertState } from './alert-machine.ts';
import type { BandEvent } from './band-evaluation.ts';

const T0 = Date.UTC(2025, 2, 1);
const HOUR = 3_600_000;
const at = (h: number) => T0 + h * HOUR;

// Band events as evaluateBand would emit them; levels 4 / 8 mm/s, common practice, no source.
const alertAt = (h: number, value: number, suspect = false): BandEvent => ({
  kind: 'exceedance',
  level: 'alert',
  value,
  limit: 4,
  takenAt: at(h),
  run: 1,
  suspect,
});
const dangerAt = (h: number, value: number, suspect = false): BandEvent => ({
  kind: 'exceedance',
  level: 'danger',
  value,
  limit: 8,
  takenAt: at(h),
  run: 1,
  suspect,
});
const seen = (h: number, value: number): BandEvent => ({
  kind: 'observation',
  value,
  takenAt: at(h),
  suspect: false,
});
const inside = (h: number, value: number): BandEvent => ({
  kind: 'inside-limits',
  value,
  limit: 3.6,
  takenAt: at(h),
  suspect: false,
});
const ack = (h: number, by = 'op.jansen', note = 'checked on site'): AlertEvent => ({
  kind: 'acknowledge',
  by,
  note,
  at: at(h),
});

function run(events: AlertEvent[], start: AlertState | null = null) {
  let state = start;
  const changes = [];
  for (const event of events) {
    const t = reduceAlert(state, event);
    state = t.state;
    changes.push(...t.changes);
  }
  return { state, changes, kinds: changes.map((c) => c.kind) };
}

describe('reduceAlert — raising', () => {
  it('when an exceedance arrives with no alert, a new raised alert is created with first = last = peak', () => {
    const { state, kinds } = run([alertAt(0, 5)]);
    expect(kinds).toEqual(['raised']);
    expect(state).toMatchObject({
      sequence: 1,
      level: 'alert',
      state: 'raised',
      limit: 4,
      raisedAt: at(0),
      firstValue: 5,
      firstAt: at(0),
      lastValue: 5,
      lastAt: at(0),
      peakValue: 5,
      peakAt: at(0),
      acknowledgement: null,
      clearedAt: null,
    });
  });

  it('when observations follow, last follows every value and peak keeps the highest and its time', () => {
    const { state, kinds } = run([alertAt(0, 5), seen(1, 6.5), seen(2, 6), seen(3, 6.5)]);
    expect(kinds).toEqual(['raised', 'updated', 'updated', 'updated']);
    expect(state).toMatchObject({ lastValue: 6.5, lastAt: at(3), peakValue: 6.5, peakAt: at(1) });
  });

  it('when a suspect exceedance raises, the alert is marked suspect', () => {
    expect(run([alertAt(0, 5, true)]).state?.suspect).toBe(true);
  });

  it('when an observation arrives with no open alert, nothing changes', () => {
    expect(run([seen(0, 5)])).toMatchObject({ state: null, kinds: [] });
  });
});

describe('reduceAlert — escalation', () => {
  it('when a raised alert gets a danger exceedance, it escalates to danger and stays raised', () => {
    const { state, changes } = run([alertAt(0, 5), dangerAt(1, 9)]);
    expect(changes[1]).toMatchObject({ kind: 'escalated', resetAcknowledgement: null });
    expect(state).toMatchObject({
      sequence: 1,
      level: 'danger',
      state: 'raised',
      limit: 8,
      escalatedAt: at(1),
      firstValue: 5,
      peakValue: 9,
    });
  });

  it('when an acknowledged alert escalates to danger, the acknowledgement is withdrawn and it is raised again', () => {
    const { state, changes } = run([alertAt(0, 5), ack(1), dangerAt(2, 9)]);
    expect(changes.map((c) => c.kind)).toEqual(['raised', 'acknowledged', 'escalated']);
    expect(changes[2]).toMatchObject({
      resetAcknowledgement: { by: 'op.jansen', note: 'checked on site', at: at(1) },
    });
    expect(state).toMatchObject({ state: 'raised', level: 'danger', acknowledgement: null });
  });

  it('when the escalated danger is acknowledged, the new acknowledgement is recorded', () => {
    const { state } = run([
      alertAt(0, 5),
      ack(1),
      dangerAt(2, 9),
      ack(3, 'eng.okafor', 'stop planned'),
    ]);
    expect(state).toMatchObject({
      state: 'acknowledged',
      level: 'danger',
      acknowledgement: { by: 'eng.okafor', note: 'stop planned', at: at(3) },
    });
  });

  it('when a danger alert gets another danger exceedance, it only updates values', () => {
    const { kinds, state } = run([dangerAt(0, 9), dangerAt(1, 10)]);
    expect(kinds).toEqual(['raised', 'updated']);
    expect(state).toMatchObject({ level: 'danger', escalatedAt: null, peakValue: 10 });
  });
});

describe('reduceAlert — acknowledgement', () => {
  it('when a raised alert is acknowledged, who, note and time are recorded', () => {
    const { state, changes } = run([alertAt(0, 5), ack(2)]);
    expect(changes[1]).toMatchObject({
      kind: 'acknowledged',
      acknowledgement: { by: 'op.jansen', note: 'checked on site', at: at(2) },
    });
    expect(state?.state).toBe('acknowledged');
  });

  it('when an acknowledged alert is acknowledged again, it is ignored as already acknowledged', () => {
    const { state, changes } = run([alertAt(0, 5), ack(1), ack(2, 'someone.else', 'again')]);
    expect(changes[2]).toEqual({ kind: 'ignored', reason: 'already-acknowledged' });
    expect(state?.acknowledgement?.by).toBe('op.jansen');
  });

  it('when there is no alert, an acknowledgement is ignored', () => {
    expect(run([ack(0)]).changes).toEqual([{ kind: 'ignored', reason: 'no-alert' }]);
  });

  it('when a cleared alert was never acknowledged, acknowledging records it and it stays cleared', () => {
    const { state, kinds } = run([alertAt(0, 5), inside(1, 1), ack(2)]);
    expect(kinds).toEqual(['raised', 'cleared', 'acknowledged']);
    expect(state).toMatchObject({ state: 'cleared', acknowledgement: { at: at(2) } });
  });
});

describe('reduceAlert — clearing and new alerts', () => {
  it('when an acknowledged alert is back inside limits, it is cleared with time and value', () => {
    const { state, kinds } = run([alertAt(0, 5), ack(1), seen(2, 4.5), inside(3, 3)]);
    expect(kinds).toEqual(['raised', 'acknowledged', 'updated', 'cleared']);
    expect(state).toMatchObject({
      state: 'cleared',
      clearedAt: at(3),
      clearedValue: 3,
      lastValue: 4.5,
      acknowledgement: { by: 'op.jansen' },
    });
  });

  it('when a raised alert is back inside limits unacknowledged, it is cleared too', () => {
    expect(run([alertAt(0, 5), inside(1, 2)]).state?.state).toBe('cleared');
  });

  it('when a new exceedance follows a clearing, it is a new alert with the next sequence', () => {
    const { state, changes } = run([alertAt(0, 5), ack(1), inside(2, 1), alertAt(3, 4.2)]);
    expect(changes[3]).toMatchObject({ kind: 'raised' });
    expect(state).toMatchObject({
      sequence: 2,
      state: 'raised',
      firstValue: 4.2,
      peakValue: 4.2,
      acknowledgement: null,
      clearedAt: null,
      escalatedAt: null,
    });
  });

  it('when inside-limits arrives with the alert already cleared, nothing changes', () => {
    expect(run([alertAt(0, 5), inside(1, 1), inside(2, 1)]).kinds).toEqual(['raised', 'cleared']);
  });
});

describe('reduceAlert — quality notices and other events', () => {
  it('when a quality notice arrives, it passes through as a change and the alert is untouched', () => {
    const before = run([alertAt(0, 5)]).state;
    const t = reduceAlert(before, {
      kind: 'quality-notice',
      takenAt: at(1),
      value: 40,
      reason: 'clipped',
    });
    expect(t.changes).toEqual([
      { kind: 'quality-notice', takenAt: at(1), value: 40, reason: 'clipped' },
    ]);
    expect(t.state).toBe(before);
  });

  it('when a late or baseline event arrives, nothing changes', () => {
    const before = run([alertAt(0, 5)]).state;
    expect(reduceAlert(before, { kind: 'late', takenAt: 0, lastTakenAt: 1 })).toEqual({
      state: before,
      changes: [],
    });
    expect(
      reduceAlert(before, {
        kind: 'baseline-complete',
        takenAt: 0,
        stats: { count: 2, mean: 1, sigma: 0 },
      }),
    ).toEqual({ state: before, changes: [] });
  });
});
