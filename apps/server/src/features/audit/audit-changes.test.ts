import { describe, expect, it } from 'vitest';
import { auditChanges } from './audit-changes.ts';

// Expected lines written by hand from the inputs (common practice, no source).
const band = (alertLevel: number, extra: Record<string, unknown> = {}) => ({
  key: 'overall-velocity',
  name: 'Overall velocity 10–1000 Hz',
  unit: 'mm/s',
  alertLevel,
  dangerLevel: 4.5,
  ...extra,
});

describe('auditChanges', () => {
  it('names a changed alert level of a band with its old and new value and unit', () => {
    expect(auditChanges([band(2.8)], [band(3.1)])).toEqual([
      { field: 'Overall velocity 10–1000 Hz · alert level', before: '2.8 mm/s', after: '3.1 mm/s' },
    ]);
  });

  it('lists added and removed bands, and leaves unchanged ones out', () => {
    const other = { key: 'one-x', name: '1× running speed', unit: 'mm/s', alertLevel: 2 };
    expect(auditChanges([band(2.8), other], [band(2.8, { persistence: 2 })])).toEqual([
      { field: 'Overall velocity 10–1000 Hz · values to raise', before: null, after: '2' },
      { field: '1× running speed', before: 'band', after: null },
    ]);
    expect(auditChanges(null, [band(2.8)])).toEqual([
      { field: 'Overall velocity 10–1000 Hz', before: null, after: 'band added' },
    ]);
  });

  it('compares plain objects field by field; µm is written as people write it', () => {
    expect(auditChanges({ name: 'A', rpm: 1480 }, { name: 'B', rpm: 1480 })).toEqual([
      { field: 'name', before: 'A', after: 'B' },
    ]);
    expect(
      auditChanges(
        [{ key: 'd', name: 'Displacement', unit: 'um', alertLevel: 50 }],
        [{ key: 'd', name: 'Displacement', unit: 'um', alertLevel: 65 }],
      ),
    ).toEqual([{ field: 'Displacement · alert level', before: '50 µm', after: '65 µm' }]);
    expect(auditChanges(null, null)).toEqual([]);
  });

  it('writes levels in imperial for an imperial reader: mm/s as in/s and µm as mil, four digits', () => {
    // 1 in = 25.4 mm (NIST SP 811 appendix B): 2.8 / 25.4 = 0.110236… and 3.1 / 25.4 =
    // 0.122047… in/s; 50 / 25.4 = 1.968503… mil (by hand).
    expect(auditChanges([band(2.8)], [band(3.1)], 'imperial')).toEqual([
      {
        field: 'Overall velocity 10–1000 Hz · alert level',
        before: '0.1102 in/s',
        after: '0.1220 in/s',
      },
    ]);
    expect(
      auditChanges(
        [{ key: 'd', name: 'Displacement', unit: 'um', alertLevel: 50 }],
        [{ key: 'd', name: 'Displacement', unit: 'um', alertLevel: 65 }],
        'imperial',
      ),
    ).toEqual([{ field: 'Displacement · alert level', before: '1.969 mil', after: '2.559 mil' }]);
    // g has no imperial counterpart: written as stored.
    expect(
      auditChanges(
        [{ key: 'a', name: 'Accel', unit: 'g', alertLevel: 1.5 }],
        [{ key: 'a', name: 'Accel', unit: 'g', alertLevel: 2 }],
        'imperial',
      ),
    ).toEqual([{ field: 'Accel · alert level', before: '1.5 g', after: '2 g' }]);
  });
});
