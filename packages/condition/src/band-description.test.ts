import { describe, expect, it } from 'vitest';
import type { BandDefinition } from './band-definition.ts';
import { describeBand } from './band-description.ts';
import { overallVelocity } from './test-bands.ts';

// The sentences are our own wording (common practice, no source); the checks are that each
// band kind names its quantity and its place in the spectrum, which the operator reads.
const common = { key: 'k', name: 'n', alertLevel: 1, dangerLevel: 2 } as const;

describe('describeBand', () => {
  it('an ISO overall velocity band names its span and ISO 20816', () => {
    const band: BandDefinition = { ...overallVelocity(1, 2), fromHz: 10, toHz: 1000 };
    expect(describeBand(band)).toBe(
      'How strongly the machine vibrates in all: the overall RMS vibration velocity from 10 to 1000 Hz — the quantity ISO 20816 judges a machine by.',
    );
  });

  it('an overall displacement band does not claim ISO velocity severity', () => {
    const band: BandDefinition = {
      ...common,
      kind: 'overall',
      spectrum: 'displacement',
      measure: 'peak-to-peak',
      unit: 'um',
    };
    expect(describeBand(band)).not.toContain('ISO');
    expect(describeBand(band)).toContain('peak-to-peak shaft or casing displacement');
  });

  it('an order band around 1× says where unbalance shows; one above does not', () => {
    const band = (fromOrder: number, toOrder: number): BandDefinition => ({
      ...common,
      kind: 'order',
      fromOrder,
      toOrder,
      spectrum: 'velocity',
      measure: 'rms',
      unit: 'mm/s',
    });
    expect(describeBand(band(0.8, 1.2))).toBe(
      'The RMS vibration velocity between 0.8× and 1.2× running speed, where unbalance shows.',
    );
    expect(describeBand(band(1.8, 2.2))).not.toContain('unbalance');
  });

  it('a bearing window on the envelope names the defect frequency and harmonics', () => {
    const band: BandDefinition = {
      ...common,
      kind: 'fault',
      fault: 'bpfo',
      halfWidth: 2,
      halfWidthUnit: 'percent',
      harmonics: 3,
      spectrum: 'envelope',
      measure: 'peak',
      unit: 'g',
    };
    expect(describeBand(band)).toContain("close to the bearing's outer-race defect frequency");
    expect(describeBand(band)).toContain('first 3 harmonics');
  });

  it('a frequency range names its edges in Hz', () => {
    const band: BandDefinition = {
      ...common,
      kind: 'hz',
      fromHz: 500,
      toHz: 2500,
      spectrum: 'acceleration',
      measure: 'rms',
      unit: 'g',
    };
    expect(describeBand(band)).toBe('The RMS acceleration between 500 and 2500 Hz.');
  });
});
