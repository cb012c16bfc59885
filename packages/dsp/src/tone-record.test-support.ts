/**
 * Test records built from their definition, never from Turnstone's own output: a sum of tones
 * (Hz, g peak, all at one phase) plus, where asked, uniform noise from the Numerical Recipes
 * generator (`lcg32`), as the 24-bit counts of a 100 mV/g sensor into a 1 V converter.
 */
import type { SnapshotInput } from './analyze-snapshot.ts';
import { lcg32 } from './seeded-random.ts';

/** 100 mV/g into a 24-bit, 1 V converter. */
export const COUNTS_PER_G = 0.1 * 2 ** 23;

export interface ToneRecordSpec {
  /** Sample rate, Hz. */
  fs: number;
  /** Samples. */
  n: number;
  /** Each tone as [frequency Hz, amplitude g peak]. */
  tones: [number, number][];
  /** Phase of every tone at the first sample, rad. @default 0 */
  phaseRad?: number;
  /** Peak-to-peak of the uniform noise under the tones, g. @default 0 (none) */
  noiseG?: number;
  /** Seed of the noise generator. @default 1 */
  seed?: number;
}

/** The record of `spec`, with any further analysis input (`speedRpm`, `tach`, …) in `extra`. */
export function toneCounts(
  spec: ToneRecordSpec,
  extra: Partial<SnapshotInput> = {},
): SnapshotInput {
  const { fs, n, tones, phaseRad = 0, noiseG = 0 } = spec;
  const uniform = lcg32(spec.seed ?? 1);
  const samples = Int32Array.from({ length: n }, (_, i) => {
    let g = noiseG === 0 ? 0 : noiseG * (uniform() - 0.5);
    for (const [f, a] of tones) g += a * Math.sin((2 * Math.PI * f * i) / fs + phaseRad);
    return Math.round(g * COUNTS_PER_G);
  });
  return {
    samples,
    encoding: 'int32',
    sampleRateHz: fs,
    adc: { bits: 24, fullScaleV: 1 },
    sensor: { sensitivityMvPerG: 100 },
    ...extra,
  };
}
