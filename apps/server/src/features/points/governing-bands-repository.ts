/** The band each point's state is governed by: its worst open alert (danger first, then furthest over its level). */
import { and, asc, inArray } from 'drizzle-orm';
import type { Db, Tx } from '@turnstone/db/client';
import { alerts } from '@turnstone/db/schema';

/**
 * The band of each point's worst open alert: danger before alert, then the one furthest over
 * its level (latest value ÷ level exceeded); a point without an open alert is absent.
 */
export async function openAlertBands(db: Db | Tx, pointIds: number[]) {
  const out = new Map<
    number,
    { bandKey: string; bandName: string; unit: string; level: 'alert' | 'danger' }
  >();
  if (pointIds.length === 0) return out;
  const rows = await db
    .select({
      pointId: alerts.pointId,
      bandKey: alerts.bandKey,
      bandName: alerts.bandName,
      unit: alerts.unit,
      level: alerts.level,
      value: alerts.lastValue,
      limit: alerts.limitValue,
    })
    .from(alerts)
    .where(
      and(inArray(alerts.pointId, pointIds), inArray(alerts.state, ['raised', 'acknowledged'])),
    )
    .orderBy(asc(alerts.id));
  const over = (r: { value: number; limit: number }) => (r.limit > 0 ? r.value / r.limit : 0);
  const worse = (a: (typeof rows)[number], b: (typeof rows)[number]) =>
    a.level !== b.level ? a.level === 'danger' : over(a) > over(b);
  const best = new Map<number, (typeof rows)[number]>();
  for (const r of rows) {
    const had = best.get(r.pointId);
    if (!had || worse(r, had)) best.set(r.pointId, r);
  }
  for (const [id, r] of best)
    out.set(id, { bandKey: r.bandKey, bandName: r.bandName, unit: r.unit, level: r.level });
  return out;
}
