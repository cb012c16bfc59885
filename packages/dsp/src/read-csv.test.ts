import { describe, expect, it } from 'vitest';
import { readCsv } from './read-csv.ts';

describe('readCsv', () => {
  // RFC 4180 (CSV)
  it('when the file is one column of numbers, the values come back and no rate is known', () => {
    const r = readCsv('0.1\n-0.2\n3e-3\n');
    expect(Array.from(r.values)).toEqual([0.1, -0.2, 0.003]);
    expect(r.sampleRateHz).toBeNull();
    expect(r.columns).toBe(1);
  });

  it('when the file has a header and time,value columns, the rate comes from the time step', () => {
    const lines = ['time,accel'];
    for (let i = 0; i < 100; i++) lines.push(`${(i / 2560).toFixed(9)},${Math.sin(i)}`);
    const r = readCsv(lines.join('\r\n'));
    expect(r.header).toEqual(['time', 'accel']);
    expect(r.sampleRateHz).toBeCloseTo(2560, 3);
    expect(r.values[1]).toBeCloseTo(Math.sin(1), 12);
  });

  it('when semicolons separate the columns, they are detected', () => {
    expect(readCsv('0;1\n0.5;2\n1;3\n').sampleRateHz).toBeCloseTo(2, 12);
  });

  it('when a value is not a number or NaN, the line is named', () => {
    expect(() => readCsv('1\n2\nabc\n')).toThrow(/line 3 has a non-numeric value "abc"/);
    expect(() => readCsv('1\nNaN\n')).toThrow(/line 2/);
    expect(() => readCsv('value\n1\n\t\n2\n,\n')).toThrow(/line/);
  });

  it('when rows have different column counts, the line is named', () => {
    expect(() => readCsv('0,1\n1,2\n2\n')).toThrow(/line 3 has 1 columns, expected 2/);
  });

  it('when the file is empty, has only a header or too many columns, it is rejected', () => {
    expect(() => readCsv('')).toThrow(/empty/);
    expect(() => readCsv('value\n')).toThrow(/no samples/);
    expect(() => readCsv('1,2,3\n')).toThrow(/found 3/);
  });

  it('when the time column jumps or goes back, it is rejected', () => {
    expect(() => readCsv('0,1\n0.001,1\n0.005,1\n0.006,1\n')).toThrow(/not evenly spaced/);
    expect(() => readCsv('0,1\n-1,1\n')).toThrow(/does not increase/);
  });

  it('when the bytes are binary, it is rejected as not CSV', () => {
    expect(() => readCsv('RIFF\u0000\u0000WAVE')).toThrow(/not a CSV|non-numeric/);
  });
});
