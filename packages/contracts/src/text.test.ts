import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { freeText, oneLine } from './text.ts';

// Line ends per Unicode 15.0 §5.8 (CR, LF, NEL, LS, PS); controls per ISO/IEC 6429.
describe('text field rules', () => {
  const name = oneLine(z.string().trim().min(1).max(200));
  const note = freeText(z.string().trim().max(2000));

  it('a one-line field refuses every control character and Unicode line end', () => {
    for (const bad of [
      'a\rb',
      'a\nb',
      'a\tb',
      'a\u0000b',
      'a\u007fb',
      'a\u0085b',
      'a\u2028b',
      'a\u2029b',
      'a\u001bb',
    ])
      expect(name.safeParse(bad).success, JSON.stringify(bad)).toBe(false);
  });

  it('keeps ordinary text, other scripts and symbols, and trims the ends', () => {
    for (const ok of ['Pump P-101 drive end', 'Pumpe Süd – Lager „A“', 'ポンプ 1', 'ΔT 5 °C'])
      expect(name.parse(ok)).toBe(ok);
    expect(name.parse('  Fan 2\n')).toBe('Fan 2');
  });

  it('free text keeps line breaks and tabs but refuses other controls', () => {
    expect(note.parse('First line\r\nSecond\tline')).toBe('First line\r\nSecond\tline');
    for (const bad of ['a\u0000b', 'a\u0007b', 'a\u001bb', 'a\u0085b', 'a\u2028b'])
      expect(note.safeParse(bad).success, JSON.stringify(bad)).toBe(false);
  });
});
