import { describe, it, expect } from 'vitest';
import type { BandDefinition, StatisticalRule } from './band-definition.ts';
import {
  bandClearAfterHours,
  bandClearPersistence,
  bandHysteresis,
  bandPersistence,
  effectiveLevels,
  levelsInForce,
} from './effective-levels.ts';
import { addToBaseline, baselineStats, EMPTY_BASELINE } from './baseline.ts';
import { NEW_BAND_RULES } from './band-definition.ts';

// Fixed levels 4 / 8 and a baseline with ln(value) mean 0, σ 0.2: round numbers, common
// practice, no source. L(k) = e^(0.2·k) (hand arithmetic).
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
const stats = { count: 30, mean: 1.02, sigma: 0.2, logMean: 0, logSigma: 0.2 };
const L = (k: number) => Math.exp(0.2 * k);
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

  it('when combined by min (default), alert is the lower of fixed and L(k)', () => {
    // L(3) = e^0.6 = 1.822 < 4
    const lv = effectiveLevels(withRule({}), stats);
    expect(lv).toMatchObject({ dangerLevel: 8, source: 'statistical' });
    expect(lv.alertLevel).toBeCloseTo(L(3), 12);
  });

  it('when combined by min and L(k) lies above the fixed level, the fixed level stays', () => {
    // L(10) = e^2 = 7.39 > 4
    expect(effectiveLevels(withRule({ kAlert: 10 }), stats).alertLevel).toBe(4);
  });

  it('when combined by max, alert is the higher of fixed and L(k)', () => {
    expect(effectiveLevels(withRule({ combine: 'max' }), stats).alertLevel).toBe(4);
    expect(effectiveLevels(withRule({ combine: 'max', kAlert: 10 }), stats).alertLevel).toBeCloseTo(
      L(10),
      12,
    );
  });

  it('when combined as statistical only, alert is L(k) even above the fixed level', () => {
    expect(
      effectiveLevels(withRule({ combine: 'statistical', kAlert: 10 }), stats).alertLevel,
    ).toBeCloseTo(L(10), 12);
  });

  it('when kDanger is set, danger is combined the same way', () => {
    // min(8, L(6) = e^1.2 = 3.32)
    expect(effectiveLevels(withRule({ kDanger: 6 }), stats).dangerLevel).toBeCloseTo(L(6), 12);
  });

  it('when the combined alert would lie above danger, it is lowered to the danger level', () => {
    // statistical alert L(20) = e^4 = 54.6 > fixed danger 8
    expect(effectiveLevels(withRule({ combine: 'statistical', kAlert: 20 }), stats)).toMatchObject({
      alertLevel: 8,
      dangerLevel: 8,
    });
  });

  it('when the rule carries an established baseline, it wins over the collected one', () => {
    const established = {
      count: 30,
      mean: 0.5,
      sigma: 0.05,
      logMean: Math.log(0.5),
      logSigma: 0.1,
    };
    const rule = withRule({ established });
    // 0.5·e^0.3 (hand arithmetic)
    expect(effectiveLevels(rule, stats).alertLevel).toBeCloseTo(0.5 * Math.exp(0.3), 12);
  });
});

describe('levelsInForce — the one decision for worker, trend page and review', () => {
  const rule = withRule({ baseline: { from: 'first-n', count: 30 } });
  let acc = EMPTY_BASELINE;
  for (let i = 0; i < 30; i++)
    acc = addToBaseline(acc, Math.exp(i % 2 ? 0.2 : -0.2), Date.UTC(2025, 0, 1 + i));

  it('when the band has no state or an incomplete baseline, the fixed levels apply', () => {
    expect(levelsInForce(rule, null)).toMatchObject({ alertLevel: 4, source: 'fixed' });
    expect(levelsInForce(rule, { baseline: acc, baselineComplete: false }).source).toBe('fixed');
  });

  it('when the collected baseline is complete, its log-domain level applies', () => {
    // ln values ±0.2, 15 each: mean 0, sample σ = 0.2·√(30/29) (hand arithmetic)
    const lv = levelsInForce(rule, { baseline: acc, baselineComplete: true });
    expect(lv.source).toBe('statistical');
    expect(lv.alertLevel).toBeCloseTo(Math.exp(3 * 0.2 * Math.sqrt(30 / 29)), 12);
    expect(lv).toEqual(effectiveLevels(rule, baselineStats(acc)));
  });
});

describe('band defaults', () => {
  it('when a band sets no clear persistence it clears on one value; new bands start at 2 and 3', () => {
    // common practice, no source
    expect(bandClearPersistence(band)).toBe(1);
    expect(bandClearPersistence({ ...band, clearPersistence: 3 })).toBe(3);
    expect(NEW_BAND_RULES).toMatchObject({ persistence: 2, clearPersistence: 3 });
  });

  it('when a band sets no clear off-delay it has none; new bands start at 5 days', () => {
    // common practice, no source
    expect(bandClearAfterHours(band)).toBe(0);
    expect(bandClearAfterHours({ ...band, clearAfterHours: 12 })).toBe(12);
    expect(NEW_BAND_RULES.clearAfterHours).toBe(120);
  });

  it('when a band sets no persistence or hysteresis, they default to 1 and 0.9', () => {
    // common practice, no source
    expect(bandPersistence(band)).toBe(1);
    expect(bandHysteresis(band)).toBe(0.9);
    expect(bandPersistence({ ...band, persistence: 3 })).toBe(3);
    expect(bandHysteresis({ ...band, hysteresis: 0.8 })).toBe(0.8);
  });
});
