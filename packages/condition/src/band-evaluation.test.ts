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
import { overallVelocity } from './test-bands.ts';

const T0 = Date.UTC(2025, 0, 1);
const HOUR = 3_600_000;

// Levels chosen for easy arithmetic: common practice, no source.
const band = overallVelocity(4, 8);

/** Feeds values one hour (or `step` ms) apart; returns the final state and every sample's events. */
function feed(
  definition: BandDefinition,
  values: readonly (number | [number, QualityVerdict])[],
  start: BandState = INITIAL_BAND_STATE,
  step = HOUR,
): { state: BandState; events: BandEvent[][] } {
  let state = start;
  const events: BandEvent[][] = [];
  values.forEach((entry, i) => {
    const [value, quality] = typeof entry === 'number' ? [entry, 'ok' as const] : entry;
    const sample: BandSample = { takenAt: T0 + i * step, value, quality };
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

describe('evaluateBand — clear persistence', () => {
  const chattery: BandDefinition = { ...band, hysteresis: 0.95 };
  // a value sitting at the alert level ± 8 %, 4 values a day for a year: a cosine sweep
  // 4·(1 + 0.08·cos(2π·i/7)) visits 0.92–1.08 × alert; values below 0.95 × 4 = 3.8 come in runs
  // of at most 2 (cos(2π·i/7) < −0.625 for i ≡ 3, 4 mod 7; hand arithmetic)
  const year = Array.from(
    { length: 4 * 365 },
    (_, i) => 4 * (1 + 0.08 * Math.cos((2 * Math.PI * i) / 7)),
  );
  const cycles = (def: BandDefinition) =>
    feed(def, year)
      .events.flat()
      .filter((e) => e.kind === 'exceedance').length;

  it('when clearing takes one value, a value at its level ± 8 % raises and clears every week', () => {
    // one cycle per 7-value period: 1460 / 7 → 208 or 209 (hand arithmetic)
    expect(cycles(chattery)).toBeGreaterThan(200);
  });

  it('when clearing takes 3 consecutive values below the clear level, it raises once', () => {
    expect(cycles({ ...chattery, clearPersistence: 3 })).toBe(1);
  });

  it('when 3 values in a row fall below the clear level, the third clears it and names the run', () => {
    const { state, events } = feed({ ...band, clearPersistence: 3 }, [5, 3, 3, 3.7, 3, 3, 3]);
    expect(kinds(events)).toEqual([
      'exceedance',
      'observation',
      'observation',
      'observation',
      'observation',
      'observation',
      'inside-limits',
    ]);
    expect(events[6]?.[0]).toMatchObject({ kind: 'inside-limits', run: 3 });
    expect(state.condition).toBe('normal');
    expect(state.clearRun).toBe(0);
  });

  it('when a state stored before clear persistence existed is read, its run counts from 0', () => {
    const old = { ...INITIAL_BAND_STATE, condition: 'alert' as const, alertRun: 1 };
    delete (old as { clearRun?: number }).clearRun;
    const { events } = feed({ ...band, clearPersistence: 2 }, [3, 3], old);
    expect(kinds(events)).toEqual(['observation', 'inside-limits']);
  });
});

describe('evaluateBand — clear off-delay', () => {
  // Deadband and off-delay against chattering alarms: ANSI/ISA-18.2-2016 and EEMUA 191 (from
  // memory); the 5 % share is Turnstone's, common practice, no source. Values 1 h apart,
  // alert 4, clear level 0.9 × 4 = 3.6, persistence 1 (hand arithmetic throughout).
  const delayed: BandDefinition = { ...band, clearPersistence: 3, clearAfterHours: 48 };
  const below = (count: number) => Array.from({ length: count }, () => 3);

  it('when values stay below the clear level, the band clears on the first value 48 h after the raise', () => {
    const { events } = feed(delayed, [5, ...below(60)]);
    expect(kinds(events).indexOf('inside-limits')).toBe(48);
    expect(events[48]?.[0]).toMatchObject({ kind: 'inside-limits', run: 48 });
  });

  it('when values come a day apart, the count and the hours both hold: 3 values, 48 h', () => {
    const { events } = feed(delayed, [5, 3, 3, 3, 3], INITIAL_BAND_STATE, 24 * HOUR);
    expect(kinds(events)).toEqual([
      'exceedance',
      'observation',
      'observation',
      'inside-limits',
      '',
    ]);
  });

  it('when a run that would raise comes inside the delay, the delay starts again from it', () => {
    // 5 at 31 h holds the raise rule again: clears 48 h later, at 79 h
    const { events } = feed(delayed, [5, ...below(30), 5, ...below(60)]);
    expect(kinds(events).indexOf('inside-limits')).toBe(79);
  });

  it('when one value in 45 reaches the clear level, the band still clears on time', () => {
    // 3.6 at 31 h restarts the 3-value count only; 1 of the 48 values of the window is high
    const { events } = feed(delayed, [5, ...below(30), 3.6, ...below(60)]);
    expect(kinds(events).indexOf('inside-limits')).toBe(48);
  });

  it('when more than 5 % of the values over the delay reach the clear level, it holds until the share falls', () => {
    // 3.7 at every 4th hour up to 60 h, 3 otherwise. The window counts 12 slices of 4 h: at
    // t = 4k + r it holds the values from 4k − 44 on, 45 + r of them. At t = 100 h the highs in
    // it are 56 and 60 h, 2/45 = 4.4 %; at t = 99 h 52, 56, 60 h, 3/48 = 6.3 %.
    const values = [
      5,
      ...Array.from({ length: 150 }, (_, i) => ((i + 1) % 4 === 0 && i < 60 ? 3.7 : 3)),
    ];
    const { events } = feed(delayed, values);
    expect(kinds(events).indexOf('inside-limits')).toBe(100);
  });

  it('when a state stored before the off-delay was kept is read, the count and the share decide', () => {
    const old = { ...INITIAL_BAND_STATE, condition: 'alert' as const, clearRun: 5 };
    delete (old as { raiseHeldAt?: number | null }).raiseHeldAt;
    delete (old as { offDelay?: unknown }).offDelay;
    const { events } = feed(delayed, below(5), old);
    expect(kinds(events)[0]).toBe('inside-limits');
  });

  it('when a slow degradation with scatter crosses its level, counting values alone clears and raises again, the off-delay raises once', () => {
    // median rising linearly from 0.5 to 1.5 × alert over 100 days, 4 values a day, times a
    // scatter pattern 1 + 0.25·cos(2π·i/10) (a periodic stand-in for log-normal scatter:
    // half of every 10 values lie below the median); common practice, no source
    const values = Array.from({ length: 400 }, (_, i) => {
      const median = 4 * (0.5 + i / 400);
      return median * (1 + 0.25 * Math.cos((2 * Math.PI * i) / 10));
    });
    const raises = (def: BandDefinition) =>
      feed({ ...def, persistence: 2, clearPersistence: 3 }, values, INITIAL_BAND_STATE, 6 * HOUR)
        .events.flat()
        .filter((e) => e.kind === 'exceedance' && e.level === 'alert').length;
    expect(raises(band)).toBeGreaterThan(3);
    expect(raises({ ...band, clearAfterHours: 120 })).toBe(1);
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
    statistical: { kAlert: 3, baseline: { from: 'first-n', count: 30 } },
  };
  const DAY = 24 * HOUR;
  // 30 daily baseline values e^(±0.2), 15 each: ln mean 0, sample σ 0.2·√(30/29) (hand
  // arithmetic); the log-domain 3σ level is e^(0.6·√(30/29)) = 1.8401
  const baseline = Array.from({ length: 30 }, (_, i) => Math.exp(i % 2 ? 0.2 : -0.2));
  const level = Math.exp(0.6 * Math.sqrt(30 / 29));

  it('when the baseline is still being collected, the fixed levels apply', () => {
    // baseline 1, 1.2, 1.4 not complete; 5 ≥ fixed alert 4
    const { events } = feed(statistical, [1, 1.2, 5]);
    expect(events[2]?.[0]).toMatchObject({ kind: 'exceedance', limit: 4 });
  });

  it('when the first-n baseline completes, the log-domain 3σ level becomes the alert level', () => {
    const { state, events } = feed(
      statistical,
      [...baseline, level * 0.999, level * 1.001],
      undefined,
      DAY,
    );
    expect(events[29]?.[0]).toMatchObject({ kind: 'baseline-complete' });
    const stats = (events[29]?.[0] as { stats: { logMean: number; logSigma: number } }).stats;
    expect(stats.logMean).toBeCloseTo(0, 12);
    expect(stats.logSigma).toBeCloseTo(0.2 * Math.sqrt(30 / 29), 12);
    expect(kinds(events).slice(30)).toEqual(['', 'exceedance']);
    expect((events[31]?.[0] as { limit: number }).limit).toBeCloseTo(level, 10);
    expect(state.baselineComplete).toBe(true);
  });

  it('when 4 values are all a baseline has, the fixed levels stay in force', () => {
    const { events } = feed(statistical, [1, 1, 1, 1.4, 3.9, 4], undefined, DAY);
    expect(kinds(events)).toEqual(['', '', '', '', '', 'exceedance']);
    expect(events[5]?.[0]).toMatchObject({ limit: 4 });
  });

  it('when the baseline is complete, later values do not change it', () => {
    const { state } = feed(statistical, [...baseline, 3, 3], undefined, DAY);
    expect(state.baseline.count).toBe(30);
  });

  it('when unusable values come first, the baseline skips them', () => {
    const { state } = feed(statistical, [[50, 'unusable'], 1, 1, 1, 1.4]);
    expect(state.baseline).toMatchObject({ count: 4, logCount: 4 });
    expect(state.baseline.mean).toBeCloseTo(1.1, 12);
  });

  it('when suspect values are excluded by the rule, the baseline skips them', () => {
    const rule = { ...statistical.statistical!, includeSuspect: false };
    const { state } = feed({ ...statistical, statistical: rule }, [[3, 'suspect'], 1, 1, 1, 1.4]);
    expect(state.baseline.mean).toBeCloseTo(1.1, 12);
  });

  it('when the rule carries an established baseline, it applies from the first value', () => {
    const established = { count: 30, mean: 1, sigma: 0.1, logMean: 0, logSigma: 0.1 };
    const rule = { ...statistical.statistical!, established };
    // alert = min(4, e^(3·0.1)) = 1.3499 (hand arithmetic)
    const { events } = feed({ ...statistical, statistical: rule }, [1.349, 1.35]);
    expect(kinds(events)).toEqual(['', 'exceedance']);
  });
});
