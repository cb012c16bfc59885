import { integrationGain, type VibrationUnit } from './units.ts';

/** Options for {@link integratePowerSpectrum}. */
export interface IntegrateSpectrumOptions {
  /** Unit of the input lines. @default 'g' */
  from?: VibrationUnit;
  /** Unit of the output lines (same quantity, or one or two integrations lower). @default 'mm/s' */
  to?: VibrationUnit;
  /**
   * Lines below this frequency are set to zero, so the 1/f (1/f²) gain of integration
   * does not blow up window leakage and sensor noise near DC.
   * @default 2
   */
  lowCutoffHz?: number;
  /**
   * Lines above this frequency are set to zero.
   * @default Infinity
   */
  highCutoffHz?: number;
}

/**
 * Frequency-domain integration of a one-sided power spectrum (unit² per line):
 * P_out(f) = P_in(f) · G(f)², with G = 1/(2πf) per integration and the unit factors,
 * zero outside [lowCutoffHz, highCutoffHz].
 *
 * Source: v = a/(2πf), d = a/(2πf)² for each sinusoidal component (e.g. Randall,
 * "Vibration-based Condition Monitoring", Wiley 2011, ch. 2); cutoff: common practice.
 */
export function integratePowerSpectrum(
  power: ArrayLike<number>,
  dfHz: number,
  options: IntegrateSpectrumOptions = {},
): Float64Array {
  if (!(dfHz > 0)) throw new RangeError(`dfHz must be positive, got ${dfHz}`);
  const from = options.from ?? 'g';
  const to = options.to ?? 'mm/s';
  const lowCutoffHz = options.lowCutoffHz ?? 2;
  const highCutoffHz = options.highCutoffHz ?? Infinity;
  if (!(lowCutoffHz > 0)) throw new RangeError(`lowCutoffHz must be positive, got ${lowCutoffHz}`);
  const out = new Float64Array(power.length);
  const g1 = integrationGain(1, from, to);
  const g2 = integrationGain(2, from, to);
  // G(f) = c / f^p; p from two evaluations (0, 1 or 2 integrations).
  const p = Math.round(Math.log2(g1 / g2));
  const c = g1;
  for (let k = 0; k < power.length; k++) {
    const f = k * dfHz;
    if (f < lowCutoffHz - 1e-9 * dfHz || f > highCutoffHz + 1e-9 * dfHz) continue;
    const gain = c / f ** p;
    out[k] = power[k]! * gain * gain;
  }
  return out;
}
