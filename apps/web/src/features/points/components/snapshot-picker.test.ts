import { describe, expect, it } from 'vitest';
import type { AnalysisSummary } from '@turnstone/contracts/points';
import { snapshotLabel } from './snapshot-picker.tsx';

// The picker names the band of the velocity it shows (the band label's one home,
// @turnstone/contracts/band-label); common practice, no source.
const analysis = {
  id: 1,
  takenAt: '2026-03-10T12:00:00Z',
  verdict: 'ok',
  overall: { velocityRmsMmS: 4.6, velocityBandHz: [10, 1000], accelBandHz: [10, 4000] },
} as unknown as AnalysisSummary;

describe('snapshotLabel', () => {
  it('when a capture has its band recorded, the label names it beside the velocity', () => {
    expect(snapshotLabel(analysis)).toMatch(/ · 4\.60 mm\/s \(10–1000 Hz\) · OK$/);
  });

  it('a capture whose spectra retention thinned is marked as values only', () => {
    expect(snapshotLabel({ ...analysis, spectraThinned: true })).toMatch(/ · OK · values only$/);
    expect(snapshotLabel({ ...analysis, spectraThinned: false })).toMatch(/ · OK$/);
  });

  it('when an older capture has no band, the label says so', () => {
    const old = { ...analysis, overall: { ...analysis.overall, velocityBandHz: null } };
    expect(snapshotLabel(old as AnalysisSummary)).toContain('4.60 mm/s (band not recorded)');
  });
});
