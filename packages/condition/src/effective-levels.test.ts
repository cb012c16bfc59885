import { describe, it, expect } from 'vitest';
import type { BandDefinition, StatisticalRule } from './band-definition.ts';
import { bandHysteresis, bandPersistence, effectiveLevels } from './effective-levels.ts';

// Fixed levels 4 / 8 and baseline mean 1, σ 0.5: round numbers, common practice, no source.
const band: BandDefinition = {
  key: 'b',
  name: 'b',
  kind: 'hz',
  fromHz: 10,
  toHz: 100,
  spectrum: 'velocity',
  measure: 'rms',
  unit: 'mm/s',
  alertLevel: 4,
  dangerLevel: 8,
};
const stats = { count: 20, mean: 1, sigma: 0.5 };
const withRule = (rule: Partial<StatisticalRule>): BandDefinition => ({
  ...band,
  statistical: { kAlert: 3, baseline: { from: 'first-n', count: 20 }, ...rule },
});

describe('effectiveLevels', () => {
  it('when there is no statistical rule, the fixed levels apply', () => {
    expect(effectiveLevels(band, stats)).toMatchObject({
      alertLevel: 4,
      dangerLevel: 8,
      source: 'fixed',
    });
  });

  it('when the rule has no baseline yet, the fixed levels apply', () => {
    expect(effectiveLevels(withRule({}), null)).toMatchObject({ alertLevel: 4, source: 'fixed' });
  });

  it('when combined by min (default), alert is the lower of fixed and mean + kσ', () => {
    // 1 + 3·0.5 = 2.5 < 4
    expect(effectiveLevels(withRule({}), stats)).toMatchObject({
      alertLevel: 2.5,
      dangerLevel: 8,
      source: 'statistical',
    });
  });

  it('when combined by min and mean + kσ lies above the fixed level, the fixed level stays', () => {
    // 1 + 10·0.5 = 6 > 4
    expect(effectiveLevels(withRule({ kAlert: 10 }), stats).alertLevel).toBe(4);
  });

  it('when combined by max, alert is the higher of fixed and mean + kσ', () => {
    expect(effectiveLevels(withRule({ combine: 'max' }), stats).alertLevel).toBe(4);
    expect(effectiveLevels(withRule({ combine: 'max', kAlert: 10 }), stats).alertLevel).toBe(6);
  });

  it('when combined as statistical only, alert is mean + kσ even above the fixed level', () => {
    expect(
      effectiveLevels(withRule({ combine: 'statistical', kAlert: 10 }), stats).alertLevel,
    ).toBe(6);
  });

  it('when kDanger is set, danger is combined the same way', () => {
    // min(8, 1 + 6·0.5 = 4)
    expect(effectiveLevels(withRule({ kDanger: 6 }), stats).dangerLevel).toBe(4);
  });

  it('when the combined alert would lie above danger, it is lowered to the danger level', () => {
    // statistical alert 1 + 20·0.5 = 11 > fixed danger 8
    expect(effectiveLevels(withRule({ combine: 'statistical', kAlert: 20 }), stats)).toMatchObject({
      alertLevel: 8,
      dangerLevel: 8,
    });
  });

  it('when the rule carries an established baseline, it wins over the collected one', () => {
    const rule = withRule({ established: { count: 5, mean: 0, sigma: 0.1 } });
    expect(effectiveLevels(rule, stats).alertLevel).toBeCloseTo(0.3, 12);
  });
});

describe('band defaults', () => {
  it('when a band sets no persistence or hysteresis, they default to 1 and 0.9', () => {
    // common practice, no source
    expect(bandPersistence(band)).toBe(1);
    expect(bandHysteresis(band)).toBe(0.9);
    expect(bandPersistence({ ...band, persistence: 3 })).toBe(3);
    expect(bandHysteresis({ ...band, hysteresis: 0.8 })).toBe(0.8);
  });
});
