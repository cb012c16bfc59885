/**
 * Ideal signal-to-quantization-noise ratio of an N-bit converter for a full-scale sine:
 * 6.02·N + 1.76 dB (16 bits → 98.09 dB). Accepts fractional bits (bits actually used).
 *
 * Source: Kester, "Taking the Mystery out of the Infamous Formula, SNR = 6.02N + 1.76dB",
 * Analog Devices tutorial MT-001.
 */
export function quantizationSnrDb(bits: number): number {
  if (!Number.isFinite(bits) || bits < 0) throw new RangeError(`bits must be ≥ 0, got ${bits}`);
  return 6.02 * bits + 1.76;
}
