import { describe, expect, it } from 'vitest';
import { safeCell } from './review-csv.ts';

describe('CSV cells that a spreadsheet would run', () => {
  // OWASP "CSV Injection": cells starting with = + - @ tab CR are formulas; spreadsheet
  // programs also accept the full-width forms U+FF1D ＝, U+FF0B ＋, U+FF0D －, U+FF20 ＠
  // (from memory, seen with full-width input methods).
  it.each([
    '=1+1',
    '+1',
    '-1',
    '@SUM(A1)',
    '\t=1',
    '\r=1',
    '＝HYPERLINK("x")',
    '＋1',
    '－1',
    '＠A1',
  ])('prefixes %j with an apostrophe', (v) => {
    expect(safeCell(v)).toBe(`'${v}`);
  });

  it('leaves ordinary text and numbers alone', () => {
    expect(safeCell('Pump P101 bearing')).toBe('Pump P101 bearing');
    expect(safeCell(-1.5)).toBe(-1.5);
  });
});
