import { describe, expect, it } from 'vitest';
import { bandHzOf, formatBandHz } from './band-label.ts';

// Label format is Turnstone's own (common practice, no source): edges to 5 significant
// figures, an en dash, "Hz".
describe('band label', () => {
  it('when a stored band is a pair of numbers, it reads back as [from, to]', () => {
    expect(bandHzOf([10, 1000])).toEqual([10, 1000]);
  });

  it('when a stored band is missing or malformed, it reads as not recorded', () => {
    for (const v of [undefined, null, [10], [10, '1000'], [10, Number.NaN], '10-1000'])
      expect(bandHzOf(v)).toBeNull();
    expect(formatBandHz(bandHzOf(undefined))).toBe('band not recorded');
  });

  it('when a band has long edges, they are written to 5 significant figures', () => {
    expect(formatBandHz([10, 1000])).toBe('10–1000 Hz');
    // 25 600 / 2.56 = 10 000 Hz; 2.5 Hz lower edge
    expect(formatBandHz([2.5, 25_600 / 2.56])).toBe('2.5–10000 Hz');
    expect(formatBandHz([1 / 3, 4000])).toBe('0.33333–4000 Hz');
  });
});
