import { describe, expect, it } from 'vitest';
import { openingWindow, xExtent, zoomedExtent } from './zoom-keys.tsx';

// The zoom status line's arithmetic: per cent of the x axis ↔ axis values (linear axis;
// common practice, no source).
describe('the window a chart opens on', () => {
  it('when the option sets no window, it is the whole range', () => {
    expect(openingWindow({ xAxis: { type: 'value', min: 0, max: 10 } })).toEqual({
      start: 0,
      end: 100,
    });
    expect(
      openingWindow({ xAxis: { type: 'value', min: 0, max: 10 }, dataZoom: [{ type: 'inside' }] }),
    ).toEqual({ start: 0, end: 100 });
  });

  it('when the first dataZoom opens on values (a hint’s evidence: 0–200 Hz of 0–5000 Hz), they become per cent of its axis', () => {
    const w = openingWindow({
      xAxis: { type: 'value', min: 0, max: 5000 },
      dataZoom: [{ type: 'inside', xAxisIndex: 0, startValue: 0, endValue: 200 }],
    });
    expect(w.start).toBe(0);
    expect(w.end).toBeCloseTo(4, 12);
  });

  it('when the dataZoom works on a second axis (the waterfall’s hidden front-trace axis), that axis counts', () => {
    const w = openingWindow({
      xAxis: [
        { type: 'value', min: 0, max: 6250 },
        { type: 'value', min: 1000, max: 5000 },
      ],
      dataZoom: [{ type: 'slider', xAxisIndex: 1, startValue: 2000, endValue: 6000 }],
    });
    expect(w).toEqual({ start: 25, end: 100 });
  });

  it('when it opens on per cent, those are kept', () => {
    expect(
      openingWindow({
        xAxis: { type: 'value' },
        dataZoom: [{ type: 'inside', start: 10, end: 30 }],
      }),
    ).toEqual({ start: 10, end: 30 });
  });
});

describe('the window in axis values', () => {
  it('when 25–75 % of a 2.5–802.5 ms axis is shown, that is 202.5–602.5 ms', () => {
    const extent = xExtent({ xAxis: { type: 'value', min: 2.5, max: 802.5 } })!;
    expect(extent).toEqual([2.5, 802.5]);
    expect(zoomedExtent(extent, { start: 25, end: 75 })).toEqual([202.5, 602.5]);
  });

  it('when the axis has no fixed min and max, there is no extent to state', () => {
    expect(xExtent({ xAxis: { type: 'value' } })).toBeUndefined();
  });
});
