import { describe, it, expect } from 'vitest';
import {
  displacementGovernsBelowRpm,
  ISO_20816_3_ZONE_BOUNDARIES,
  isoDisplacementZone,
  isoZone,
  isoZoneBoth,
  isoZoneBoundaries,
} from './iso-zones.ts';
import { isoBand } from './iso-band.ts';
import { isoDefaultLevels } from './iso-default-levels.ts';

describe('ISO 20816-3 zone boundaries', () => {
  it('when read by group and foundation, boundaries rise A/B < B/C < C/D, and a flexible foundation or the larger group 1 allows more', () => {
    // ISO 20816-3: flexible foundations and larger machines (group 1) get higher boundaries
    // (from memory). The values themselves are checked by behaviour in 'isoZone' below.
    for (const group of [1, 2] as const) {
      const rigid = isoZoneBoundaries(group, 'rigid');
      const flexible = isoZoneBoundaries(group, 'flexible');
      for (const b of [rigid, flexible]) {
        expect(b.ab).toBeLessThan(b.bc);
        expect(b.bc).toBeLessThan(b.cd);
      }
      for (const k of ['ab', 'bc', 'cd'] as const) {
        expect(flexible[k]).toBeGreaterThan(rigid[k]);
        expect(ISO_20816_3_ZONE_BOUNDARIES[group].rigid[k]).toBe(rigid[k]);
      }
    }
    for (const k of ['ab', 'bc', 'cd'] as const) {
      expect(isoZoneBoundaries(1, 'rigid')[k]).toBeGreaterThan(isoZoneBoundaries(2, 'rigid')[k]);
    }
  });

  it('when asked for an unknown group, throws', () => {
    expect(() => isoZoneBoundaries(3 as never, 'rigid')).toThrow(RangeError);
  });
});

describe('isoZone', () => {
  // Each class: value just below a boundary stays in the lower zone, a value exactly on it is
  // in the higher zone (Turnstone's rule; the standard does not say). Boundaries: ISO 20816-3,
  // from memory.
  const classes = [
    { group: 1, foundation: 'rigid', ab: 2.3, bc: 4.5, cd: 7.1 },
    { group: 1, foundation: 'flexible', ab: 3.5, bc: 7.1, cd: 11.0 },
    { group: 2, foundation: 'rigid', ab: 1.4, bc: 2.8, cd: 4.5 },
    { group: 2, foundation: 'flexible', ab: 2.3, bc: 4.5, cd: 7.1 },
  ] as const;

  for (const c of classes) {
    const label = `group ${c.group} ${c.foundation}`;
    it(`${label}: when a value sits exactly on each boundary, the zone is the higher one`, () => {
      expect(isoZone(c.ab, c.group, c.foundation)).toBe('B');
      expect(isoZone(c.bc, c.group, c.foundation)).toBe('C');
      expect(isoZone(c.cd, c.group, c.foundation)).toBe('D');
    });
    it(`${label}: when a value sits just below each boundary, the zone is the lower one`, () => {
      expect(isoZone(c.ab - 0.001, c.group, c.foundation)).toBe('A');
      expect(isoZone(c.bc - 0.001, c.group, c.foundation)).toBe('B');
      expect(isoZone(c.cd - 0.001, c.group, c.foundation)).toBe('C');
    });
    it(`${label}: when a value sits just above each boundary or between two, the zone is the one above`, () => {
      expect(isoZone(c.ab + 0.001, c.group, c.foundation)).toBe('B');
      expect(isoZone((c.ab + c.bc) / 2, c.group, c.foundation)).toBe('B');
      expect(isoZone(c.bc + 0.001, c.group, c.foundation)).toBe('C');
      expect(isoZone((c.bc + c.cd) / 2, c.group, c.foundation)).toBe('C');
      expect(isoZone(c.cd + 0.001, c.group, c.foundation)).toBe('D');
      expect(isoZone(c.ab / 2, c.group, c.foundation)).toBe('A');
      expect(isoZone(2 * c.cd, c.group, c.foundation)).toBe('D');
    });
  }

  it('when the value is 4.5 mm/s on group 1 rigid, the zone is C (the B/C boundary)', () => {
    // ISO 20816-3 group 1 rigid B/C = 4.5 mm/s, from memory
    expect(isoZone(4.5, 1, 'rigid')).toBe('C');
  });

  it('when the same 3.0 mm/s is judged on different classes, the zones differ', () => {
    // ISO 20816-3 boundaries, from memory: group 2 rigid B/C 2.8; group 1 flexible A/B 3.5
    expect(isoZone(3.0, 2, 'rigid')).toBe('C');
    expect(isoZone(3.0, 1, 'flexible')).toBe('A');
    expect(isoZone(3.0, 1, 'rigid')).toBe('B');
  });

  it('when the velocity is 0, the zone is A', () => {
    expect(isoZone(0, 2, 'flexible')).toBe('A');
  });

  it('when the velocity is negative or not a number, throws', () => {
    expect(() => isoZone(-0.1, 1, 'rigid')).toThrow(RangeError);
    expect(() => isoZone(Number.NaN, 1, 'rigid')).toThrow(RangeError);
  });
});

describe('isoBand', () => {
  it('when the speed is above 600 r/min, the band is 10–1000 Hz', () => {
    // ISO 20816-3, from memory
    expect(isoBand(601)).toEqual({ fromHz: 10, toHz: 1000 });
    expect(isoBand(1480)).toEqual({ fromHz: 10, toHz: 1000 });
    expect(isoBand(30_000)).toEqual({ fromHz: 10, toHz: 1000 });
  });

  it('when the speed is 120 to 600 r/min inclusive, the band is 2–1000 Hz', () => {
    // ISO 20816-3, from memory; 600 itself is not "above 600"
    expect(isoBand(600)).toEqual({ fromHz: 2, toHz: 1000 });
    expect(isoBand(120)).toEqual({ fromHz: 2, toHz: 1000 });
    expect(isoBand(300)).toEqual({ fromHz: 2, toHz: 1000 });
  });

  it('when the speed is outside 120–30 000 r/min, there is no ISO band', () => {
    // scope from the ISO 20816-3:2022 abstract (confirmed)
    expect(isoBand(119)).toBeNull();
    expect(isoBand(30_001)).toBeNull();
  });
});

describe('isoDefaultLevels', () => {
  it('when applied to group 1 rigid, alert is the B/C and danger the C/D boundary', () => {
    // ISO 20816-3 group 1 rigid 4.5 / 7.1 mm/s, from memory; B/C and C/D placement common practice, no source
    expect(isoDefaultLevels(1, 'rigid')).toEqual({ alertLevel: 4.5, dangerLevel: 7.1 });
  });

  it('when applied to group 2 flexible, alert is 4.5 and danger 7.1 mm/s', () => {
    // ISO 20816-3 group 2 flexible, from memory
    expect(isoDefaultLevels(2, 'flexible')).toEqual({ alertLevel: 4.5, dangerLevel: 7.1 });
  });

  it('when a value equals the default alert level, its zone is C', () => {
    // ISO 20816-3 group 2 rigid B/C 2.8, from memory: levels and zones agree on the boundary
    const { alertLevel, dangerLevel } = isoDefaultLevels(2, 'rigid');
    expect(isoZone(alertLevel, 2, 'rigid')).toBe('C');
    expect(isoZone(dangerLevel, 2, 'rigid')).toBe('D');
  });
});

describe('ISO 20816-3 displacement criteria', () => {
  it('when displacement sits on a boundary, it is in the higher zone (group 2 rigid 45 µm → C)', () => {
    // ISO 10816-3 / 20816-3 displacement boundaries 22 / 45 / 71 µm RMS, from memory
    expect(isoDisplacementZone(21.9, 2, 'rigid')).toBe('A');
    expect(isoDisplacementZone(22, 2, 'rigid')).toBe('B');
    expect(isoDisplacementZone(45, 2, 'rigid')).toBe('C');
    expect(isoDisplacementZone(71, 2, 'rigid')).toBe('D');
    expect(isoDisplacementZone(90, 1, 'rigid')).toBe('D');
    expect(() => isoDisplacementZone(-1, 2, 'rigid')).toThrow(RangeError);
  });

  it('when a slow shaft moves 60 µm at 1.9 mm/s, displacement governs: the worse zone is C', () => {
    // a 5 Hz sine (300 r/min) with 60 µm RMS has v = 2π·5·0.060 = 1.885 mm/s RMS (definition):
    // zone B by velocity (1.4 ≤ 1.885 < 2.8, group 2 rigid), zone C by displacement (45 ≤ 60 < 71),
    // boundaries from memory
    const v = 2 * Math.PI * 5 * 0.06;
    expect(isoZone(v, 2, 'rigid')).toBe('B');
    expect(isoZoneBoth(v, 60, 2, 'rigid')).toBe('C');
    expect(isoZoneBoth(5, 10, 2, 'rigid')).toBe('D');
  });

  it('when velocity and displacement boundaries meet, it is where v = 2πf·d', () => {
    // group 2 rigid: 2.8 mm/s and 45 µm meet at f = 2.8 / (2π·0.045) Hz (definition of a sine)
    const rpm = displacementGovernsBelowRpm(2, 'rigid');
    expect(rpm).toBeCloseTo((60 * 2.8) / (2 * Math.PI * 0.045), 9);
    const f = rpm / 60;
    expect(2 * Math.PI * f * 0.045).toBeCloseTo(2.8, 12);
  });
});
