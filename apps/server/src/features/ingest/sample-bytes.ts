import { bytesPerSample, type Encoding } from '@turnstone/contracts/ingest';

/** Largest finite float32, (2 − 2^−23) · 2^127 (IEEE 754 binary32). */
const FLOAT32_MAX = 3.4028234663852886e38;

const INT_RANGE: Record<Exclude<Encoding, 'float32'>, [number, number]> = {
  int16: [-32768, 32767],
  int24: [-8388608, 8388607],
  int32: [-2147483648, 2147483647],
};

/**
 * Sample values sent as a JSON array, written as the little-endian bytes the gateway would
 * have sent in base64, so both forms store (and hash) the same. Throws RangeError naming
 * the first value that does not fit the encoding.
 */
export function encodeSamples(values: ArrayLike<number>, encoding: Encoding): Buffer {
  const width = bytesPerSample[encoding];
  const out = Buffer.alloc(values.length * width);
  if (encoding === 'float32') {
    for (let i = 0; i < values.length; i++) {
      const v = values[i]!;
      if (!Number.isFinite(v) || Math.abs(v) > FLOAT32_MAX)
        throw new RangeError(`samples[${i}] is not a finite float32`);
      out.writeFloatLE(v, i * 4);
    }
    return out;
  }
  const [lo, hi] = INT_RANGE[encoding];
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (!Number.isInteger(v) || v < lo || v > hi)
      throw new RangeError(`samples[${i}] = ${v} is not an ${encoding} integer`);
    if (encoding === 'int16') out.writeInt16LE(v, i * 2);
    else if (encoding === 'int32') out.writeInt32LE(v, i * 4);
    else out.writeIntLE(v, i * 3, 3);
  }
  return out;
}
