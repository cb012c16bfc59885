/**
 * The weekly review in a reader's unit system: every band value (means, changes, latest and
 * target values, limits, last and peak values) converted from the stored metric units, and
 * each row's unit named accordingly (mm/s → in/s, um → mil). The Review screen and the
 * server's ZIP export both read the review through it.
 */
import type { WeeklyReview } from './review.ts';
import { displayUnit, toDisplay, type UnitSystem } from './units.ts';

export function reviewInUnits(r: WeeklyReview, system: UnitSystem): WeeklyReview {
  if (system === 'metric') return r;
  const v = (x: number, unit: string) => toDisplay(x, unit, system);
  const u = (unit: string) => displayUnit(unit, system);
  return {
    ...r,
    movers: r.movers.map((m) => ({
      ...m,
      unit: u(m.unit),
      lastWeekMean: v(m.lastWeekMean, m.unit),
      thisWeekMean: v(m.thisWeekMean, m.unit),
      change: v(m.change, m.unit),
    })),
    forecasts: r.forecasts.map((f) => ({
      ...f,
      unit: u(f.unit),
      latestValue: v(f.latestValue, f.unit),
      target: { ...f.target, value: v(f.target.value, f.unit) },
    })),
    openAlerts: r.openAlerts.map((a) => ({
      ...a,
      unit: u(a.unit),
      limitValue: v(a.limitValue, a.unit),
      lastValue: v(a.lastValue, a.unit),
      peakValue: v(a.peakValue, a.unit),
    })),
  };
}
