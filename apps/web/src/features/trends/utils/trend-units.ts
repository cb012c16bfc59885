import type { TrendResponse } from '@turnstone/contracts/trend';
import { displayUnit } from '@turnstone/contracts/units';
import type { Units } from '../../account/api/use-units.ts';

/**
 * A trend answer (stored metric) in the user's unit system: values, levels, baseline, the
 * projection's target, limit changes and uploads all scale by the same factor; the band names its shown unit.
 */
export function trendInUnits(d: TrendResponse, units: Units): TrendResponse {
  const unit = d.band.unit;
  if (units.value(1, unit) === 1) return d;
  const v = (x: number) => units.value(x, unit);
  const p = d.projection;
  const levels = <L extends { alert: number; danger: number } | null>(l: L): L =>
    l && { ...l, alert: v(l.alert), danger: v(l.danger) };
  return {
    ...d,
    band: { ...d.band, unit: displayUnit(unit, units.system) },
    items: d.items.map((i) => ({ ...i, v: v(i.v) })),
    levels: { ...d.levels, alert: v(d.levels.alert), danger: v(d.levels.danger) },
    baseline: d.baseline
      ? { ...d.baseline, mean: v(d.baseline.mean), sigma: v(d.baseline.sigma) }
      : null,
    projection: p.target ? { ...p, target: { ...p.target, value: v(p.target.value) } } : p,
    limitChanges: d.limitChanges.map((c) => ({
      ...c,
      before: levels(c.before),
      after: levels(c.after),
    })),
    uploads: d.uploads.map((u) => ({ ...u, v: v(u.v) })),
  };
}

const converted = new WeakMap<TrendResponse, Map<string, TrendResponse>>();

/** {@link trendInUnits}, the same object for the same answer and unit system. */
export function inUnits(d: TrendResponse, units: Units): TrendResponse {
  let bySystem = converted.get(d);
  if (!bySystem) converted.set(d, (bySystem = new Map()));
  let out = bySystem.get(units.system);
  if (!out) bySystem.set(units.system, (out = trendInUnits(d, units)));
  return out;
}
