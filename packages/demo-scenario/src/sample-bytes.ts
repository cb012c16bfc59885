/** ADC counts as the little-endian bytes a gateway sends (int16: 2 bytes, int24: 3 bytes). */
export function countsToBytes(
  counts: Int16Array | Int32Array,
  encoding: 'int16' | 'int24',
): Buffer {
  if (encoding === 'int16') {
    const out = Buffer.alloc(counts.length * 2);
    for (let i = 0; i < counts.length; i++) out.writeInt16LE(counts[i]!, i * 2);
    return out;
  }
  const out = Buffer.alloc(counts.length * 3);
  for (let i = 0; i < counts.length; i++) out.writeIntLE(counts[i]!, i * 3, 3);
  return out;
}
