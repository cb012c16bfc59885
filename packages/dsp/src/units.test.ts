import { describe, expect, it } from 'vitest';
import { fromDecibels, toDecibels } from './decibels.ts';
import {
  convertUnit,
  integrateSineAmplitude,
  integrationGain,
  MM_PER_INCH,
  STANDARD_GRAVITY,
} from './units.ts';

describe('units', () => {
  // Calculus of a sinusoid (v = a/2πf, d = a/(2πf)²), g₀ = 9.80665 m/s² (3rd CGPM 1901): 1 g peak at 100 Hz → 15.61 mm/s peak, 24.84 µm peak (0.7071 g RMS: waveform-statistics.test.ts)
  it('when a 1 g peak sine at 100 Hz is integrated, it reads 15.6078 mm/s and 24.8405 µm peak', () => {
    expect(integrateSineAmplitude(1, 100, 'g', 'mm/s')).toBeCloseTo(15.6078, 4);
    expect(integrateSineAmplitude(1, 100, 'g', 'um')).toBeCloseTo(24.8405, 4);
    expect(2 * integrateSineAmplitude(1, 100, 'g', 'um')).toBeCloseTo(49.681, 3);
    expect(integrateSineAmplitude(1, 100, 'g', 'in/s')).toBeCloseTo(0.61448, 5);
  });

  // 3rd CGPM (1901): g = 9.80665 m/s²; 1 in = 25.4 mm exactly
  it('when units of one quantity are converted, the defined factors apply', () => {
    expect(STANDARD_GRAVITY).toBe(9.80665);
    expect(MM_PER_INCH).toBe(25.4);
    expect(convertUnit(2, 'g', 'm/s2')).toBeCloseTo(19.6133, 10);
    expect(convertUnit(25.4, 'mm/s', 'in/s')).toBeCloseTo(1, 12);
    expect(convertUnit(1, 'mil', 'um')).toBeCloseTo(25.4, 12);
  });

  it('when units of different quantities are converted or a unit is differentiated, it throws', () => {
    expect(() => convertUnit(1, 'g', 'mm/s')).toThrow(RangeError);
    expect(() => integrationGain(100, 'um', 'g')).toThrow(/differentiate/);
    expect(() => integrationGain(0, 'g', 'mm/s')).toThrow(/positive frequency/);
  });

  // ISO 1683 reference values (1 nm/s, 1 µm/s², 1 pm), computed as 20·log10(x/ref): 1 mm/s →
  // 120.00 dB; 1 g → 139.83 dB. The standard's text was not read here; the values are as stated
  // in python-acoustics, acoustics/standards/iso_1683_2015.py (REFERENCE_VALUES["vibration"]:
  // displacement 1e-12 m, velocity 1e-9 m/s, acceleration 1e-6 m/s²) and, for velocity and
  // acceleration, in the ASA standards terminology entries "particle velocity level" and
  // "(vibratory) acceleration level" (asastandards.org/Terms), which quote ISO 1683:2008.
  it('when levels are given in dB re ISO 1683, 1 mm/s is 120.00 dB and 1 g is 139.83 dB', () => {
    expect(toDecibels(1, 'mm/s')).toBeCloseTo(120.0, 2);
    expect(toDecibels(1, 'g')).toBeCloseTo(139.83, 2);
    expect(fromDecibels(139.83, 'g')).toBeCloseTo(1, 3);
    expect(toDecibels(1, 'um')).toBeCloseTo(120.0, 2); // 1 pm reference (python-acoustics, above)
    expect(() => toDecibels(0, 'g')).toThrow(RangeError);
  });
});
