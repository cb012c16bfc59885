/**
 * Ideal signal-to-quantization-noise ratio of an N-bit converter for a full-scale sine,
 * the "6.02·N + 1.76 dB" of the data sheets, evaluated with its exact constants
 * 20·log10(2) = 6.0206 dB/bit and 10·log10(3/2) = 1.7609 dB (so 16 bits → 98.09 dB, not
 * the 98.08 the rounded constants give). Accepts fractional bits (bits actually used).
 *
 * Source: Kester, "Taking the Mystery out of the Infamous Formula, SNR = 6.02N + 1.76dB",
 * Analog Devices tutorial MT-001 (derivation: SNR = 20·log10(2^N · √(3/2))).
 */
export function quantizationSnrDb(bits: number): number {
  if (!Number.isFinite(bits) || bits < 0) throw new RangeError(`bits must be ≥ 0, got ${bits}`);
  return 20 * Math.log10(2) * bits + 10 * Math.log10(1.5);
}
