import type { AnalysisSummary } from '@turnstone/contracts/points';

/** Captures with a tach carry their 1× and 2× vectors. */
export function hasVectors(analyses: readonly AnalysisSummary[]): boolean {
  return analyses.some((a) => (a.shaftVectors?.length ?? 0) > 0);
}
