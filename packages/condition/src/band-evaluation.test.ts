import { describe, it, expect } from 'vitest';
import type { BandDefinition } from './band-definition.ts';
import {
  evaluateBand,
  INITIAL_BAND_STATE,
  type BandEvent,
  type BandSample,
  type BandState,
} from './band-evaluation.ts';
import type { QualityVerdict } from './quality.ts';

const T0 = Date.UTC(2025, 0, 1);
const HOUR = 3_600_000;

// Levels chosen for easy arithmetic: common practice, no source.
const band: BandDefinition = {
  key: 'overall-velocity',
  name: 'Overall velocity',
  kind: 'overall',
  spectrum: 'velocity',
  measure: 'rms',
  unit: 'mm/s',
  alertLevel: 4,
  dangerLevel: 8,
};

/** Feeds values one hour apart; returns the final state and every sample's events. */
function feed(
  definition: BandDefinition,
  values: readonly (number | [number, QualityVerdict])[],
  start: BandState = INITIAL_BAND_STATE,
): { state: BandState; events: BandEvent[][] } {
  let state = start;
  const events: BandEvent[][] = [];
  values.forEach((entry, i) => {
    const [value, quality] = typeof entry === 'number' ? [entry, 'ok' as const] : entry;
    const sample: BandSample = { takenAt: T0 + i * HOUR, value, quality };
    const result = evaluateBand(definition, state, sample);
    state = result.state;
    events.push(result.events);
  });
  return { state, events };
}

const kinds = (events: BandEvent[][]) => events.map((e) => e.map((x) => x.kind).join(','));

describe('evaluateBand — exceedance and persistence', () => {
  it('when persistence is 1 and a value reaches the alert level, an alert exceedance follows at once', () => {
    const { state, events } = feed(band, [3, 4]);
    expect(kinds(events)).toEqual(['', 'exceedance']);
    expect(events[1]?.[0]).toMatchObject({
      kind: 'exceedance',
      level: 'alert',
      value: 4,
      limit: 4,
    });
    expect(state.condition).toBe('alert');
  });

  it('when a value sits exactly on the alert level, it counts as an exceedance', () => {
    // boundary rule matches isoZone: on the level is the higher side
    expect(kinds(feed(band, [4]).events)).toEqual(['exceedance']);
  });

  it('when a value sits just below the alert level, nothing is raised', () => {
    expect(feed(band, [3.999]).state.condition).toBe('normal');
  });

  it('when persistence is 3, only the third consecutive exceedance raises', () => {
    const { events } = feed({ ...band, persistence: 3 }, [5, 5, 5]);
    expect(kinds(events)).toEqual(['', '', 'exceedance']);
    expect(events[2]?.[0]).toMatchObject({ run: 3 });
  });

  it('when persistence is 3 and the run is broken by a value below the level, counting restarts', () => {
    const { state, events } = feed({ ...band, persistence: 3 }, [5, 5, 3, 5, 5]);
    expect(kinds(events)).toEqual(['', '', '', '', '']);
    expect(state).toMatchObject({ condition: 'normal', alertRun: 2 });
  });

  it('when a first value is above danger with persistence 1, danger is raised directly', () => {
    const { state, events } = feed(band, [9]);
    expect(events[0]).toEqual([
      expect.objectContaining({ kind: 'exceedance', level: 'danger', limit: 8 }),
    ]);
    expect(state.condition).toBe('danger');
  });

  it('when an alert band then reaches danger, a danger exceedance (escalation) follows', () => {
    const { events } = feed(band, [5, 8]);
    expect(events[1]?.[0]).toMatchObject({ kind: 'exceedance', level: 'danger', value: 8 });
  });

  it('when persistence is 2, escalation to danger also needs two consecutive danger values', () => {
    const { events } = feed({ ...band, persistence: 2 }, [5, 5, 9, 6, 9, 9]);
    expect(kinds(events)).toEqual([
      '',
      'exceedance',
      'observation',
      'observation',
      'observation',
      'exceedance',
    ]);
    expect(events[5]?.[0]).toMatchObject({ level: 'danger' });
  });

  it('when a band is at danger and falls back between alert and danger, it stays at danger', () => {
    const { state, events } = feed(band, [9, 5]);
    expect(kinds(events)).toEqual(['exceedance', 'observation']);
    expect(state.condition).toBe('danger');
  });
});

describe('evaluateBand — hysteresis and clearing', () => {
  it('when a raised band drops below the alert level but not below 0.9 × alert, it stays raised', () => {
    // 0.9 × 4 = 3.6: default hysteresis, common practice, no source
    const { state, events } = feed(band, [5, 3.7]);
    expect(kinds(events)).toEqual(['exceedance', 'observation']);
    expect(state.condition).toBe('alert');
  });

  it('when a raised band drops strictly below 0.9 × alert, it is back inside limits', () => {
    const { state, events } = feed(band, [5, 3.5]);
    expect(events[1]?.[0]).toMatchObject({ kind: 'inside-limits', value: 3.5 });
    expect((events[1]?.[0] as { limit: number }).limit).toBeCloseTo(3.6, 12);
    expect(state.condition).toBe('normal');
  });

  it('when a value sits exactly on the hysteresis threshold, the band stays raised', () => {
    const { state } = feed({ ...band, hysteresis: 0.5 }, [5, 2]);
    expect(state.condition).toBe('alert');
  });

  it('when a danger band drops below h × the alert level, it clears in one step', () => {
    const { state, events } = feed(band, [9, 1]);
    expect(kinds(events)).toEqual(['exceedance', 'inside-limits']);
    expect(state.condition).toBe('normal');
  });

  it('when hysteresis is 0.5, a value at 0.6 × alert does not clear', () => {
    const { state } = feed({ ...band, hysteresis: 0.5 }, [5, 2.4]);
    expect(state.condition).toBe('alert');
  });

  it('when a band cleared and the value rises again, a fresh exceedance needs the full persistence', () => {
    const { events } = feed({ ...band, persistence: 2 }, [5, 5, 1, 5, 5]);
    expect(kinds(events)).toEqual(['', 'exceedance', 'inside-limits', '', 'exceedance']);
  });
});

describe('evaluateBand — quality gating', () => {
  it('when a snapshot is unusable, it raises nothing and gives a quality notice', () => {
    const { state, events } = feed(band, [[20, 'unusable']]);
    expect(events[0]).toEqual([{ kind: 'quality-notice', takenAt: T0, value: 20, reason: null }]);
    expect(state).toEqual(INITIAL_BAND_STATE);
  });

  it('when a raised band gets an unusable value far below limits, it does not clear', () => {
    const { state, events } = feed(band, [5, [0.1, 'unusable']]);
    expect(kinds(events)).toEqual(['exceedance', 'quality-notice']);
    expect(state.condition).toBe('alert');
  });

  it('when an unusable value sits inside a persistence run, the run neither breaks nor grows', () => {
    const { state, events } = feed({ ...band, persistence: 3 }, [
      5,
      [0.1, 'unusable'],
      5,
      [9, 'unusable'],
      5,
    ]);
    expect(kinds(events)).toEqual(['', 'quality-notice', '', 'quality-notice', 'exceedance']);
    expect(state.alertRun).toBe(3);
  });

  it('when the unusable snapshot has findings, the notice carries them', () => {
    const result = evaluateBand(band, INITIAL_BAND_STATE, {
      takenAt: T0,
      value: 1,
      quality: 'unusable',
      qualityReason: 'clipped: 212 samples at the ADC rail',
    });
    expect(result.events[0]).toMatchObject({ reason: 'clipped: 212 samples at the ADC rail' });
  });

  it('when a suspect value raises, the exceedance is marked suspect', () => {
    const { events } = feed(band, [[5, 'suspect']]);
    expect(events[0]?.[0]).toMatchObject({ kind: 'exceedance', suspect: true });
  });

  it('when a persistence run contains one suspect value, the exceedance it completes is marked suspect', () => {
    const { events } = feed({ ...band, persistence: 3 }, [[5, 'suspect'], 5, 5]);
    expect(events[2]?.[0]).toMatchObject({ kind: 'exceedance', suspect: true });
  });

  it('when every value of the run is ok, the exceedance is not suspect', () => {
    const { events } = feed({ ...band, persistence: 2 }, [[5, 'suspect'], 1, 5, 5]);
    expect(events[3]?.[0]).toMatchObject({ kind: 'exceedance', suspect: false });
  });
});

describe('evaluateBand — order of values', () => {
  it('when a value is older than the latest evaluated one, it is reported late and changes nothing', () => {
    const first = evaluateBand(band, INITIAL_BAND_STATE, {
      takenAt: T0 + HOUR,
      value: 1,
      quality: 'ok',
    });
    const late = evaluateBand(band, first.state, { takenAt: T0, value: 9, quality: 'ok' });
    expect(late.events).toEqual([{ kind: 'late', takenAt: T0, lastTakenAt: T0 + HOUR }]);
    expect(late.state).toBe(first.state);
  });

  it('when a value is not finite, throws', () => {
    expect(() =>
      evaluateBand(band, INITIAL_BAND_STATE, { takenAt: T0, value: Number.NaN, quality: 'ok' }),
    ).toThrow(RangeError);
  });
});

describe('evaluateBand — statistical levels', () => {
  const statistical: BandDefinition = {
    ...band,
    statistical: { kAlert: 3, baseline: { from: 'first-n', count: 4 } },
  };

  it('when the baseline is still being collected, the fixed levels apply', () => {
    // baseline 1, 1.2, 1.4 not complete; 5 ≥ fixed alert 4
    const { events } = feed(statistical, [1, 1.2, 5]);
    expect(events[2]?.[0]).toMatchObject({ kind: 'exceedance', limit: 4 });
  });

  it('when the first-n baseline completes, mean + 3σ becomes the alert level', () => {
    // baseline 1, 1, 1, 1.4: mean 1.1, sample σ = √(0.12 / 3) = 0.2 (hand arithmetic, n − 1);
    // alert = min(fixed 4, 1.1 + 3·0.2) = 1.7
    const { state, events } = feed(statistical, [1, 1, 1, 1.4, 1.69, 1.7]);
    expect(events[3]?.[0]).toMatchObject({ kind: 'baseline-complete' });
    const stats = (events[3]?.[0] as { stats: { mean: number; sigma: number } }).stats;
    expect(stats.mean).toBeCloseTo(1.1, 12);
    expect(stats.sigma).toBeCloseTo(0.2, 12);
    expect(kinds(events).slice(4)).toEqual(['', 'exceedance']);
    expect((events[5]?.[0] as { limit: number }).limit).toBeCloseTo(1.7, 12);
    expect(state.baselineComplete).toBe(true);
  });

  it('when the baseline is complete, later values do not change it', () => {
    const { state } = feed(statistical, [1, 1, 1, 1.4, 3, 3]);
    expect(state.baseline.count).toBe(4);
  });

  it('when unusable values come first, the baseline skips them', () => {
    const { state } = feed(statistical, [[50, 'unusable'], 1, 1, 1, 1.4]);
    expect(state.baseline).toMatchObject({ count: 4 });
    expect(state.baseline.mean).toBeCloseTo(1.1, 12);
  });

  it('when suspect values are excluded by the rule, the baseline skips them', () => {
    const rule = { ...statistical.statistical!, includeSuspect: false };
    const { state } = feed({ ...statistical, statistical: rule }, [[3, 'suspect'], 1, 1, 1, 1.4]);
    expect(state.baseline.mean).toBeCloseTo(1.1, 12);
  });

  it('when the rule carries an established baseline, it applies from the first value', () => {
    const rule = { ...statistical.statistical!, established: { count: 10, mean: 1, sigma: 0.1 } };
    // alert = min(4, 1 + 3·0.1) = 1.3
    const { events } = feed({ ...statistical, statistical: rule }, [1.29, 1.3]);
    expect(kinds(events)).toEqual(['', 'exceedance']);
  });
});
