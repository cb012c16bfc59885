/**
 * Frequency at which a tone of `frequencyHz` appears after sampling at `sampleRateHz`:
 * |f − k·fs| folded into [0, fs/2] (at fs = 1 kHz: 1300 → 300, 900 → 100, 2600 → 400 Hz).
 *
 * Source: the sampling theorem (Shannon 1949; Nyquist 1928) (computed).
 */
export function aliasFrequency(frequencyHz: number, sampleRateHz: number): number {
  if (!(sampleRateHz > 0))
    throw new RangeError(`sampleRateHz must be positive, got ${sampleRateHz}`);
  if (!Number.isFinite(frequencyHz))
    throw new RangeError(`frequency must be finite, got ${frequencyHz}`);
  const f = Math.abs(frequencyHz) % sampleRateHz;
  return f > sampleRateHz / 2 ? sampleRateHz - f : f;
}
