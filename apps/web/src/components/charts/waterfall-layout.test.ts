import { describe, expect, it } from 'vitest';
import {
  drawnAt,
  hzAndOrder,
  niceTicks,
  pickWaterfall,
  waterfallExtent,
  waterfallLayout,
} from './waterfall-layout.ts';

/** A spectrum of `lines` lines at `step` with one peak of `amp` at line `at` on a 0.01 floor. */
function trace(lines: number, step: number, at: number, amp: number) {
  const values = new Float32Array(lines).fill(0.01);
  values[at] = amp;
  return { values, step };
}

describe('waterfall layout and pick (geometry: common practice, no source)', () => {
  // Three captures at 0.25 Hz lines; the 1× peak (line 100 = 25 Hz) grows 1 → 2 → 3 mm/s
  // from the oldest to the newest, as an unbalance would.
  const traces = [trace(801, 0.25, 100, 3), trace(801, 0.25, 100, 2), trace(801, 0.25, 100, 1)];

  it('scales to the median trace and stacks every trace on the same amplitude scale', () => {
    expect(waterfallExtent(traces)).toEqual([0, 200]);
    const L = waterfallLayout(traces);
    expect(L.yRef).toBeCloseTo(2, 6);
    // Trace i's line k is drawn at its own value plus i·dy: the scale is the same for all.
    const [x0, y0] = drawnAt(traces, L, 0, 100);
    const [x2, y2] = drawnAt(traces, L, 2, 100);
    expect(x0).toBe(25);
    expect(y0).toBeCloseTo(3, 6);
    expect(x2 - x0).toBeCloseTo(2 * L.dx, 9);
    expect(y2 - 2 * L.dy).toBeCloseTo(1, 6);
  });

  it('reads the front peak when the pointer is on it, the one behind when over that', () => {
    const L = waterfallLayout(traces);
    const front = pickWaterfall(traces, L, 25, 1.5);
    expect(front).toEqual({ trace: 0, line: 100, x: 25, amplitude: 3 });
    // The oldest trace's peak sits at 25 Hz + 2·dx and 2·dy above; pointing just below its
    // top, past the front trace's peak, finds the oldest trace's line.
    const [x, y] = drawnAt(traces, L, 2, 100);
    const back = pickWaterfall(traces, L, x, y - 0.1);
    expect(back?.trace).toBe(2);
    expect(back?.line).toBe(100);
    expect(back?.amplitude).toBeCloseTo(1, 6);
  });

  it('snaps to the largest line within two lines, and never past the band drawn', () => {
    const L = waterfallLayout(traces);
    // Half a hertz off the peak (two lines) still lands on it.
    expect(pickWaterfall(traces, L, 25.5, 0.5)?.line).toBe(100);
    // Three lines off does not.
    expect(pickWaterfall(traces, L, 25.75, 0.005)?.line).not.toBe(100);
    const zoomed = waterfallLayout(traces, [50, 100]);
    expect(pickWaterfall(traces, zoomed, 20, 0.005)).toBeNull();
  });

  it('a flat, empty or clipped stack does not break the scale', () => {
    const flat = [{ values: new Float32Array(10), step: 1 }];
    const L = waterfallLayout(flat);
    expect(L.yRef).toBe(1);
    expect(Number.isFinite(L.dy)).toBe(true);
    // One clipped capture among five: the median, not the clipped one, sets the scale.
    const five = [1, 1, 1, 1, 60].map((a) => trace(11, 1, 5, a));
    expect(waterfallLayout(five).yRef).toBe(1);
  });

  it('states a line as Hz and order from the running speed (order = f / f1x, definition)', () => {
    // 1482 r/min = 24.7 Hz; 49.4 Hz is 2×.
    expect(hzAndOrder(49.4, 'hz', 1482 / 60)).toEqual({ hz: 49.4, order: expect.closeTo(2, 9) });
    expect(hzAndOrder(3, 'order', 24.7)).toEqual({ hz: expect.closeTo(74.1, 9), order: 3 });
    expect(hzAndOrder(49.4, 'hz', null)).toEqual({ hz: 49.4, order: null });
    expect(hzAndOrder(2, 'order', 0)).toEqual({ hz: null, order: 2 });
  });
});

describe('amplitude ticks of the waterfall (1-2-5 steps: common practice, no source)', () => {
  it('steps by 1, 2 or 5 × 10ⁿ up to the top, starting at 0', () => {
    expect(niceTicks(5.6)).toEqual([0, 2, 4]);
    expect(niceTicks(4)).toEqual([0, 1, 2, 3, 4]);
    expect(niceTicks(0.07)).toEqual([0, 0.02, 0.04, 0.06]);
    expect(niceTicks(0)).toEqual([0]);
  });
});
