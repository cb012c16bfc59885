/**
 * The tiered retention policy written out plainly in JavaScript, capture by capture, from
 * its definition in apps/server/src/features/worker/retention.ts (common practice, no
 * source): the reference the SQL passes are compared with. It shares no code with them.
 */

const DAY = 86_400_000;
const HOUR = 3_600_000;

export interface RefCapture {
  id: number;
  pointId: number;
  /** ms since the epoch */
  takenAt: number;
  upload: boolean;
  pinned: boolean;
  /** A `suspect` quality notice refers to it. */
  suspect: boolean;
}

/** Times (ms) of a point's markers. */
export interface RefMarker {
  pointId: number;
  at: number;
}

export interface RefMarkers {
  /** Alert events of the point's alerts (raised, escalated, acknowledged, cleared). */
  alertEvents: RefMarker[];
  alertPeaks: RefMarker[];
  findings: RefMarker[];
  /** Limit changes (audit log entries and limit sets' updates). */
  limitChanges: RefMarker[];
}

export interface RefPolicy {
  spectraWholeDays: number;
  spectraHourlyDays: number;
  keepWindowMinutes: number;
}

const floorTo = (t: number, size: number) => Math.floor(t / size) * size;
const byTime = (a: RefCapture, b: RefCapture) => a.takenAt - b.takenAt || a.id - b.id;

/** The captures kept whole whatever their age: markers and the first after a limit change. */
export function protectedIds(captures: RefCapture[], m: RefMarkers, win: number): Set<number> {
  const out = new Set<number>();
  const w = win * 60_000;
  const near = (list: RefMarker[], c: RefCapture) =>
    list.some((e) => e.pointId === c.pointId && Math.abs(e.at - c.takenAt) <= w);
  for (const c of captures) {
    if (c.upload || c.pinned || c.suspect) out.add(c.id);
    if (near(m.alertEvents, c) || near(m.findings, c)) out.add(c.id);
    if (m.alertPeaks.some((p) => p.pointId === c.pointId && p.at === c.takenAt)) out.add(c.id);
  }
  for (const l of m.limitChanges) {
    const first = captures
      .filter((c) => c.pointId === l.pointId && c.takenAt >= l.at)
      .sort(byTime)[0];
    if (first) out.add(first.id);
  }
  return out;
}

/** The ids that keep their spectra after a thinning pass at `now`. */
export function keptSpectra(
  captures: RefCapture[],
  m: RefMarkers,
  policy: RefPolicy,
  now: number,
): Set<number> {
  const wholeCutoff = now - policy.spectraWholeDays * DAY;
  const dailyCutoff = floorTo(
    now - Math.max(policy.spectraHourlyDays, policy.spectraWholeDays) * DAY,
    DAY,
  );
  const kept = protectedIds(captures, m, policy.keepWindowMinutes);
  const seen = new Set<string>();
  for (const c of [...captures].sort(byTime)) {
    const bucket = floorTo(c.takenAt, c.takenAt < dailyCutoff ? DAY : HOUR);
    const key = `${c.pointId}/${bucket}`;
    if (c.takenAt >= wholeCutoff || !seen.has(key)) kept.add(c.id);
    seen.add(key);
  }
  return kept;
}
