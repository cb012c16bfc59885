/** Sample encodings a snapshot can carry, all little-endian. */
export type SampleEncoding = 'int16' | 'int24' | 'int32' | 'float32';

/** Encodings accepted by {@link decodeSamples}. */
export const SAMPLE_ENCODINGS: readonly SampleEncoding[] = ['int16', 'int24', 'int32', 'float32'];

/** Bytes per sample of each encoding. */
export const BYTES_PER_SAMPLE: Record<SampleEncoding, number> = {
  int16: 2,
  int24: 3,
  int32: 4,
  float32: 4,
};

/** Returns `value` as an encoding, or throws a `TypeError` naming the accepted ones. */
export function parseEncoding(value: string): SampleEncoding {
  if ((SAMPLE_ENCODINGS as readonly string[]).includes(value)) return value as SampleEncoding;
  throw new TypeError(
    `unknown sample encoding "${value}"; use one of ${SAMPLE_ENCODINGS.join(', ')}`,
  );
}

/**
 * Decodes little-endian samples: integer encodings to ADC counts (`Int32Array`, two's
 * complement, int24 sign-extended), `float32` to its values (`Float32Array`).
 * Rejects a byte count that is not a whole number of samples, an empty buffer and
 * non-finite floats.
 *
 * Source: two's-complement little-endian PCM as in the Microsoft RIFF/WAVE
 * specification (1991); IEEE 754 binary32.
 */
export function decodeSamples(
  bytes: Uint8Array,
  encoding: SampleEncoding,
): Int32Array | Float32Array {
  if (!(bytes instanceof Uint8Array)) throw new TypeError('decodeSamples expects a Uint8Array');
  const width = BYTES_PER_SAMPLE[encoding];
  if (!width) throw new TypeError(`unknown sample encoding "${String(encoding)}"`);
  if (bytes.length === 0) throw new RangeError('no samples: the buffer is empty');
  if (bytes.length % width !== 0) {
    throw new RangeError(
      `${bytes.length} bytes is not a whole number of ${encoding} samples (${width} bytes each)`,
    );
  }
  const n = bytes.length / width;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (encoding === 'float32') {
    const out = new Float32Array(n);
    for (let i = 0; i < n; i++) {
      const v = view.getFloat32(4 * i, true);
      if (!Number.isFinite(v)) throw new RangeError(`sample ${i} is not a finite number (${v})`);
      out[i] = v;
    }
    return out;
  }
  const out = new Int32Array(n);
  if (encoding === 'int16') {
    for (let i = 0; i < n; i++) out[i] = view.getInt16(2 * i, true);
  } else if (encoding === 'int32') {
    for (let i = 0; i < n; i++) out[i] = view.getInt32(4 * i, true);
  } else {
    for (let i = 0; i < n; i++) {
      const o = 3 * i;
      const u = bytes[o]! | (bytes[o + 1]! << 8) | (bytes[o + 2]! << 16);
      out[i] = (u << 8) >> 8;
    }
  }
  return out;
}
