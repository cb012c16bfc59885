import { describe, expect, it } from 'vitest';
import { bearingOrders, faultFrequencies } from './fault-frequencies.ts';

// CWRU bearing data, drive end 6205-2RS: n = 9, d = 0.3126 in, D = 1.537 in (geometry from memory of the Case Western Reserve University bearing data centre's page)
const cwru = {
  name: 'DE 6205',
  rollingElements: 9,
  ballDiameterMm: 0.3126 * 25.4,
  pitchDiameterMm: 1.537 * 25.4,
  contactAngleDeg: 0,
};

describe('fault frequencies', () => {
  // Case Western Reserve University bearing data (published multiples of shaft speed); formulas Randall & Antoni 2011
  it('when the CWRU drive-end 6205 geometry is used, BPFI 5.4152, BPFO 3.5848, FTF 0.39828 and 2×BSF 4.7135 come out within 1e-3', () => {
    const o = bearingOrders(cwru);
    expect(Math.abs(o.bpfi - 5.4152)).toBeLessThan(1e-3);
    expect(Math.abs(o.bpfo - 3.5848)).toBeLessThan(1e-3);
    expect(Math.abs(o.ftf - 0.39828)).toBeLessThan(1e-3);
    expect(Math.abs(2 * o.bsf - 4.7135)).toBeLessThan(1e-3);
  });

  // Randall & Antoni 2011: BPFO + BPFI = n (identity of the formulas); contact angle lowers d/D·cos φ
  it('when a contact angle is given, BPFO + BPFI still equals the element count and BPFO rises', () => {
    const angled = bearingOrders({ ...cwru, contactAngleDeg: 40 });
    expect(angled.bpfo + angled.bpfi).toBeCloseTo(9, 12);
    expect(angled.bpfo).toBeGreaterThan(bearingOrders(cwru).bpfo);
  });

  // common practice, no source: gear mesh = teeth × shaft speed; blade pass = blades × shaft speed
  it('when a machine has a bearing, a gear and a fan, the list holds 1×–3×, the four bearing lines, GMF and blade pass in Hz', () => {
    const list = faultFrequencies(
      { bearings: [cwru], gears: [{ name: 'pinion', teeth: 23, speedRatio: 2 }], blades: 7 },
      29.95,
    );
    expect(list.map((f) => f.name)).toEqual([
      '1×',
      '2×',
      '3×',
      'DE 6205 BPFO',
      'DE 6205 BPFI',
      'DE 6205 BSF',
      'DE 6205 FTF',
      'pinion GMF',
      'blade pass',
    ]);
    expect(list.find((f) => f.kind === 'gear-mesh')!.hz).toBeCloseTo(23 * 2 * 29.95, 9);
    expect(list.find((f) => f.kind === 'blade-pass')!.order).toBe(7);
    expect(list.find((f) => f.kind === 'bpfi')!.hz).toBeCloseTo(5.4152 * 29.95, 1);
  });

  it('when the speed is unknown, orders are given and Hz is null', () => {
    const list = faultFrequencies({ blades: 5 });
    expect(list.every((f) => f.hz === null)).toBe(true);
    expect(list.at(-1)!.order).toBe(5);
  });

  it('when the geometry is impossible, it throws RangeError naming the bearing', () => {
    expect(() => bearingOrders({ ...cwru, ballDiameterMm: 50 })).toThrow(/DE 6205/);
    expect(() => bearingOrders({ ...cwru, rollingElements: 0 })).toThrow(RangeError);
    expect(() => faultFrequencies({ gears: [{ name: 'g', teeth: 1.5 }] })).toThrow(RangeError);
    expect(() => faultFrequencies({}, -3)).toThrow(RangeError);
  });
});
