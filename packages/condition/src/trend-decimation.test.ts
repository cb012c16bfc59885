import { describe, expect, it } from 'vitest';
import {
  decimateSpans,
  decimateTrend,
  HOUR_MS,
  TREND_MAX_BUCKETS,
  trendBuckets,
  type TrendSpan,
} from './trend-decimation.ts';
import { mulberry32 } from '@turnstone/dsp/seeded-random';

// The checks follow from the definition of min/max bucket aggregation (Jugel et al., "M4: a
// visualization-oriented time series data aggregation", PVLDB 7(10), 2014): every bucket's
// extremes survive, nothing else is invented, order is kept. The reference below groups by
// bucket independently (a Map over the bucket index), not with the code under test.

const DAY = 86_400_000;

/** A year of values every 10 minutes with log-normal scatter and one short burst. */
function yearOfValues(seed: number) {
  const r = mulberry32(seed); // seeded, so a failure repeats
  const from = Date.UTC(2026, 0, 1);
  const items: { t: number; v: number; id: number }[] = [];
  for (let i = 0, t = from; t < from + 365 * DAY; i++, t += 600_000) {
    const burst = i >= 30_000 && i < 30_003 ? 8 : 1;
    items.push({ t, v: 2 * Math.exp(0.25 * (r() + r() + r() - 1.5)) * burst, id: i });
  }
  return { from, to: from + 365 * DAY, items };
}

describe('decimateTrend', () => {
  it('keeps every bucket’s lowest and highest value, in time order, and nothing else', () => {
    const { from, to, items } = yearOfValues(7);
    const { items: out, decimation } = decimateTrend(items, { from, to });
    // 8,760 h / 300 buckets = 29.2 h, rounded up to whole hours (our rule: buckets of an hour
    // or more are whole UTC hours, so stored hour summaries can fill them)
    expect(decimation).toEqual({ total: items.length, bucketMs: 30 * HOUR_MS });
    const bucketMs = decimation!.bucketMs;
    const byBucket = new Map<number, { min: number; max: number }>();
    for (const x of items) {
      const b = Math.floor((x.t - from) / bucketMs);
      const m = byBucket.get(b) ?? { min: Infinity, max: -Infinity };
      byBucket.set(b, { min: Math.min(m.min, x.v), max: Math.max(m.max, x.v) });
    }
    const outBy = new Map<number, number[]>();
    for (const x of out) {
      const b = Math.floor((x.t - from) / bucketMs);
      outBy.set(b, [...(outBy.get(b) ?? []), x.v]);
    }
    for (const [b, m] of byBucket) {
      expect(Math.min(...outBy.get(b)!)).toBe(m.min);
      expect(Math.max(...outBy.get(b)!)).toBe(m.max);
    }
    // A subset of the input, oldest first, with at most two values a bucket (+ first/last).
    for (let i = 1; i < out.length; i++) expect(out[i]!.id).toBeGreaterThan(out[i - 1]!.id);
    expect(out.length).toBeLessThanOrEqual(2 * TREND_MAX_BUCKETS + 2);
    expect(out[0]).toBe(items[0]);
    expect(out.at(-1)).toBe(items.at(-1));
    // The three-value burst's peak is drawn at its own time.
    const peak = items.reduce((a, b) => (b.v > a.v ? b : a));
    expect(out).toContain(peak);
  });

  it('keeps the values it is told to keep, whatever their bucket', () => {
    const { from, to, items } = yearOfValues(11);
    const keep = new Set([1234, 40_000, items.length - 2]);
    const { items: out } = decimateTrend(items, { from, to, keep });
    for (const i of keep) expect(out).toContain(items[i]);
  });

  it('answers a short trend as it is', () => {
    const items = Array.from({ length: 2 * TREND_MAX_BUCKETS }, (_, i) => ({ t: i * 1000, v: i }));
    const r = decimateTrend(items, { from: 0, to: items.length * 1000 });
    expect(r.decimation).toBeNull();
    expect(r.items).toEqual(items);
    expect(decimateTrend([], { from: 0, to: 1 })).toEqual({ items: [], decimation: null });
  });

  it('buckets of an hour or more are whole UTC hours from a UTC hour', () => {
    const from = Date.UTC(2026, 2, 29, 0, 17, 3, 5);
    expect(trendBuckets(from, from + 365 * DAY)).toEqual({
      origin: Date.UTC(2026, 2, 29, 0),
      bucketMs: 30 * HOUR_MS,
    });
    // narrower than an hour: from `from`, as wide as 300 buckets need
    expect(trendBuckets(from, from + 5 * DAY)).toEqual({
      origin: from,
      bucketMs: Math.ceil((5 * DAY + 1) / TREND_MAX_BUCKETS),
    });
  });
});

describe('decimateSpans', () => {
  it('gives from hour summaries what decimateTrend gives from every value', () => {
    const { items } = yearOfValues(5);
    // values to one decimal, so ties within an hour are common; a period starting mid-hour
    const tied = items.map((x) => ({ ...x, v: Math.round(x.v * 10) / 10 }));
    const from = tied[0]!.t + 1_234_567;
    const to = tied.at(-1)!.t - 2_345_678;
    const inside = tied.filter((x) => x.t >= from && x.t <= to);
    const keep = new Set([17, 9_000, 33_333]);
    const raw = decimateTrend(inside, { from, to, keep });
    // summaries grouped here: whole hours in the middle, single values in the partial hours
    const hStart = Math.ceil(from / HOUR_MS) * HOUR_MS;
    const hEnd = Math.floor((to + 1) / HOUR_MS) * HOUR_MS;
    const spans: TrendSpan<(typeof inside)[number]>[] = [];
    for (const x of inside) {
      const last = spans.at(-1);
      const whole = x.t >= hStart && x.t < hEnd;
      if (whole && last && Math.floor(last.lo.t / HOUR_MS) === Math.floor(x.t / HOUR_MS)) {
        last.n++;
        if (x.v < last.lo.v) last.lo = x;
        if (x.v > last.hi.v) last.hi = x;
      } else spans.push({ n: 1, lo: x, hi: x });
    }
    const fromSpans = decimateSpans(spans, {
      from,
      to,
      first: inside[0]!,
      last: inside.at(-1)!,
      keep: [...keep].map((i) => inside[i]!),
    });
    expect(fromSpans).toEqual(raw);
  });
});
