import { describe, it, expect } from 'vitest';
import { fitLine, rSquared } from './least-squares.ts';
import { itWithNumpy, runNumpy } from './numpy-live.test-support.ts';

describe('fitLine', () => {
  it('when the points lie on y = 2x + 1, the fit is exactly that line with R² = 1', () => {
    // exact line, hand arithmetic
    const fit = fitLine([0, 1, 2, 3], [1, 3, 5, 7]);
    expect(fit?.slope).toBeCloseTo(2, 12);
    expect(fit?.intercept).toBeCloseTo(1, 12);
    expect(fit?.r2).toBeCloseTo(1, 12);
  });

  it('when fitting (1,1), (2,2), (3,2), the slope is 0.5, intercept 2/3 and R² 0.75', () => {
    // hand arithmetic from the normal equations: Sxx = 2, Sxy = 1, ȳ = 5/3; SS_res = 1/6, SS_tot = 2/3
    const fit = fitLine([1, 2, 3], [1, 2, 2]);
    expect(fit?.slope).toBeCloseTo(0.5, 12);
    expect(fit?.intercept).toBeCloseTo(2 / 3, 12);
    expect(fit?.r2).toBeCloseTo(0.75, 12);
  });

  itWithNumpy(
    'when fitting scattered data, slope and intercept agree with numpy.polyfit(x, y, 1)',
    () => {
      // numpy live
      const xs = Array.from({ length: 25 }, (_, i) => i * 0.7 + 0.1 * Math.cos(i));
      const ys = xs.map((x, i) => 3.2 - 0.45 * x + 0.8 * Math.sin(i * 2.3));
      const [slope, intercept, r2] = runNumpy(
        `x = np.array(${JSON.stringify(xs)}); y = np.array(${JSON.stringify(ys)})
p = np.polyfit(x, y, 1)
r2 = 1 - np.sum((y - np.polyval(p, x))**2) / np.sum((y - y.mean())**2)
print(json.dumps([float(p[0]), float(p[1]), float(r2)]))`,
      ) as [number, number, number];
      const fit = fitLine(xs, ys);
      expect(fit?.slope).toBeCloseTo(slope, 10);
      expect(fit?.intercept).toBeCloseTo(intercept, 10);
      expect(fit?.r2).toBeCloseTo(r2, 10);
    },
  );

  itWithNumpy('when x is epoch-sized, the fit still agrees with numpy.polyfit on centred x', () => {
    // numpy live; x around 1.7e9 s tests conditioning of the deviation form
    const xs = Array.from({ length: 30 }, (_, i) => 1.7e9 + i * 86_400);
    const ys = xs.map((_, i) => 1.5 + 0.02 * i + 0.05 * Math.sin(i));
    const [slope, intercept] = runNumpy(
      `x = np.array(${JSON.stringify(xs)}); y = np.array(${JSON.stringify(ys)})
p = np.polyfit(x - x.mean(), y, 1)
print(json.dumps([float(p[0]), float(p[1] - p[0] * x.mean())]))`,
    ) as [number, number];
    const fit = fitLine(xs, ys);
    expect(fit?.slope).toBeCloseTo(slope, 15);
    expect((fit?.intercept ?? 0) / intercept).toBeCloseTo(1, 8);
  });

  it('when there are fewer than 2 points or all x are equal, there is no fit', () => {
    expect(fitLine([1], [1])).toBeNull();
    expect(fitLine([2, 2, 2], [1, 2, 3])).toBeNull();
  });

  it('when x and y lengths differ, throws', () => {
    expect(() => fitLine([1, 2], [1])).toThrow(RangeError);
  });
});

describe('rSquared', () => {
  it('when every observation is the same and predicted exactly, R² is 1; otherwise 0', () => {
    expect(rSquared([0.1, 0.1, 0.1], () => 0.1)).toBe(1);
    expect(rSquared([2, 2, 2], () => 3)).toBe(0);
  });

  it('when predictions are the mean, R² is 0', () => {
    // definition of R²
    expect(rSquared([1, 2, 3], () => 2)).toBeCloseTo(0, 12);
  });
});
