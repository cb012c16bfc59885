/**
 * Rises of the weekly review: this week's mean against last week's per point and band, kept
 * only above the noise threshold, grouped by machine. Pure (no database): the service hands
 * in the daily means and the band facts.
 */
import type { ReviewMachineGroup, ReviewMover } from '@turnstone/contracts/review';
import type { Criticality, PointRef } from './review-repository.ts';
import { weekOfDay, type SiteWeek } from './review-weeks.ts';

/**
 * A rise is listed only when this week's mean is at least this fraction of the band's alert
 * level in force: below it the band reads its noise floor, where a large percentage means
 * nothing. Common practice, no source.
 */
export const MOVER_FLOOR_FRACTION = 0.1;

export interface NoiseThreshold {
  /** This week's mean at least this many % above last week's. */
  minChangePercent: number;
  /** At least this many values in each of the two weeks. */
  minValues: number;
}

export interface DailyMean {
  pointId: number;
  bandKey: string;
  day: string;
  v: number;
  n: number;
}

interface BandFacts {
  name: string;
  unit: string;
  alertLevel: number;
}

const CRITICALITY_RANK: Record<Criticality, number> = { high: 0, medium: 1, low: 2 };
const pctOrInf = (p: number | null) => p ?? Number.POSITIVE_INFINITY;

export function weeklyMovers(
  daily: DailyMean[],
  refs: Map<number, PointRef & { criticality: Criticality }>,
  weekOfSite: Map<number, SiteWeek>,
  bandOf: (pointId: number, bandKey: string) => BandFacts | undefined,
  noise: NoiseThreshold,
): { movers: ReviewMover[]; groups: ReviewMachineGroup[]; belowThreshold: number } {
  const weekly = new Map<
    string,
    { pointId: number; bandKey: string; ts: number; tn: number; ls: number; ln: number }
  >();
  for (const d of daily) {
    const ref = refs.get(d.pointId);
    const w = ref && weekOfSite.get(ref.siteId);
    const which = w ? weekOfDay(w, d.day) : null;
    if (!which) continue;
    const id = `${d.pointId}|${d.bandKey}`;
    let m = weekly.get(id);
    if (!m)
      weekly.set(id, (m = { pointId: d.pointId, bandKey: d.bandKey, ts: 0, tn: 0, ls: 0, ln: 0 }));
    if (which === 'this') {
      m.ts += d.v * d.n;
      m.tn += d.n;
    } else {
      m.ls += d.v * d.n;
      m.ln += d.n;
    }
  }

  const movers: ReviewMover[] = [];
  let belowThreshold = 0;
  for (const m of weekly.values()) {
    const ref = refs.get(m.pointId);
    if (!ref || m.tn === 0 || m.ln === 0) continue;
    const thisMean = m.ts / m.tn;
    const lastMean = m.ls / m.ln;
    const change = thisMean - lastMean;
    if (!(change > 0)) continue;
    const band = bandOf(m.pointId, m.bandKey);
    if (band && thisMean < MOVER_FLOOR_FRACTION * band.alertLevel) continue;
    const changePercent = lastMean > 0 ? (100 * change) / lastMean : null;
    if (
      m.tn < noise.minValues ||
      m.ln < noise.minValues ||
      (changePercent !== null && changePercent < noise.minChangePercent)
    ) {
      belowThreshold++;
      continue;
    }
    const { criticality: _c, ...pointRef } = ref;
    movers.push({
      ...pointRef,
      bandKey: m.bandKey,
      bandName: band?.name ?? m.bandKey,
      unit: band?.unit ?? '',
      lastWeekMean: lastMean,
      thisWeekMean: thisMean,
      lastWeekCount: m.ln,
      thisWeekCount: m.tn,
      change,
      changePercent,
    });
  }

  const groups = new Map<number, ReviewMachineGroup>();
  for (const m of movers) {
    const g = groups.get(m.machineId);
    if (!g)
      groups.set(m.machineId, {
        machineId: m.machineId,
        machineName: m.machineName,
        siteCode: m.siteCode,
        criticality: refs.get(m.pointId)!.criticality,
        movers: 1,
        worstChangePercent: m.changePercent,
      });
    else {
      g.movers++;
      if (pctOrInf(m.changePercent) > pctOrInf(g.worstChangePercent))
        g.worstChangePercent = m.changePercent;
    }
  }
  // Machines: most critical first, then by their worst rise; bands: worst rise first.
  const ordered = [...groups.values()].sort(
    (a, b) =>
      CRITICALITY_RANK[a.criticality] - CRITICALITY_RANK[b.criticality] ||
      pctOrInf(b.worstChangePercent) - pctOrInf(a.worstChangePercent) ||
      a.machineName.localeCompare(b.machineName),
  );
  const rank = new Map(ordered.map((g, i) => [g.machineId, i]));
  movers.sort(
    (a, b) =>
      rank.get(a.machineId)! - rank.get(b.machineId)! ||
      pctOrInf(b.changePercent) - pctOrInf(a.changePercent) ||
      b.change - a.change,
  );
  return { movers, groups: ordered, belowThreshold };
}
