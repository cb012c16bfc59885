import { describe, expect, it } from 'vitest';
import { formatAge } from './format.ts';

// Expected strings are CLDR's en-GB short relative-time forms, as printed by Node's ICU.
const now = Date.parse('2026-03-10T12:00:00Z');
const ago = (seconds: number) => new Date(now - seconds * 1000).toISOString();

describe('formatAge', () => {
  it('shows minutes for a snapshot 12 minutes old', () => {
    expect(formatAge(ago(12 * 60), now)).toBe('12 min ago');
  });

  it('moves to hours, days and months as the age grows', () => {
    expect(formatAge(ago(3 * 3600 + 59), now)).toBe('3 hr ago');
    expect(formatAge(ago(2 * 86400), now)).toBe('2 days ago');
    expect(formatAge(ago(65 * 86400), now)).toBe('2 mo ago');
  });

  it('reads a timestamp slightly in the future (clock skew) as just taken', () => {
    expect(formatAge(new Date(now + 30_000).toISOString(), now)).toBe('0 sec ago');
  });

  it('shows a dash for a value that is not a date', () => {
    expect(formatAge('not a date', now)).toBe('—');
  });
});
