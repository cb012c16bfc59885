import { describe, expect, it } from 'vitest';
import { formatNumber as formatValue } from '@turnstone/contracts/number-format';
import { unitText as unitLabel } from '@turnstone/contracts/units';
import { addDays, formatPercent, formatSigned, isIsoDate, todayIso } from './format-review.ts';

describe('review formatting', () => {
  // The app's one number rule (contracts/number-format.ts; common practice, no source).
  it('shows values with three significant figures, as the charts do', () => {
    expect(formatValue(1.5)).toBe('1.50');
    expect(formatValue(0.03456)).toBe('0.0346');
    // Was '0.00042' here while the charts printed '0.000420': one rule now, zeros kept.
    expect(formatValue(0.00042)).toBe('0.000420');
    expect(formatValue(0.5)).toBe('0.500');
    expect(formatValue(22.33)).toBe('22.3');
    expect(formatValue(123.4)).toBe('123');
    expect(formatSigned(-1.2)).toBe('−1.20');
  });
  it('signs percentages and calls a rise from zero "new"', () => {
    expect(formatPercent(30.434)).toBe('+30.4 %');
    expect(formatPercent(-2)).toBe('−2.0 %');
    expect(formatPercent(null)).toBe('new');
  });
  it('moves weeks across month and year ends', () => {
    expect(addDays('2026-12-29', 7)).toBe('2027-01-05');
    expect(addDays('2026-03-01', -7)).toBe('2026-02-22');
  });
  it('takes today in local time and writes µm', () => {
    expect(todayIso(new Date(2026, 0, 5, 23, 30))).toBe('2026-01-05');
    expect(unitLabel('um')).toBe('µm');
    expect(isIsoDate('2026-11-15')).toBe(true);
    expect(isIsoDate('15-11-2026')).toBe(false);
  });
});
