/**
 * The sample codec: little-endian sample bytes ⇄ values, for every encoding a snapshot can
 * carry. Ingest, uploads, the WAV reader and writer, the demo scenario and the tests all
 * encode and decode here; the byte widths are the contracts' one table.
 */
import { bytesPerSample, encodings, type Encoding } from '@turnstone/contracts/ingest';

/** Sample encodings a snapshot can carry, all little-endian. */
export type SampleEncoding = Encoding;

/** Encodings accepted by {@link decodeSamples}. */
export const SAMPLE_ENCODINGS: readonly SampleEncoding[] = encodings;

/** Bytes per sample of each encoding (the contracts' table). */
export const BYTES_PER_SAMPLE: Record<SampleEncoding, number> = bytesPerSample;

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
    for (let i = 0; i < n; i++) out[i] = finiteFloat32At(view, i);
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

function finiteFloat32At(view: DataView, i: number): number {
  const v = view.getFloat32(4 * i, true);
  if (!Number.isFinite(v)) throw new RangeError(`sample ${i} is not a finite number (${v})`);
  return v;
}

/**
 * Throws the RangeError {@link decodeSamples} would for the first NaN or infinity in
 * little-endian float32 bytes, without making an array of the values.
 */
export function checkFiniteFloat32(bytes: Uint8Array): void {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  for (let i = 0, n = Math.floor(bytes.length / 4); i < n; i++) finiteFloat32At(view, i);
}

/** Largest finite float32, (2 − 2^−23) · 2^127 (IEEE 754 binary32). */
const FLOAT32_MAX = 3.4028234663852886e38;

const INT_RANGE: Record<Exclude<SampleEncoding, 'float32'>, [number, number]> = {
  int16: [-32768, 32767],
  int24: [-8388608, 8388607],
  int32: [-2147483648, 2147483647],
};

/**
 * Writes `values` as little-endian samples into `view` from byte `offset`, unchecked (the
 * caller knows they fit: counts from a decoder, or values {@link encodeSamples} checked).
 */
export function putSamples(
  view: DataView,
  offset: number,
  values: ArrayLike<number>,
  encoding: SampleEncoding,
): void {
  const width = BYTES_PER_SAMPLE[encoding];
  for (let i = 0; i < values.length; i++) {
    const o = offset + i * width;
    const v = values[i]!;
    if (encoding === 'float32') view.setFloat32(o, v, true);
    else if (encoding === 'int16') view.setInt16(o, v, true);
    else if (encoding === 'int32') view.setInt32(o, v, true);
    else {
      view.setUint8(o, v & 0xff);
      view.setUint8(o + 1, (v >> 8) & 0xff);
      view.setUint8(o + 2, (v >> 16) & 0xff);
    }
  }
}

/**
 * Values (ADC counts for the integer encodings, numbers for float32) as the little-endian
 * bytes a gateway sends — the inverse of {@link decodeSamples}. Throws a RangeError naming
 * the first value that does not fit the encoding.
 */
export function encodeSamples(values: ArrayLike<number>, encoding: SampleEncoding): Uint8Array {
  if (encoding === 'float32') {
    for (let i = 0; i < values.length; i++) {
      const v = values[i]!;
      if (!Number.isFinite(v) || Math.abs(v) > FLOAT32_MAX)
        throw new RangeError(`samples[${i}] is not a finite float32`);
    }
  } else {
    const [lo, hi] = INT_RANGE[encoding];
    for (let i = 0; i < values.length; i++) {
      const v = values[i]!;
      if (!Number.isInteger(v) || v < lo || v > hi)
        throw new RangeError(`samples[${i}] = ${v} is not an ${encoding} integer`);
    }
  }
  const out = new Uint8Array(values.length * BYTES_PER_SAMPLE[encoding]);
  putSamples(new DataView(out.buffer), 0, values, encoding);
  return out;
}
