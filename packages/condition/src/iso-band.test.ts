import { ISO_BAND_HZ, isoBandForSpeed } from '@turnstone/dsp/iso-overall-band';
import { describe, expect, it } from 'vitest';
import { isoBand } from './iso-band.ts';
import { limitSetFromTemplate } from './machine-templates.ts';

describe('isoBand', () => {
  // ISO 20816-3 (from memory): 10–1000 Hz above 600 r/min, 2–1000 Hz for 120–600 r/min.
  it.each([
    [599, 2],
    [600, 2],
    [601, 10],
  ])(
    'when the machine turns at %s r/min, the band starts at %s Hz here, in the analysis and in the template',
    (rpm, fromHz) => {
      expect(isoBand(rpm)).toEqual({ fromHz, toHz: 1000 });
      expect(ISO_BAND_HZ[isoBandForSpeed(rpm)]).toEqual([fromHz, 1000]);
      const set = limitSetFromTemplate({
        type: 'motor',
        isoGroup: 2,
        foundation: 'rigid',
        nominalRpm: rpm,
      });
      const overall = set.bands.find((b) => b.key === 'overall-velocity')!;
      expect(overall).toMatchObject({ fromHz, toHz: 1000 });
    },
  );

  // ISO 20816-3:2022 abstract: the standard covers 120–30 000 r/min.
  it('when the speed is outside the standard’s scope, there is no ISO band', () => {
    expect(isoBand(119)).toBeNull();
    expect(isoBand(30_001)).toBeNull();
    expect(isoBand(120)).toEqual({ fromHz: 2, toHz: 1000 });
  });
});
