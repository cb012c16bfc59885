import { describe, expect, it } from 'vitest';
import type { BandDefinition } from './band-definition.ts';
import { DIAGNOSIS_BASELINE_MARGIN, diagnosisSeverity } from './diagnosis-severity.ts';
import { ISO_20816_3_ZONE_BOUNDARIES } from './iso-zones.ts';
import { overallVelocity } from './test-bands.ts';

// Levels are round numbers (common practice, no source); the fallback is the ISO 20816-3
// zone A/B boundary as tabulated in iso-zones.ts.
const overall = overallVelocity(4.5, 7.1);
const oneX: BandDefinition = {
  key: 'order-1x',
  name: '1×',
  kind: 'order',
  fromOrder: 0.9,
  toOrder: 1.1,
  spectrum: 'velocity',
  measure: 'rms',
  unit: 'mm/s',
  alertLevel: 3,
  dangerLevel: 5,
};
const machine = { isoGroup: 2 as const, foundation: 'rigid' as const };

describe('diagnosisSeverity', () => {
  it("uses the point's overall velocity alert level when there is no baseline", () => {
    const s = diagnosisSeverity([oneX, overall], null, machine);
    expect(s.severityMmS).toBe(4.5);
    expect(s.source).toMatch(/fixed alert level of "Overall velocity"/);
  });

  it('uses the baseline mean × the margin when that is lower than the alert level', () => {
    const band: BandDefinition = {
      ...overall,
      statistical: {
        kAlert: 3,
        baseline: { from: 'first-n', count: 30 },
        established: { count: 30, mean: 1.2, sigma: 0.4, logMean: Math.log(1.2), logSigma: 0.3 },
      },
    };
    // Statistical alert = min(4.5, 1.2·e^(3·0.3)) = 2.95 (hand arithmetic); 2 × 1.2 = 2.4 is lower.
    const s = diagnosisSeverity([band], null, machine);
    expect(s.severityMmS).toBeCloseTo(DIAGNOSIS_BASELINE_MARGIN * 1.2, 12);
    expect(s.source).toMatch(/baseline mean/);
  });

  it('keeps the alert level when the baseline by its margin lies above it', () => {
    const band: BandDefinition = {
      ...overall,
      alertLevel: 2,
      dangerLevel: 7,
      statistical: {
        kAlert: 3,
        combine: 'max',
        baseline: { from: 'first-n', count: 30 },
        established: { count: 30, mean: 1.5, sigma: 0.1, logMean: Math.log(1.5), logSigma: 0.05 },
      },
    };
    // Statistical alert = max(2, 1.5·e^(3·0.1)) = 2.0248 (log-σ floored at LOG_SIGMA_FLOOR
    // 0.1; hand arithmetic); baseline × 2 = 3 lies above: the alert level in force governs.
    const s = diagnosisSeverity([band], null, machine);
    expect(s.severityMmS).toBeCloseTo(1.5 * Math.exp(0.3), 12);
    expect(s.source).toMatch(/statistical alert level/);
  });

  it('falls back to the ISO 20816-3 zone A/B boundary without an overall velocity band', () => {
    const s = diagnosisSeverity([oneX], null, { isoGroup: 1, foundation: 'flexible' });
    const b = ISO_20816_3_ZONE_BOUNDARIES[1].flexible;
    expect(s.severityMmS).toBe(b.ab);
    expect(s.source).toMatch(/ISO 20816-3/);
  });
});
