import { describe, it, expect } from 'vitest';
import {
  addToBaseline,
  baselineComplete,
  baselineShortfall,
  baselineStats,
  baselineTakes,
  computeBaseline,
  EMPTY_BASELINE,
  logStatsOf,
  statisticalLevel,
  type BaselineAccumulator,
  type BaselineSample,
} from './baseline.ts';
import { checkBandDefinition, type BandDefinition } from './band-definition.ts';
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
  it('when asked for the first 30 good values, unusable ones are skipped and later ones ignored', () => {
    // days 1–30 hold 1, 2, 3, 1, 2, 3, …: mean 2; sample σ = √(20/29) (hand arithmetic);
    // the 50s after them and the unusable 100 before them do not count
    const history: BaselineSample[] = [
      { takenAt: T0, value: 100, quality: 'unusable' },
      ...Array.from({ length: 30 }, (_, i) => ({
        takenAt: T0 + (i + 1) * DAY,
        value: 1 + (i % 3),
        quality: 'ok' as const,
      })),
      { takenAt: T0 + 31 * DAY, value: 50, quality: 'ok' },
      { takenAt: T0 + 32 * DAY, value: 50, quality: 'ok' },
    ];
    const stats = computeBaseline({ from: 'first-n', count: 30 }, history);
    expect(stats).toMatchObject({ count: 30, spanDays: 29 });
    expect(stats?.mean).toBeCloseTo(2, 12);
    expect(stats?.sigma).toBeCloseTo(Math.sqrt(20 / 29), 12);
  });

  it('when the history is given out of order, the first values are still the earliest ones', () => {
    const history = samples([...Array.from({ length: 30 }, () => 2), 50]).reverse();
    expect(computeBaseline({ from: 'first-n', count: 30 }, history)?.mean).toBe(2);
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
    expect(stats).toMatchObject({ count: 3, mean: 2, sigma: 1, spanDays: 2 });
  });
});

describe('baseline statistics in the log domain', () => {
  itWithNumpy(
    'when fed log-normal-like values, the mean and σ of ln(value) agree with numpy',
    () => {
      // numpy live: np.log(v).mean(), np.log(v).std(ddof=1)
      const values = Array.from({ length: 35 }, (_, i) => 2 * Math.exp(0.25 * Math.sin(i * 2.3)));
      const [mu, s] = runNumpy(
        `v = np.log(np.array(${JSON.stringify(values)})); print(json.dumps([float(v.mean()), float(v.std(ddof=1))]))`,
      ) as [number, number];
      const stats = computeBaseline({ from: 'first-n', count: 35 }, samples(values));
      expect(stats?.logMean).toBeCloseTo(mu, 12);
      expect(stats?.logSigma).toBeCloseTo(s, 12);
    },
  );

  itWithNumpy(
    'when a stored baseline has only mean and σ, the log-normal moments give μ and s back',
    () => {
      // scipy.stats.lognorm run live: a log-normal with the derived s and scale e^μ has mean 2, σ 0.5
      const logs = logStatsOf({ count: 30, mean: 2, sigma: 0.5 });
      const [mean, std] = runNumpy(
        `from scipy.stats import lognorm
d = lognorm(${logs!.sigma}, scale=np.exp(${logs!.mean})); print(json.dumps([float(d.mean()), float(d.std())]))`,
      ) as [number, number];
      expect(mean).toBeCloseTo(2, 10);
      expect(std).toBeCloseTo(0.5, 10);
    },
    60_000,
  );
});

describe('minimum baseline', () => {
  const DAYS = (n: number) => n * DAY;
  const take = (source: Parameters<typeof baselineTakes>[0], step: number, count: number) => {
    let acc: BaselineAccumulator = EMPTY_BASELINE;
    for (let i = 0; i < count; i++) {
      const sample = { takenAt: T0 + i * step, value: 1 + (i % 3) * 0.1, quality: 'ok' as const };
      if (baselineTakes(source, acc, sample))
        acc = addToBaseline(acc, sample.value, sample.takenAt);
    }
    return acc;
  };

  it('when 30 daily values span 29 days, a first-30 baseline is complete', () => {
    // Turnstone rule: at least 30 values over at least 7 days, common practice, no source
    const source = { from: 'first-n' as const, count: 30 };
    const acc = take(source, DAY, 60);
    expect(acc.count).toBe(30);
    expect(baselineComplete(source, acc, T0 + DAYS(59))).toBe(true);
  });

  it('when values come hourly, a first-30 baseline keeps taking until it spans 7 days', () => {
    // 7 days of hourly values: 7·24 + 1 = 169 values (hand arithmetic)
    const source = { from: 'first-n' as const, count: 30 };
    const acc = take(source, 3_600_000, 400);
    expect(acc.count).toBe(169);
    expect(baselineComplete(source, acc, T0 + DAYS(20))).toBe(true);
    expect(baselineComplete(source, take(source, 3_600_000, 100), T0 + DAYS(20))).toBe(false);
  });

  it('when a period holds fewer than 30 values, it never completes', () => {
    const source = { from: 'period' as const, fromAt: T0, toAt: T0 + DAYS(20) };
    const acc = take(source, DAY, 40); // days 0..19 → 20 values
    expect(acc.count).toBe(20);
    expect(baselineComplete(source, acc, T0 + DAYS(39))).toBe(false);
  });

  it('when a baseline has 2 values, the shortfall says what is needed', () => {
    const stats = computeBaseline({ from: 'first-n', count: 2 }, samples([1, 2]));
    expect(baselineShortfall(stats)).toMatch(
      /at least 30 usable values over at least 7 days; there are 2/,
    );
    expect(baselineShortfall(null)).toMatch(/at least 30/);
  });

  it('when 30 values span 2 days, the shortfall names the span', () => {
    const hourly = Array.from({ length: 30 }, (_, i) => ({
      takenAt: T0 + i * 3_600_000 * 2,
      value: 1,
      quality: 'ok' as const,
    }));
    const stats = computeBaseline({ from: 'period', fromAt: T0, toAt: T0 + DAYS(30) }, hourly);
    expect(baselineShortfall(stats)).toMatch(/span 2\.4 days/);
  });

  it('when a band asks for a 2-value baseline or a 3-day period, the definition is refused with a clear message', () => {
    const band: BandDefinition = {
      key: 'v',
      name: 'v',
      kind: 'overall',
      spectrum: 'velocity',
      measure: 'rms',
      unit: 'mm/s',
      alertLevel: 4,
      dangerLevel: 8,
      statistical: { kAlert: 3, baseline: { from: 'first-n', count: 2 } },
    };
    expect(checkBandDefinition(band)).toEqual([
      {
        field: 'statistical.baseline.count',
        message: expect.stringMatching(/at least 30 usable values over at least 7 days; 2 value/),
      },
    ]);
    const period = {
      ...band,
      statistical: {
        kAlert: 3,
        baseline: { from: 'period' as const, fromAt: T0, toAt: T0 + DAYS(3) },
      },
    };
    expect(checkBandDefinition(period)[0]?.field).toBe('statistical.baseline.toAt');
    const ok = {
      ...band,
      statistical: { kAlert: 3, baseline: { from: 'first-n' as const, count: 30 } },
    };
    expect(checkBandDefinition(ok)).toEqual([]);
  });
});

describe('statisticalLevel', () => {
  const base = { count: 30, mean: 2.04, sigma: 0.4 };
  it('when k is 3, the level is exp(μ + 3s) of ln(value)', () => {
    // k-sigma level in the log domain: 2·e^(3·0.2) (hand arithmetic), common practice, no source
    expect(statisticalLevel({ ...base, logMean: Math.log(2), logSigma: 0.2 }, 3)).toBeCloseTo(
      2 * Math.exp(0.6),
      12,
    );
  });

  it('when the baseline has no scatter, σ is floored at 0.1 and the level stays above the mean', () => {
    // floor 0.1: 2·e^0.3 = 2.6997 (hand arithmetic), Turnstone rule, no source
    expect(statisticalLevel({ ...base, logMean: Math.log(2), logSigma: 0 }, 3)).toBeCloseTo(
      2 * Math.exp(0.3),
      12,
    );
  });

  it('when the mean is not above 0, the level falls back to mean + kσ', () => {
    expect(statisticalLevel({ count: 30, mean: 0, sigma: 0.5 }, 3)).toBe(1.5);
  });
});
