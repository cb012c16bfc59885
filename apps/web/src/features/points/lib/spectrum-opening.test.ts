import { describe, expect, it } from 'vitest';
import type { AnalysisSummary } from '@turnstone/contracts/points';
import { latestUsable, openingAnalysisId } from './spectrum-opening.ts';
import { kindFor } from './spectrum-view.ts';

// Only the fields the choice reads; the rest of a summary does not take part.
const a = (id: number, verdict: AnalysisSummary['verdict']) =>
  ({ id, verdict }) as unknown as AnalysisSummary;

describe('the spectrum the view opens on (asked for before it opens)', () => {
  // Common practice, no source: the views open on the newest capture fit to read.
  it('is the newest usable capture, passing over unusable ones (a suspect one is usable)', () => {
    expect(openingAnalysisId([a(9, 'unusable'), a(8, 'suspect'), a(7, 'ok')])).toBe(8);
    expect(openingAnalysisId([a(9, 'ok'), a(8, 'unusable')])).toBe(9);
  });

  it('is the newest capture when none is usable, and none without captures', () => {
    expect(openingAnalysisId([a(5, 'unusable'), a(4, 'unusable')])).toBe(5);
    expect(openingAnalysisId([])).toBeNull();
  });

  it('is known from the point alone when its latest capture is usable, as the list would open', () => {
    const list = [a(9, 'suspect'), a(8, 'ok')];
    const early = latestUsable({ latest: list[0]! });
    expect(early).toEqual([list[0]]);
    expect(openingAnalysisId(early!)).toBe(openingAnalysisId(list));
    // An unusable latest capture: where the view opens depends on the older ones (the list).
    expect(latestUsable({ latest: a(9, 'unusable') })).toBeNull();
    expect(latestUsable({ latest: null })).toBeNull();
  });

  it('asks for the stored spectrum of the measure: acceleration in orders is the order spectrum', () => {
    expect(kindFor('velocity', 'hz')).toBe('velocity');
    expect(kindFor('envelope', 'order')).toBe('envelope');
    expect(kindFor('acceleration', 'hz')).toBe('acceleration');
    expect(kindFor('acceleration', 'order')).toBe('order');
  });
});
