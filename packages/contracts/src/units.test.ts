import { describe, expect, it } from 'vitest';
import { formatNumber, formatQuantity, restateUnits } from './number-format.ts';
import {
  displayUnit,
  displayUnitText,
  fromDisplay,
  MM_PER_INCH,
  STANDARD_GRAVITY,
  toDisplay,
  unitSystemSchema,
} from './units.ts';

describe('unit systems', () => {
  // NIST SP 811 (2008) appendix B.8: inch per second → m/s 2.54 E-02 (exact), mil → m
  // 2.54 E-05 (exact); the inch is 25.4 mm by the 1959 international yard and pound agreement.
  it('when a velocity is shown in imperial, 25.4 mm/s is exactly 1 in/s and 7.62 mm/s 0.3 in/s', () => {
    expect(MM_PER_INCH).toBe(25.4);
    expect(toDisplay(25.4, 'mm/s', 'imperial')).toBe(1);
    expect(toDisplay(7.62, 'mm/s', 'imperial')).toBe(0.3);
    expect(displayUnit('mm/s', 'imperial')).toBe('in/s');
  });

  // NIST SP 811 appendix B.8: 1 mil = 0.001 in = 2.54e-5 m = 25.4 µm (exact).
  it('when a displacement is shown in imperial, 25.4 µm is 1 mil and 50.8 µm 2 mil', () => {
    expect(toDisplay(25.4, 'um', 'imperial')).toBe(1);
    expect(toDisplay(50.8, 'um', 'imperial')).toBe(2);
    expect(fromDisplay(1, 'um', 'imperial')).toBe(25.4);
    expect(displayUnitText('um', 'imperial')).toBe('mil');
    expect(displayUnitText('um', 'metric')).toBe('µm');
  });

  // ISO 20816-3 group 2 rigid B/C 2.8 and C/D 4.5 mm/s RMS (from memory), ÷ 25.4 by hand:
  // 0.110236… and 0.177165… in/s; 45 µm (displacement B/C, from memory) ÷ 25.4 = 1.77165… mil.
  it('when ISO zone boundaries are shown in imperial, they read 0.110 / 0.177 in/s and 1.77 mil', () => {
    expect(toDisplay(2.8, 'mm/s', 'imperial')).toBeCloseTo(0.1102362204724, 12);
    expect(formatQuantity(2.8, 'mm/s', 'imperial')).toBe('0.110 in/s');
    expect(formatQuantity(4.5, 'mm/s', 'imperial')).toBe('0.177 in/s');
    expect(formatQuantity(45, 'um', 'imperial')).toBe('1.77 mil');
    expect(formatQuantity(45, 'um', 'metric')).toBe('45.0 µm');
  });

  // g₀ = 9.80665 m/s² (3rd CGPM 1901; ISO 80000-3). Acceleration stays in g in both systems
  // (common practice, no source); other units (Hz, r/min, none) pass through.
  it('when a value is in g, Hz or has no unit, no system changes it', () => {
    expect(STANDARD_GRAVITY).toBe(9.80665);
    for (const system of ['metric', 'imperial'] as const) {
      expect(toDisplay(0.354, 'g', system)).toBe(0.354);
      expect(fromDisplay(0.354, 'g', system)).toBe(0.354);
      expect(displayUnit('Hz', system)).toBe('Hz');
      expect(formatQuantity(3.1, '', system)).toBe('3.10');
    }
    expect(toDisplay(2.8, 'mm/s', 'metric')).toBe(2.8);
  });

  // Round trip (definition of an inverse; the binary error of ×/÷ 25.4 is one ulp, which
  // the kept 15 / 14 digits drop): every value a person types with up to three decimals
  // (0.001 … 5 in/s or mil) comes back unchanged, and so does every stored metric level
  // with up to four significant digits.
  it('when a level is typed in imperial and shown again, it reads what was typed', () => {
    for (let i = 1; i <= 5000; i++) {
      const typed = i / 1000;
      for (const unit of ['mm/s', 'um']) {
        const stored = fromDisplay(typed, unit, 'imperial');
        expect(toDisplay(stored, unit, 'imperial')).toBe(typed);
      }
    }
    for (let i = 1; i <= 9999; i++) {
      const stored = i / 100;
      for (const unit of ['mm/s', 'um']) {
        expect(fromDisplay(toDisplay(stored, unit, 'imperial'), unit, 'imperial')).toBe(stored);
      }
    }
    // 30,000 checks: more than the default 5 s when the machine is busy.
  }, 30_000);

  it('when a stored system is not one of the two, the schema refuses it', () => {
    expect(unitSystemSchema.safeParse('imperial').success).toBe(true);
    expect(unitSystemSchema.safeParse('SI').success).toBe(false);
  });
});

describe('number formatting', () => {
  // The one rule (number-format.ts; common practice, no source): three significant digits
  // with trailing zeros kept, whole numbers from 10^digits, no exponent notation.
  it('when values span six decades, each shows three significant digits', () => {
    expect(formatNumber(1.5)).toBe('1.50');
    expect(formatNumber(0.5)).toBe('0.500');
    expect(formatNumber(22.33)).toBe('22.3');
    expect(formatNumber(123.4)).toBe('123');
    expect(formatNumber(0.03456)).toBe('0.0346');
    expect(formatNumber(0.00042)).toBe('0.000420');
    expect(formatNumber(0.00000123)).toBe('0.00000123');
    expect(formatNumber(1480)).toBe('1480');
    expect(formatNumber(-7.234)).toBe('-7.23');
  });

  it('when a value rounds up across a decade, it keeps three digits, not four', () => {
    expect(formatNumber(9.996)).toBe('10.0');
    expect(formatNumber(0.0009996)).toBe('0.00100');
    expect(formatNumber(999.7)).toBe('1000');
  });

  it('when four digits are asked for (chart read-outs), 24.66 Hz reads 24.66', () => {
    expect(formatNumber(24.66, 4)).toBe('24.66');
    expect(formatNumber(123.45, 4)).toBe('123.5');
    expect(formatNumber(12345.6, 4)).toBe('12346');
  });

  it('when a value is missing or not finite, it shows a dash and no unit', () => {
    expect(formatNumber(Number.NaN)).toBe('—');
    expect(formatNumber(null)).toBe('—');
    expect(formatNumber(0)).toBe('0');
    expect(formatQuantity(undefined, 'mm/s', 'imperial')).toBe('—');
  });
});

describe('restating stored sentences', () => {
  // ÷ 25.4 by hand (NIST SP 811): 3.52 mm/s → 0.13858 in/s; 60 µm → 2.3622 mil.
  it('when a diagnosis summary names mm/s and µm, an imperial reader gets in/s and mil', () => {
    const s = '1× dominant (3.52 mm/s, 100 % of the energy); 60 µm pk-pk at 2 mm/s² and 0.5 g';
    expect(restateUnits(s, 'imperial')).toBe(
      '1× dominant (0.139 in/s, 100 % of the energy); 2.36 mil pk-pk at 2 mm/s² and 0.5 g',
    );
    expect(restateUnits(s, 'metric')).toBe(s);
  });
});
