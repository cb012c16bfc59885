// Alarm bench: a library of simulated healthy and failing points run through
// @turnstone/condition (evaluateSnapshot, the worker's own rules; projectTrend, the trend
// page's projection) with the default limit-set template of every machine type, for a
// simulated year at 4 and at 24 values a day. Prints one table; no pass/fail.
// Run: npx tsx tests/bench/alarm-bench.ts   (or npm run bench for every bench file)
//
// The projection's error is measured against when the median reaches the level the
// projection aims at (the level in force: a statistical level lies below the fixed one).
//
// Every value is drawn from a definition: a median path (flat, step, straight line,
// exponential, episodes) times log-normal scatter exp(s·z), z standard normal (vibration
// amplitudes scatter roughly log-normally; 15–30 % is common practice, no source). The random
// generator is seeded, so two runs print the same table.
import {
  evaluateSnapshot,
  levelsInForce,
  limitSetFromTemplate,
  MACHINE_TYPES,
  PROJECTION_WINDOW_DAYS,
  projectTrend,
  type BandDefinition,
  type MachineType,
  type PointState,
  type TrendPoint,
} from '@turnstone/condition';
import { mulberry32 } from '@turnstone/dsp/seeded-random';

const DAY = 86_400_000;
const YEAR_DAYS = 365;
const T0 = Date.UTC(2026, 0, 1);
const SEED = 20_816;

// ---------------------------------------------------------------- seeded randomness

/** Standard normal by Box–Muller (Box & Muller 1958). */
function normal(u: () => number): number {
  const u1 = 1 - u();
  return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u());
}

const between = (u: () => number, lo: number, hi: number) => lo + (hi - lo) * u();

// ---------------------------------------------------------------- the fault library

type Shape = 'healthy' | 'step' | 'linear' | 'accelerating' | 'intermittent' | 'at-level';

interface Scenario {
  shape: Shape;
  /** Median value at time t (days from the start). */
  median(t: number): number;
  /** Log-normal scatter s (ln units). */
  scatter: number;
  /**
   * Real exceedances: [from, to) days in which a raise is not false (a degrading fault's
   * window opens at its onset: a raise before the median crosses alert is an early warning).
   */
  exceedances: [number, number][];
  /** Fault onset (days), and when the median crosses alert and danger (days), if it does. */
  onset: number | null;
  alertCross: number | null;
  dangerCross: number | null;
}

function scenario(shape: Shape, band: BandDefinition, u: () => number): Scenario {
  const alert = band.alertLevel;
  const danger = band.dangerLevel;
  const healthy = between(u, 0.25, 0.5) * alert;
  const scatter = between(u, 0.15, 0.3);
  const base = { shape, scatter };
  switch (shape) {
    case 'healthy':
      return {
        ...base,
        median: () => healthy,
        exceedances: [],
        onset: null,
        alertCross: null,
        dangerCross: null,
      };
    case 'step': {
      const at = between(u, 60, 300);
      return {
        ...base,
        median: (t) => (t < at ? healthy : 1.5 * alert),
        exceedances: [[at, YEAR_DAYS]],
        onset: at,
        alertCross: at,
        dangerCross: 1.5 * alert >= danger ? at : null,
      };
    }
    case 'linear':
    case 'accelerating': {
      const onset = between(u, 60, 200);
      const toAlert = between(u, 20, 120); // days from onset to the alert crossing
      const top = 1.2 * danger;
      let median: (t: number) => number;
      let dangerCross: number;
      if (shape === 'linear') {
        const slope = (alert - healthy) / toAlert;
        dangerCross = onset + (danger - healthy) / slope;
        median = (t) => (t < onset ? healthy : Math.min(top, healthy + slope * (t - onset)));
      } else {
        const rate = Math.log(alert / healthy) / toAlert;
        dangerCross = onset + Math.log(danger / healthy) / rate;
        median = (t) =>
          t < onset ? healthy : Math.min(top, healthy * Math.exp(rate * (t - onset)));
      }
      return {
        ...base,
        median,
        exceedances: [[onset, YEAR_DAYS]],
        onset,
        alertCross: onset + toAlert,
        dangerCross,
      };
    }
    case 'intermittent': {
      // a loose part or a process upset: 1–3 days at 1.4 × alert, every 3–6 weeks
      const episodes: [number, number][] = [];
      for (let t = between(u, 45, 70); t < YEAR_DAYS - 5; t += between(u, 21, 42)) {
        episodes.push([t, t + between(u, 1, 3)]);
      }
      return {
        ...base,
        median: (t) => (episodes.some(([a, b]) => t >= a && t < b) ? 1.4 * alert : healthy),
        exceedances: episodes,
        onset: null,
        alertCross: null,
        dangerCross: null,
      };
    }
    case 'at-level':
      // a value sitting at the alert level ± 8 %, uniform (one real exceedance all year)
      return {
        ...base,
        scatter: 0,
        median: () => alert * between(u, 0.92, 1.08),
        exceedances: [[0, YEAR_DAYS]],
        onset: null,
        alertCross: null,
        dangerCross: null,
      };
  }
}

// ---------------------------------------------------------------- one point-year

interface PointResult {
  raises: number;
  /** Raises outside every real exceedance (and its clearing tail of 2 days). */
  falseRaises: number;
  /** Real exceedances in the year. */
  exceedances: number;
  /** Delay of the first raise after each exceedance began, values and days. */
  delays: { values: number; days: number }[];
  /** Projection error as a fraction of the remaining time (null when no projection). */
  atFirstAlert: number | null;
  atQuarter: number | null;
}

function relativeError(
  trend: TrendPoint[],
  levels: { alertLevel: number; dangerLevel: number },
  nowDay: number,
  trueCross: (value: number) => number | null,
): number | null {
  const p = projectTrend(trend, levels);
  if (p.target === null) return null;
  const truth = trueCross(p.target.value);
  if (truth === null || truth <= nowDay) return null;
  const remaining = truth - nowDay;
  if (p.crossingAt === null) return Number.POSITIVE_INFINITY; // no forecast: a miss
  const projected = (p.crossingAt - T0) / DAY;
  return (projected - truth) / remaining;
}

function runPoint(band: BandDefinition, s: Scenario, perDay: number, u: () => number) {
  const bands = [band];
  let state: PointState = {};
  const n = YEAR_DAYS * perDay;
  const trend: TrendPoint[] = [];
  const result: PointResult = {
    raises: 0,
    falseRaises: 0,
    exceedances: s.exceedances.length,
    delays: [],
    atFirstAlert: null,
    atQuarter: null,
  };
  const pending = s.exceedances.map(([from, to]) => ({ from, to, detected: false }));
  let quarterDone = false;
  const quarterDay =
    s.onset !== null && s.alertCross !== null ? s.onset + 0.25 * (s.alertCross - s.onset) : null;
  // when the median first reaches a level in force (a statistical level lies below the
  // fixed one, so its crossing comes earlier), searched in steps of 0.01 day from the onset
  const trueCross = (value: number) => {
    if (s.onset === null) return null;
    for (let t = s.onset; t < 2 * YEAR_DAYS; t += 0.01) if (s.median(t) >= value) return t;
    return null;
  };
  const window = (nowDay: number) =>
    trend.filter((p) => p.takenAt >= T0 + (nowDay - PROJECTION_WINDOW_DAYS) * DAY);

  for (let i = 0; i < n; i++) {
    const day = i / perDay;
    const takenAt = T0 + Math.round(day * DAY);
    const value = s.median(day) * Math.exp(s.scatter * normal(u));
    trend.push({ takenAt, value });
    const r = evaluateSnapshot(bands, state, {
      takenAt,
      quality: 'ok',
      values: { [band.key]: value },
    });
    state = r.state;
    if (quarterDay !== null && !quarterDone && day >= quarterDay) {
      // once, at the first value on or after the quarter (a null answer is not retried)
      quarterDone = true;
      const levels = levelsInForce(band, state[band.key]?.band ?? null);
      result.atQuarter = relativeError(window(day), levels, day, trueCross);
    }
    for (const c of r.changes) {
      if (c.kind !== 'raised') continue;
      result.raises++;
      const episode = pending.find((e) => day >= e.from && day < e.to + 2);
      if (episode === undefined) result.falseRaises++;
      else if (!episode.detected) {
        episode.detected = true;
        const from = s.alertCross ?? episode.from;
        result.delays.push({
          values: i - Math.ceil(from * perDay) + 1,
          days: day - from,
        });
      }
      if (result.raises === 1 && s.dangerCross !== null && s.shape !== 'step') {
        const levels = levelsInForce(band, state[band.key]?.band ?? null);
        result.atFirstAlert = relativeError(window(day), levels, day, trueCross);
      }
    }
  }
  return result;
}

// ---------------------------------------------------------------- the table

const median = (xs: number[]) => {
  if (xs.length === 0) return Number.NaN;
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};
const fmt = (x: number, digits = 2) =>
  Number.isFinite(x) ? x.toFixed(digits) : Number.isNaN(x) ? '–' : 'miss';

const pct = (x: number) => (Number.isFinite(x) ? `${Math.round(100 * x)} %` : 'miss');

type Config = 'template' | 'template + 3σ rule';

function withConfig(band: BandDefinition, config: Config): BandDefinition {
  if (config === 'template') return band;
  // what an engineer adds: a 3σ level from a baseline of the first 30 values
  return { ...band, statistical: { kAlert: 3, baseline: { from: 'first-n', count: 30 } } };
}

/**
 * The bands of every machine type's default template (group 2, rigid, 1480 r/min), one of
 * each kind of levels and rules: bands that differ only in name or place in the spectrum
 * behave alike here, so each is run once.
 */
function templateBands(): BandDefinition[] {
  const seen = new Map<string, BandDefinition>();
  for (const type of MACHINE_TYPES as readonly MachineType[]) {
    const set = limitSetFromTemplate({ type, isoGroup: 2, foundation: 'rigid', nominalRpm: 1480 });
    for (const b of set.bands) {
      const key = JSON.stringify([b.alertLevel, b.dangerLevel, b.persistence, b.hysteresis]);
      if (!seen.has(key)) seen.set(key, b);
    }
  }
  return [...seen.values()];
}

const SHAPES: Shape[] = ['healthy', 'step', 'linear', 'accelerating', 'intermittent', 'at-level'];

function run() {
  const started = performance.now();
  const rows: string[][] = [];
  for (const config of ['template', 'template + 3σ rule'] as Config[]) {
    for (const perDay of [4, 24]) {
      const u = mulberry32(SEED + perDay);
      const by = new Map<Shape, PointResult[]>();
      for (const template of templateBands()) {
        const band = withConfig(template, config);
        for (const shape of SHAPES) {
          const list = by.get(shape) ?? [];
          const reps = (shape === 'healthy' ? 8 : 3) / (perDay === 24 ? 2 : 1);
          for (let k = 0; k < reps; k++) {
            list.push(runPoint(band, scenario(shape, band, u), perDay, u));
          }
          by.set(shape, list);
        }
      }
      for (const shape of SHAPES) {
        const list = by.get(shape)!;
        const points = list.length;
        const raises = list.reduce((a, r) => a + r.raises, 0);
        const falses = list.reduce((a, r) => a + r.falseRaises, 0);
        const exceedances = list.reduce((a, r) => a + r.exceedances, 0);
        const delays = list.flatMap((r) => r.delays);
        const missed = exceedances - delays.length;
        const errs = (pick: (r: PointResult) => number | null) =>
          list.map(pick).filter((e): e is number => e !== null);
        const within = (es: number[]) =>
          es.length
            ? `${Math.round((100 * es.filter((e) => Math.abs(e) <= 0.3).length) / es.length)} %`
            : '–';
        const q = errs((r) => r.atQuarter);
        const f = errs((r) => r.atFirstAlert);
        rows.push([
          config,
          String(perDay),
          shape,
          String(points),
          fmt(falses / points),
          fmt(raises / points),
          exceedances ? fmt(raises / exceedances) : '–',
          delays.length
            ? `${fmt(median(delays.map((d) => d.values)), 1)} / ${fmt(median(delays.map((d) => d.days)), 1)} d`
            : '–',
          String(missed),
          f.length ? `${pct(median(f.map(Math.abs)))} (${within(f)})` : '–',
          q.length ? `${pct(median(q.map(Math.abs)))} (${within(q)})` : '–',
        ]);
      }
    }
  }
  const head = [
    'levels',
    '/day',
    'shape',
    'points',
    'false/pt-yr',
    'raises/pt-yr',
    'raises/exceed.',
    'median delay (values / days)',
    'missed',
    'proj. err at 1st alert (≤30 %)',
    'proj. err at ¼ course (≤30 %)',
  ];
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)));
  const line = (cells: string[]) => cells.map((c, i) => c.padEnd(widths[i]!)).join(' | ');
  console.log(line(head));
  console.log(widths.map((w) => '-'.repeat(w)).join('-|-'));
  for (const r of rows) console.log(line(r));
  console.log(
    `\nfalse = raises outside a real exceedance; raises/exceed. = raise/clear cycles per real exceedance;` +
      `\ndelay from the start of the exceedance (step: the step; linear/accelerating: the median crossing alert);` +
      `\nprojection error = (projected − true crossing) / time remaining, median |error| and share within ±30 %` +
      `\n(no forecast counts as a miss). Targets: false ≤ 0.2, cycles ≤ 1 per exceedance, step ≤ 2 values,` +
      `\nprojection within ±30 % from ¼ of the course. ${((performance.now() - started) / 1000).toFixed(1)} s, seed ${SEED}.`,
  );
}

run();
