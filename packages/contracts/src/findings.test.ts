import { describe, expect, it } from 'vitest';
import { downtimeTextSchema, findingFormSchema } from './findings.ts';

// What a planner types as planned downtime: hours with a decimal point or (as in much of
// Europe) a decimal comma; common practice, no source.
describe('planned downtime as typed in the finding form', () => {
  it('reads hours with a point or a comma, and empty as none', () => {
    expect(downtimeTextSchema.parse('4')).toBe(4);
    expect(downtimeTextSchema.parse(' 1.5 ')).toBe(1.5);
    expect(downtimeTextSchema.parse('1,5')).toBe(1.5);
    expect(downtimeTextSchema.parse('.5')).toBe(0.5);
    expect(downtimeTextSchema.parse('0')).toBe(0);
    expect(downtimeTextSchema.parse('')).toBeNull();
    expect(downtimeTextSchema.parse('   ')).toBeNull();
  });

  it('refuses text, units, thousands separators, negatives and more than a year, with a reason', () => {
    const reasons = Object.fromEntries(
      ['four', '4 h', '1.234,5', '1e3', '-1', '8761', '0x10'].map((t) => {
        const r = downtimeTextSchema.safeParse(t);
        return [t, r.success ? null : r.error.issues[0]!.message];
      }),
    );
    expect(reasons).toEqual({
      four: 'Give the downtime in hours, like 4 or 1.5',
      '4 h': 'Give the downtime in hours, like 4 or 1.5',
      '1.234,5': 'Give the downtime in hours, like 4 or 1.5',
      '1e3': 'Give the downtime in hours, like 4 or 1.5',
      '-1': 'At least 0 hours',
      '8761': 'At most 8760 hours (a year)',
      '0x10': 'Give the downtime in hours, like 4 or 1.5',
    });
  });

  it('the whole form turns blanks into null, as the API takes them', () => {
    expect(
      findingFormSchema.parse({
        title: ' Align motor ',
        workOrderRef: '',
        dueDate: '',
        note: '',
        priority: 'low',
        owner: '',
        plannedDowntimeHours: '2,25',
      }),
    ).toEqual({
      title: 'Align motor',
      workOrderRef: null,
      dueDate: null,
      note: null,
      priority: 'low',
      owner: null,
      plannedDowntimeHours: 2.25,
    });
  });
});
