import { describe, it, expect } from 'vitest';
import type { BandDefinition } from './band-definition.ts';
import { acknowledgeAlert, evaluateSnapshot, type PointState } from './snapshot-evaluation.ts';
import { overallAcceleration, overallVelocity } from './test-bands.ts';

const T0 = Date.UTC(2025, 5, 1);
const HOUR = 3_600_000;

// Levels: velocity 4 / 8 mm/s, acceleration 1 / 2 g — common practice, no source.
const bands: BandDefinition[] = [overallVelocity(4, 8), overallAcceleration(1, 2)];

describe('evaluateSnapshot', () => {
  it('when a snapshot exceeds one band, only that band raises, with its band key', () => {
    const result = evaluateSnapshot(
      bands,
      {},
      {
        takenAt: T0,
        quality: 'ok',
        values: { 'overall-velocity': 5, 'overall-acceleration': 0.5 },
      },
    );
    expect(result.changes).toEqual([
      expect.objectContaining({ kind: 'raised', bandKey: 'overall-velocity' }),
    ]);
    expect(result.state['overall-velocity']?.alert?.state).toBe('raised');
    expect(result.state['overall-acceleration']?.alert).toBeNull();
  });

  it('when a snapshot is unusable, it gives one quality notice naming the held-back bands and raises nothing', () => {
    const result = evaluateSnapshot(
      bands,
      {},
      {
        takenAt: T0,
        quality: 'unusable',
        qualityReason: 'clipped',
        values: { 'overall-velocity': 50, 'overall-acceleration': 9 },
      },
    );
    expect(result.changes).toEqual([
      {
        kind: 'quality-notice',
        takenAt: T0,
        reason: 'clipped',
        bandKeys: ['overall-velocity', 'overall-acceleration'],
      },
    ]);
    expect(result.state['overall-velocity']?.band.alertRun).toBe(0);
  });

  it('when an unusable snapshot meets a limit set with no bands, the notice is still given', () => {
    const result = evaluateSnapshot([], {}, { takenAt: T0, quality: 'unusable', values: {} });
    expect(result.changes).toEqual([
      { kind: 'quality-notice', takenAt: T0, reason: null, bandKeys: [] },
    ]);
  });

  it('when a band has no value in the snapshot, that band is not evaluated', () => {
    const result = evaluateSnapshot(
      bands,
      {},
      {
        takenAt: T0,
        quality: 'ok',
        values: { 'overall-velocity': 5, 'overall-acceleration': null },
      },
    );
    expect(result.state['overall-acceleration']).toBeUndefined();
  });

  it('when a value rises through alert and danger and falls back, the changes run raised, escalated, cleared', () => {
    let state: PointState = {};
    const kinds: string[] = [];
    [5, 6, 9, 2].forEach((v, i) => {
      const r = evaluateSnapshot(bands, state, {
        takenAt: T0 + i * HOUR,
        quality: 'ok',
        values: { 'overall-velocity': v },
      });
      state = r.state;
      kinds.push(...r.changes.map((c) => c.kind));
    });
    expect(kinds).toEqual(['raised', 'updated', 'escalated', 'cleared']);
    expect(state['overall-velocity']?.alert).toMatchObject({ level: 'danger', peakValue: 9 });
  });

  it('when the state is stored as JSON and read back, evaluation continues the same', () => {
    const first = evaluateSnapshot(
      bands,
      {},
      { takenAt: T0, quality: 'ok', values: { 'overall-velocity': 5 } },
    );
    const stored = JSON.parse(JSON.stringify(first.state)) as PointState;
    const next = { takenAt: T0 + HOUR, quality: 'ok' as const, values: { 'overall-velocity': 9 } };
    expect(evaluateSnapshot(bands, stored, next)).toEqual(
      evaluateSnapshot(bands, first.state, next),
    );
  });
});

describe('acknowledgeAlert', () => {
  it('when an operator acknowledges a raised band, the change names the band and the state records it', () => {
    const raised = evaluateSnapshot(
      bands,
      {},
      { takenAt: T0, quality: 'ok', values: { 'overall-velocity': 5 } },
    );
    const result = acknowledgeAlert(raised.state, 'overall-velocity', {
      by: 'op.lind',
      note: 'seen',
      at: T0 + 1,
    });
    expect(result.changes).toEqual([
      expect.objectContaining({ kind: 'acknowledged', bandKey: 'overall-velocity' }),
    ]);
    expect(result.state['overall-velocity']?.alert?.state).toBe('acknowledged');
  });

  it('when the band has never raised, the acknowledgement is ignored', () => {
    const result = acknowledgeAlert({}, 'overall-velocity', { by: 'op.lind', note: '', at: T0 });
    expect(result.changes).toEqual([
      { kind: 'ignored', reason: 'no-alert', bandKey: 'overall-velocity' },
    ]);
    expect(result.state).toEqual({});
  });
});
