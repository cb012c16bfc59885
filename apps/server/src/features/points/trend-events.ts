/**
 * A band's limit changes as the trend marks them: from the audit record of the point's limit
 * set, the levels of that band before and after each change that touched it (added, removed,
 * levels changed, or a statistical baseline established), with who and why.
 */
import { effectiveLevels, type BandDefinition } from '@turnstone/condition';
import type { TrendResponse } from '@turnstone/contracts/trend';

export interface LimitChangeRow {
  at: Date;
  action: string;
  by: string | null;
  reason: string | null;
  before: unknown;
  after: unknown;
}

type Levels = { alert: number; danger: number; source: 'fixed' | 'statistical' };

/** The band `key` of an audited band list, with the levels it puts in force; null when absent. */
function levelsOf(list: unknown, key: string): Levels | null {
  if (!Array.isArray(list)) return null;
  const band = (list as { key?: unknown }[]).find((b) => b?.key === key) as
    BandDefinition | undefined;
  if (!band || typeof band.alertLevel !== 'number' || typeof band.dangerLevel !== 'number')
    return null;
  // The levels the band itself puts in force: fixed, or statistical once its baseline is
  // established on the rule (a baseline still being collected lives in the point's state).
  const l = effectiveLevels(band, null);
  return { alert: l.alertLevel, danger: l.dangerLevel, source: l.source };
}

const same = (a: Levels | null, b: Levels | null) =>
  a === b ||
  (a !== null &&
    b !== null &&
    a.alert === b.alert &&
    a.danger === b.danger &&
    a.source === b.source);

/** The changes of `rows` (oldest first) that touched band `key`, for the trend's markers. */
export function bandLimitChanges(
  rows: readonly LimitChangeRow[],
  key: string,
): TrendResponse['limitChanges'] {
  const out: TrendResponse['limitChanges'] = [];
  for (const r of rows) {
    const before = levelsOf(r.before, key);
    const after = levelsOf(r.after, key);
    if (same(before, after)) continue;
    out.push({
      t: r.at.toISOString(),
      kind:
        r.action === 'limits.baseline'
          ? 'baseline'
          : before === null
            ? 'added'
            : after === null
              ? 'removed'
              : 'changed',
      by: r.by ?? null,
      reason: r.reason ?? null,
      before,
      after,
    });
  }
  return out;
}
