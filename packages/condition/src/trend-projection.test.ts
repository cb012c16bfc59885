import { describe, it, expect } from 'vitest';
import { projectTrend, type TrendPoint } from './trend-projection.ts';
import { fitHinge } from './trend-regime.ts';
import { itWithNumpy, runNumpy } from './numpy-live.test-support.ts';
import { mulberry32 } from '@turnstone/dsp/seeded-random';

const T0 = Date.UTC(2025, 0, 1);
const DAY = 86_400_000;
const daily = (values: readonly number[]): TrendPoint[] =>
  values.map((value, i) => ({ takenAt: T0 + i * DAY, value }));
// levels 4 / 8 mm/s, common practice, no source
const levels = { alertLevel: 4, dangerLevel: 8 };

describe('projectTrend — linear', () => {
  it('when values rise by 0.1 a day from 1, the linear fit wins and alert 4 is crossed on day 30', () => {
    // hand arithmetic: 1 + 0.1·d = 4 → d = 30
    const result = projectTrend(daily([1, 1.1, 1.2, 1.3, 1.4, 1.5]), levels);
    expect(result.outcome).toBe('projected');
    expect(result.fit?.model).toBe('linear');
    expect(result.linear?.slopePerDay).toBeCloseTo(0.1, 12);
    expect(result.fit?.r2).toBeCloseTo(1, 12);
    expect(result.target).toEqual({ level: 'alert', value: 4 });
    expect(result.crossingAt).toBe(T0 + 30 * DAY);
  });

  it('when the latest value is already above alert, the target is the danger level', () => {
    // 3 + 0.5·d = 8 → d = 10 (hand arithmetic)
    const result = projectTrend(daily([3, 3.5, 4, 4.5, 5]), levels);
    expect(result.target).toEqual({ level: 'danger', value: 8 });
    expect(result.fit?.model).toBe('linear');
    expect(result.crossingAt).toBe(T0 + 10 * DAY);
  });

  it('when the latest value is at or above danger, there is no next level', () => {
    const result = projectTrend(daily([6, 7, 8, 8.5, 9]), levels);
    expect(result.outcome).toBe('above-danger');
    expect(result.crossingAt).toBeNull();
    expect(result.fit).not.toBeNull();
  });

  it('when the trend is flat, there is no crossing', () => {
    expect(projectTrend(daily([2, 2, 2, 2, 2]), levels).outcome).toBe('not-rising');
  });

  it('when the trend is falling, there is no crossing', () => {
    const result = projectTrend(daily([3, 2.8, 2.7, 2.5, 2.4]), levels);
    expect(result.outcome).toBe('not-rising');
    expect(result.target?.level).toBe('alert');
  });

  it('when the crossing lies more than a year away, there is none (beyond the horizon)', () => {
    // 1 + 0.001·d = 4 → d = 3000 > 365
    expect(projectTrend(daily([1, 1.001, 1.002, 1.003, 1.004]), levels).outcome).toBe(
      'beyond-horizon',
    );
  });

  it('when the horizon is widened, that same slow crossing is reported', () => {
    const result = projectTrend(daily([1, 1.001, 1.002, 1.003, 1.004]), levels, {
      horizonDays: 4000,
    });
    expect(result.outcome).toBe('projected');
    expect(result.crossingAt).toBe(T0 + 3000 * DAY);
  });

  it('when a long history ends within a year of the crossing, the horizon counts from the latest point', () => {
    // 400 daily points rising 0.005/day from 1: at day 399 the value is 2.995; alert 4 at day 600,
    // 201 days after the latest point although 600 days after the first (hand arithmetic)
    const values = Array.from({ length: 400 }, (_, d) => 1 + 0.005 * d);
    const result = projectTrend(daily(values), levels);
    expect(result.outcome).toBe('projected');
    expect(result.crossingAt).toBe(T0 + 600 * DAY);
  });

  it('when there are fewer than 5 points, there is no projection', () => {
    expect(projectTrend(daily([1, 2, 3, 3.5]), levels).outcome).toBe('too-few-points');
    expect(projectTrend([], levels).outcome).toBe('too-few-points');
  });

  it('when all points share one time, there is no projection', () => {
    const same = [1, 2, 3, 4, 5].map((value) => ({ takenAt: T0, value }));
    expect(projectTrend(same, levels).outcome).toBe('too-few-points');
  });

  it('when unusable points are present, they are left out of the fit', () => {
    const points: TrendPoint[] = [
      ...daily([1, 1.1, 1.2, 1.3, 1.4]),
      { takenAt: T0 + 2.5 * DAY, value: 50, quality: 'unusable' },
    ];
    const result = projectTrend(points, levels);
    expect(result.points).toBe(5);
    expect(result.linear?.slopePerDay).toBeCloseTo(0.1, 12);
  });

  it('when the fit is already above the level at the latest point, the crossing is due now', () => {
    // steep rise, then a dip below alert on the last value; the fitted line is above 4 at day 5
    const result = projectTrend(daily([1, 2, 3, 4.5, 6, 3.9]), levels, {});
    expect(result.target?.level).toBe('alert');
    expect(result.outcome).toBe('projected');
    expect(result.crossingAt).toBe(T0 + 5 * DAY);
  });
});

describe('projectTrend — choosing the fit', () => {
  // a series where the exponential fit looks better on ln(value) but worse on the values
  const mixed = [0.8, 1.3, 2.3, 2.3, 2.8, 1.6];

  it('when the log-space R² favours exponential but the value-space R² favours linear, linear is chosen', () => {
    const result = projectTrend(daily(mixed), levels);
    expect(result.exponential!.r2Log).toBeGreaterThan(result.linear!.r2);
    expect(result.exponential!.r2).toBeLessThan(result.linear!.r2);
    expect(result.fit?.model).toBe('linear');
  });

  itWithNumpy('when comparing fits on that series, both R² values agree with numpy', () => {
    // numpy live
    const [linearR2, expR2, logR2] = runNumpy(
      `y = np.array(${JSON.stringify(mixed)}); t = np.arange(len(y), dtype=float)
r2 = lambda o, p: float(1 - np.sum((o - p)**2) / np.sum((o - o.mean())**2))
pl = np.polyfit(t, y, 1); pe = np.polyfit(t, np.log(y), 1)
print(json.dumps([r2(y, np.polyval(pl, t)), r2(y, np.exp(np.polyval(pe, t))), r2(np.log(y), np.polyval(pe, t))]))`,
    ) as [number, number, number];
    const result = projectTrend(daily(mixed), levels);
    expect(result.linear?.r2).toBeCloseTo(linearR2, 10);
    expect(result.exponential?.r2).toBeCloseTo(expR2, 10);
    expect(result.exponential?.r2Log).toBeCloseTo(logR2, 10);
  });
});

describe('projectTrend — exponential', () => {
  it('when values double every 10 days, the exponential fit wins and alert is crossed when 0.5·2^(d/10) = 4', () => {
    // hand arithmetic: 0.5·2^(d/10) = 4 → d = 30
    const values = Array.from({ length: 8 }, (_, d) => 0.5 * 2 ** (d / 10));
    const result = projectTrend(daily(values), levels);
    expect(result.fit?.model).toBe('exponential');
    expect(result.exponential?.ratePerDay).toBeCloseTo(Math.LN2 / 10, 12);
    expect(result.exponential?.amplitude).toBeCloseTo(0.5, 12);
    expect(result.exponential?.r2).toBeCloseTo(1, 12);
    expect(result.linear?.r2).toBeLessThan(1);
    expect(result.crossingAt).toBe(T0 + 30 * DAY);
  });

  it('when a value is zero, no exponential fit is attempted and the linear one is used', () => {
    const result = projectTrend(daily([0, 0.5, 1, 1.5, 2]), levels);
    expect(result.exponential).toBeNull();
    expect(result.fit?.model).toBe('linear');
    expect(result.crossingAt).toBe(T0 + 8 * DAY);
  });

  itWithNumpy(
    'when fitting a noisy bearing-like rise, the log-linear fit agrees with numpy.polyfit(t, log y, 1)',
    () => {
      // numpy live
      const values = Array.from(
        { length: 20 },
        (_, d) => 0.8 * Math.exp(0.05 * d) * (1 + 0.04 * Math.sin(d * 1.9)),
      );
      const days = values.map((_, d) => d);
      const [rate, logA, r2] = runNumpy(
        `t = np.array(${JSON.stringify(days)}, dtype=float); y = np.array(${JSON.stringify(values)})
p = np.polyfit(t, np.log(y), 1)
pred = np.exp(np.polyval(p, t))
r2 = 1 - np.sum((y - pred)**2) / np.sum((y - y.mean())**2)
print(json.dumps([float(p[0]), float(p[1]), float(r2)]))`,
      ) as [number, number, number];
      const result = projectTrend(daily(values), levels);
      expect(result.exponential?.ratePerDay).toBeCloseTo(rate, 10);
      expect(Math.log(result.exponential?.amplitude ?? 0)).toBeCloseTo(logA, 10);
      expect(result.exponential?.r2).toBeCloseTo(r2, 10);
      expect(result.fit?.model).toBe('exponential');
      // crossing from the fitted curve: ln(4 / A) / rate days after the first point
      const expectedDay = (Math.log(4) - logA) / rate;
      expect(((result.crossingAt ?? 0) - T0) / DAY).toBeCloseTo(expectedDay, 6);
    },
  );

  it('when an exponential series is falling, there is no crossing', () => {
    const values = Array.from({ length: 6 }, (_, d) => 3 * Math.exp(-0.1 * d));
    const result = projectTrend(daily(values), levels);
    expect(result.fit?.model).toBe('exponential');
    expect(result.outcome).toBe('not-rising');
  });
});

describe('projectTrend — the recent regime', () => {
  // 60 flat days at 1, then +5 %/day for 15 days: v = 1.05^j on day 59 + j (definition).
  // Alert is set where the rise will be 2.2 days after the latest point: 1.05^(15 + 2.2).
  const turn = [
    ...Array.from({ length: 60 }, () => 1),
    ...Array.from({ length: 15 }, (_, j) => 1.05 ** (j + 1)),
  ];
  const alert = 1.05 ** 17.2;
  const turnLevels = { alertLevel: alert, dangerLevel: 2 * alert };
  const latestAt = T0 + 74 * DAY;

  it('when a flat trend turns upward at +5 %/day, the crossing is projected 2.2 days ahead from the turn', () => {
    // hand arithmetic: 1.05^(15 + x) = 1.05^17.2 → x = 2.2 days after the latest point
    const result = projectTrend(daily(turn), turnLevels);
    expect(result.outcome).toBe('projected');
    expect(result.fit?.model).toBe('exponential');
    expect(((result.crossingAt ?? 0) - latestAt) / DAY).toBeCloseTo(2.2, 6);
    expect(result.window).toMatchObject({ changed: true, toAt: latestAt });
    // the regime starts at the turn (day 59, where ln v = (d − 59)·ln 1.05 begins, or day 60)
    expect(((result.window?.fromAt ?? 0) - T0) / DAY).toBeGreaterThanOrEqual(59);
    expect(((result.window?.fromAt ?? 0) - T0) / DAY).toBeLessThanOrEqual(60);
  });

  it('when a trend rises in a straight line, it is one regime and the line fit gives the crossing', () => {
    // v = 1 + 0.05·d for 14 days: curved in ln(v) but by less than 1 %, so no break; the line
    // reaches 2.24 at d = 24.8 (hand arithmetic)
    const result = projectTrend(daily(Array.from({ length: 14 }, (_, d) => 1 + 0.05 * d)), {
      alertLevel: 2.24,
      dangerLevel: 4,
    });
    expect(result.window).toMatchObject({ changed: false, points: 14 });
    expect(result.fit?.model).toBe('linear');
    expect(((result.crossingAt ?? 0) - T0) / DAY).toBeCloseTo(24.8, 6);
  });

  it('when every point is fitted, the same turn is projected far too late (why the window matters)', () => {
    const result = projectTrend(daily(turn), turnLevels, { changePoints: false });
    expect(((result.crossingAt ?? 0) - latestAt) / DAY).toBeGreaterThan(10);
    expect(result.window).toMatchObject({ changed: false, points: 75 });
  });

  it('when the fit puts the crossing before now, it is reported at now and marked overdue', () => {
    // the trend stopped 30 days ago; the rise crossed alert 2.2 days after its last value
    const now = latestAt + 30 * DAY;
    const result = projectTrend(daily(turn), turnLevels, { now });
    expect(result.crossingAt).toBe(now);
    expect(result.overdue).toBe(true);
    const ahead = projectTrend(daily(turn), turnLevels);
    expect(ahead.overdue).toBe(false);
  });

  // seeded log-normal scatter (mulberry32 + Box–Muller, definitions) for the noisy cases
  const noisy = (seed: number, n: number, median: (d: number) => number, s: number) => {
    const u = mulberry32(seed);
    return Array.from({ length: n }, (_, d) => {
      const z = Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
      return median(d) * Math.exp(s * z);
    });
  };

  it('when a healthy trend only scatters (20 %), no change point is found in most seeds', () => {
    // BIC penalises the extra line: a spurious break should be rare (common practice, no source)
    let changed = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const r = projectTrend(daily(noisy(seed, 60, () => 1, 0.2)), levels);
      if (r.window?.changed) changed++;
    }
    expect(changed).toBeLessThanOrEqual(3);
  });

  itWithNumpy(
    'when a noisy trend turns upward, the window starts near the turn and its fit agrees with numpy',
    () => {
      // 90 days at 1 then +4 %/day for 25 days, 10 % log-normal scatter
      const values = noisy(7, 115, (d) => (d < 90 ? 1 : Math.exp(0.04 * (d - 90))), 0.1);
      const result = projectTrend(daily(values), { alertLevel: 4, dangerLevel: 8 });
      const from = Math.round(((result.window?.fromAt ?? 0) - T0) / DAY);
      expect(Math.abs(from - 90)).toBeLessThanOrEqual(6);
      // numpy live: polyfit over the same window
      const [rate] = runNumpy(
        `y = np.array(${JSON.stringify(values.slice(from))}); t = np.arange(len(y), dtype=float)
print(json.dumps([float(np.polyfit(t, np.log(y), 1)[0])]))`,
      ) as [number];
      expect(result.exponential?.ratePerDay).toBeCloseTo(rate, 10);
      expect(rate).toBeGreaterThan(0.03);
    },
  );
});

describe('fitHinge — a flat level that turns upward', () => {
  it('when a series is 2 until day 10 and rises 0.5 a day after, the hinge finds day 10, 2 and 0.5 exactly', () => {
    // y = 2 + 0.5·max(0, x − 10): the model itself, noise-free (definition of the hinge)
    const xs = Array.from({ length: 30 }, (_, i) => i);
    const ys = xs.map((x) => 2 + 0.5 * Math.max(0, x - 10));
    const h = fitHinge(xs, ys, 5);
    expect(h?.k).toBe(10);
    expect(h?.a).toBeCloseTo(2, 12);
    expect(h?.b).toBeCloseTo(0.5, 12);
    expect(h?.sse).toBeLessThan(1e-18);
  });

  itWithNumpy(
    'when the series scatters, the break and the line agree with numpy.linalg.lstsq tried at every break',
    () => {
      // numpy live: brute force over breaks k with at least 5 points from k, lstsq on [1, z]
      const xs = Array.from({ length: 40 }, (_, i) => i * 0.5);
      const ys = xs.map((x, i) => 1 + 0.3 * Math.max(0, x - 12) + 0.2 * Math.sin(i * 2.3));
      const [k, a, b, sse] = runNumpy(
        `x = np.array(${JSON.stringify(xs)}); y = np.array(${JSON.stringify(ys)})
best = None
for k in range(0, len(x) - 5 + 1):
    z = np.maximum(0, x - x[k]); A = np.vstack([np.ones_like(z), z]).T
    c, *_ = np.linalg.lstsq(A, y, rcond=None); r = float(np.sum((y - A @ c) ** 2))
    if best is None or r < best[3]: best = (k, float(c[0]), float(c[1]), r)
print(json.dumps(best))`,
      ) as [number, number, number, number];
      const h = fitHinge(xs, ys, 5);
      expect(h?.k).toBe(k);
      expect(h?.a).toBeCloseTo(a, 9);
      expect(h?.b).toBeCloseTo(b, 9);
      expect(h?.sse).toBeCloseTo(sse, 9);
    },
  );

  it('when a 40-day flat history turns into a young straight rise, the projection fits from the turn', () => {
    // 1.0 to day 40, then +0.05 a day to day 48, noise-free: alert 4 is reached where
    // 1 + 0.05·(d − 40) = 4, day 100 (hand arithmetic); the rise's own points are days 41–48
    const values = Array.from({ length: 49 }, (_, d) => 1 + 0.05 * Math.max(0, d - 40));
    const result = projectTrend(daily(values), levels);
    expect(result.outcome).toBe('projected');
    expect(result.fit?.model).toBe('linear');
    expect(result.window).toMatchObject({ changed: true, points: 8, fromAt: T0 + 41 * DAY });
    expect(((result.crossingAt ?? 0) - T0) / DAY).toBeCloseTo(100, 6);
  });
});
