import { describe, it, expect } from 'vitest';
import {
  addToBaseline,
  baselineStats,
  computeBaseline,
  EMPTY_BASELINE,
  statisticalLevel,
  type BaselineSample,
} from './baseline.ts';
import { itWithNumpy, runNumpy } from './numpy-live.test-support.ts';

const T0 = Date.UTC(2025, 0, 1);
const DAY = 86_400_000;
const samples = (values: readonly number[], quality: BaselineSample['quality'] = 'ok') =>
  values.map((value, i) => ({ takenAt: T0 + i * DAY, value, quality }));

describe('baseline statistics', () => {
  it('when the values are 2, 4, 4, 4, 5, 5, 7, 9, the mean is 5 and the sample σ is √(32/7)', () => {
    // worked example of Wikipedia "Standard deviation" (population σ = 2); with n − 1: √(32/7) = 2.13809, hand arithmetic
    const stats = computeBaseline({ from: 'first-n', count: 8 }, samples([2, 4, 4, 4, 5, 5, 7, 9]));
    expect(stats?.count).toBe(8);
    expect(stats?.mean).toBeCloseTo(5, 12);
    expect(stats?.sigma).toBeCloseTo(Math.sqrt(32 / 7), 12);
  });

  itWithNumpy(
    'when fed a noisy series, mean and σ agree with numpy.mean and numpy.std(ddof=1)',
    () => {
      // numpy live
      const values = Array.from({ length: 40 }, (_, i) => 2.5 + 0.3 * Math.sin(i * 1.7) + 0.01 * i);
      const expected = runNumpy(
        `v = np.array(${JSON.stringify(values)}); print(json.dumps([float(v.mean()), float(v.std(ddof=1))]))`,
      ) as [number, number];
      const stats = computeBaseline({ from: 'first-n', count: 40 }, samples(values));
      expect(stats?.mean).toBeCloseTo(expected[0], 12);
      expect(stats?.sigma).toBeCloseTo(expected[1], 12);
    },
  );

  it('when values sit around 1e6 with small spread, the running algorithm keeps σ accurate', () => {
    // Welford 1962: no catastrophic cancellation; 1e6 + (0, 1, 2) has sample σ 1 (hand arithmetic)
    let acc = EMPTY_BASELINE;
    for (const v of [1e6, 1e6 + 1, 1e6 + 2]) acc = addToBaseline(acc, v);
    expect(baselineStats(acc)?.sigma).toBeCloseTo(1, 9);
  });

  it('when there is one value, there is no baseline', () => {
    expect(baselineStats(addToBaseline(EMPTY_BASELINE, 3))).toBeNull();
  });

  it('when a value is not finite, adding it throws', () => {
    expect(() => addToBaseline(EMPTY_BASELINE, Number.POSITIVE_INFINITY)).toThrow(RangeError);
  });
});

describe('computeBaseline — which values count', () => {
  it('when asked for the first 3 good values, unusable ones are skipped and later ones ignored', () => {
    const history: BaselineSample[] = [
      { takenAt: T0, value: 100, quality: 'unusable' },
      { takenAt: T0 + DAY, value: 1, quality: 'ok' },
      { takenAt: T0 + 2 * DAY, value: 2, quality: 'ok' },
      { takenAt: T0 + 3 * DAY, value: 3, quality: 'ok' },
      { takenAt: T0 + 4 * DAY, value: 50, quality: 'ok' },
    ];
    // mean of 1, 2, 3 = 2; sample σ = 1 (hand arithmetic)
    expect(computeBaseline({ from: 'first-n', count: 3 }, history)).toEqual({
      count: 3,
      mean: 2,
      sigma: 1,
    });
  });

  it('when the history is given out of order, the first values are still the earliest ones', () => {
    const history = samples([1, 2, 3, 50]).reverse();
    expect(computeBaseline({ from: 'first-n', count: 3 }, history)?.mean).toBe(2);
  });

  it('when fewer good values exist than asked for, there is no baseline', () => {
    expect(computeBaseline({ from: 'first-n', count: 5 }, samples([1, 2, 3]))).toBeNull();
  });

  it('when suspect values are included by default, they count; when excluded, they do not', () => {
    const history = [
      ...samples([1, 3]),
      { takenAt: T0 + 9 * DAY, value: 8, quality: 'suspect' as const },
    ];
    expect(computeBaseline({ from: 'first-n', count: 3 }, history)?.mean).toBe(4);
    expect(
      computeBaseline({ from: 'first-n', count: 2 }, history, { includeSuspect: false })?.mean,
    ).toBe(2);
    expect(
      computeBaseline({ from: 'first-n', count: 3 }, history, { includeSuspect: false }),
    ).toBeNull();
  });

  it('when a period is chosen, only values from its start (inclusive) to its end (exclusive) count', () => {
    const history = samples([10, 1, 2, 3, 10]); // days 0..4
    const stats = computeBaseline(
      { from: 'period', fromAt: T0 + DAY, toAt: T0 + 4 * DAY },
      history,
    );
    expect(stats).toEqual({ count: 3, mean: 2, sigma: 1 });
  });
});

describe('statisticalLevel', () => {
  it('when k is 3, the level is mean + 3σ', () => {
    // definition of a k-sigma level, common practice, no source
    expect(statisticalLevel({ count: 10, mean: 2, sigma: 0.5 }, 3)).toBe(3.5);
  });
});
