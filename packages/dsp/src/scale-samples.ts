import type { SampleEncoding } from './sample-codec.ts';
import { STANDARD_GRAVITY } from './units.ts';

/** Options for {@link scaleToAcceleration}. */
export interface ScaleOptions {
  /** How the samples were encoded; integer encodings are ADC counts, float32 is volts. @default 'int32' */
  encoding?: SampleEncoding;
  /** ADC resolution in bits (codes −2^(bits−1) … 2^(bits−1)−1). @default 24 */
  bits?: number;
  /** Volts at a code of 2^(bits−1) (the positive rail). @default 1.0 */
  fullScaleV?: number;
  /** Accelerometer sensitivity in mV/g. @default 100 */
  sensitivityMvPerG?: number;
  /** Output unit. @default 'g' */
  unit?: 'g' | 'm/s2';
}

/** Volts per ADC count: fullScaleV / 2^(bits−1). */
export function voltsPerCount(bits: number, fullScaleV: number): number {
  checkAdc(bits, fullScaleV);
  return fullScaleV / 2 ** (bits - 1);
}

/**
 * Throws a `RangeError` unless bits is an integer in 2 … 32 and fullScaleV a positive
 * number. Source: definition of a bipolar N-bit converter (Kester, MT-001).
 */
export function checkAdc(bits: number, fullScaleV: number): void {
  if (!Number.isInteger(bits) || bits < 2 || bits > 32) {
    throw new RangeError(`ADC bits must be an integer in 2 … 32, got ${bits}`);
  }
  if (!(fullScaleV > 0) || !Number.isFinite(fullScaleV)) {
    throw new RangeError(`ADC full scale must be a positive number of volts, got ${fullScaleV}`);
  }
}

/**
 * Counts → volts (fullScaleV / 2^(bits−1) per count) → g (÷ sensitivity in V/g) →
 * optionally m/s² (× 9.80665). Float32 samples are taken as volts.
 *
 * Source: ADC transfer function of a bipolar converter (Kester, Analog Devices MT-001);
 * standard gravity 9.80665 m/s² (3rd CGPM, 1901).
 */
export function scaleToAcceleration(
  samples: ArrayLike<number>,
  options: ScaleOptions = {},
): Float64Array {
  const encoding = options.encoding ?? 'int32';
  const bits = options.bits ?? 24;
  const fullScaleV = options.fullScaleV ?? 1;
  const sensitivity = options.sensitivityMvPerG ?? 100;
  const unit = options.unit ?? 'g';
  checkAdc(bits, fullScaleV);
  if (!(sensitivity > 0) || !Number.isFinite(sensitivity)) {
    throw new RangeError(
      `sensor sensitivity must be a positive number of mV/g, got ${sensitivity}`,
    );
  }
  if (unit !== 'g' && unit !== 'm/s2')
    throw new TypeError(`unit must be 'g' or 'm/s2', got ${String(unit)}`);
  const perSample =
    ((encoding === 'float32' ? 1 : voltsPerCount(bits, fullScaleV)) / (sensitivity / 1000)) *
    (unit === 'm/s2' ? STANDARD_GRAVITY : 1);
  const out = new Float64Array(samples.length);
  out.set(samples);
  let bad = 0;
  for (let i = 0; i < out.length; i++) {
    const v = out[i]! * perSample;
    bad += v - v; // NaN for NaN or ±Infinity, 0 otherwise: one check after the loop
    out[i] = v;
  }
  if (bad !== 0) {
    const i = out.findIndex((v) => !Number.isFinite(v));
    throw new RangeError(`sample ${i} is not a finite number (${samples[i]})`);
  }
  return out;
}
