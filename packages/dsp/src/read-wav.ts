import {
  BYTES_PER_SAMPLE,
  decodeSamples,
  putSamples,
  type SampleEncoding,
} from './sample-codec.ts';

/** A decoded WAV recording (one channel). */
export interface WavRecording {
  sampleRateHz: number;
  /** Container bits per sample from the header (16, 24 or 32). */
  bitsPerSample: number;
  /** Valid bits (WAVE_FORMAT_EXTENSIBLE) or bitsPerSample. */
  validBits: number;
  encoding: SampleEncoding;
  channels: number;
  /** The selected channel: counts for PCM, values for float. */
  samples: Int32Array | Float32Array;
}

/** Options for {@link readWav}. */
export interface ReadWavOptions {
  /** Channel to return (0-based). @default 0 */
  channel?: number;
}

const PCM = 1;
const IEEE_FLOAT = 3;
const EXTENSIBLE = 0xfffe;

function fourcc(bytes: Uint8Array, offset: number): string {
  return String.fromCharCode(
    bytes[offset]!,
    bytes[offset + 1]!,
    bytes[offset + 2]!,
    bytes[offset + 3]!,
  );
}

/** Where a WAV file's format and samples are: its fmt chunk and the place of its data chunk. */
export interface WavLayout {
  fmt: {
    format: number;
    channels: number;
    rate: number;
    blockAlign: number;
    bits: number;
    validBits: number;
  };
  data: { start: number; size: number };
  /** Whole frames the data chunk holds (its size ÷ block align; 0 when block align is 0). */
  frames: number;
}

/**
 * Walks the chunks of a RIFF/WAVE file without decoding a sample: cheap enough to bound a
 * file (frames from the header) before reading it. Throws an `Error` saying what is wrong
 * (not RIFF/WAVE, a truncated chunk, a missing fmt or data chunk).
 *
 * Source: Microsoft/IBM "Multimedia Programming Interface and Data Specifications 1.0"
 * (1991, RIFF/WAVE) and Microsoft's WAVEFORMATEXTENSIBLE documentation.
 */
export function readWavLayout(bytes: Uint8Array): WavLayout {
  if (!(bytes instanceof Uint8Array)) throw new TypeError('readWav expects a Uint8Array');
  if (bytes.length < 12 || fourcc(bytes, 0) !== 'RIFF' || fourcc(bytes, 8) !== 'WAVE') {
    throw new Error('not a WAV file: the RIFF/WAVE header is missing');
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let offset = 12;
  let fmt: WavLayout['fmt'] | null = null;
  let data: { start: number; size: number } | null = null;
  while (offset + 8 <= bytes.length) {
    const id = fourcc(bytes, offset);
    const size = view.getUint32(offset + 4, true);
    const start = offset + 8;
    if (start + size > bytes.length) {
      throw new Error(
        `invalid WAV: the "${id.trim()}" chunk claims ${size} bytes but only ${bytes.length - start} remain (truncated file or wrong header)`,
      );
    }
    if (id === 'fmt ') {
      if (size < 16)
        throw new Error(`invalid WAV: fmt chunk is ${size} bytes, expected at least 16`);
      let format = view.getUint16(start, true);
      const bits = view.getUint16(start + 14, true);
      let validBits = bits;
      if (format === EXTENSIBLE) {
        if (size < 40)
          throw new Error('invalid WAV: WAVE_FORMAT_EXTENSIBLE fmt chunk is shorter than 40 bytes');
        validBits = view.getUint16(start + 18, true) || bits;
        format = view.getUint16(start + 24, true);
      }
      fmt = {
        format,
        channels: view.getUint16(start + 2, true),
        rate: view.getUint32(start + 4, true),
        blockAlign: view.getUint16(start + 12, true),
        bits,
        validBits,
      };
    } else if (id === 'data') {
      data = { start, size };
    }
    offset = start + size + (size % 2);
  }
  if (offset < bytes.length && bytes.length - offset < 8 && !data) {
    throw new Error('invalid WAV: truncated chunk header');
  }
  if (!fmt) throw new Error('invalid WAV: no fmt chunk');
  if (!data) throw new Error('invalid WAV: no data chunk');
  const frames = fmt.blockAlign > 0 ? Math.floor(data.size / fmt.blockAlign) : 0;
  return { fmt, data, frames };
}

/** One channel of a WAV file as the little-endian sample bytes of its container, not decoded. */
export interface WavChannelBytes {
  sampleRateHz: number;
  /** Container bits per sample from the header (16, 24 or 32). */
  bitsPerSample: number;
  /** Valid bits (WAVE_FORMAT_EXTENSIBLE) or bitsPerSample. */
  validBits: number;
  encoding: SampleEncoding;
  channels: number;
  /** The selected channel's samples as stored in the file (a view of it for a mono file). */
  bytes: Uint8Array;
}

/**
 * The checks of {@link readWav} and the selected channel's sample bytes, without decoding
 * them: a mono file's data chunk is returned as a view, a multi-channel file's channel is
 * picked out frame by frame. Float samples are not yet checked for NaN or infinity.
 */
export function wavChannelBytes(bytes: Uint8Array, options: ReadWavOptions = {}): WavChannelBytes {
  const { fmt, data } = readWavLayout(bytes);

  let encoding: SampleEncoding;
  if (fmt.format === PCM && (fmt.bits === 16 || fmt.bits === 24 || fmt.bits === 32)) {
    encoding = fmt.bits === 16 ? 'int16' : fmt.bits === 24 ? 'int24' : 'int32';
  } else if (fmt.format === IEEE_FLOAT && fmt.bits === 32) {
    encoding = 'float32';
  } else {
    throw new Error(
      `unsupported WAV format: format code ${fmt.format} with ${fmt.bits} bits (use PCM 16/24/32-bit or float 32-bit)`,
    );
  }
  if (fmt.channels < 1) throw new Error('invalid WAV: zero channels');
  if (fmt.rate < 1) throw new Error('invalid WAV: sample rate is zero');
  const width = fmt.bits / 8;
  if (fmt.blockAlign !== width * fmt.channels) {
    throw new Error(
      `invalid WAV: block align ${fmt.blockAlign} does not match ${fmt.channels} × ${width} bytes`,
    );
  }
  const frames = Math.floor(data.size / fmt.blockAlign);
  if (frames === 0) throw new Error('invalid WAV: the data chunk holds no samples');
  if (data.size % fmt.blockAlign !== 0) {
    throw new Error(
      `invalid WAV: data size ${data.size} is not a whole number of ${fmt.blockAlign}-byte frames`,
    );
  }
  const channel = options.channel ?? 0;
  if (!Number.isInteger(channel) || channel < 0 || channel >= fmt.channels) {
    throw new RangeError(`channel ${channel} does not exist; the file has ${fmt.channels}`);
  }
  let raw = bytes.subarray(data.start, data.start + data.size);
  if (fmt.channels > 1) {
    const picked = new Uint8Array(frames * width);
    for (let f = 0; f < frames; f++) {
      const from = f * fmt.blockAlign + channel * width;
      picked.set(raw.subarray(from, from + width), f * width);
    }
    raw = picked;
  }
  return {
    sampleRateHz: fmt.rate,
    bitsPerSample: fmt.bits,
    validBits: Math.min(fmt.validBits, fmt.bits),
    encoding,
    channels: fmt.channels,
    bytes: raw,
  };
}

/**
 * Parses a RIFF/WAVE file held in memory: PCM 16/24/32-bit or IEEE float 32-bit, plain
 * or WAVE_FORMAT_EXTENSIBLE, any channel count (one is returned). Rejects anything else
 * with an `Error` whose message says what is wrong: not RIFF/WAVE, a truncated chunk, a
 * data chunk claiming more bytes than the file holds, missing fmt/data, zero samples,
 * unsupported formats and non-finite float samples.
 *
 * Source: Microsoft/IBM "Multimedia Programming Interface and Data Specifications 1.0"
 * (1991, RIFF/WAVE) and Microsoft's WAVEFORMATEXTENSIBLE documentation.
 */
export function readWav(bytes: Uint8Array, options: ReadWavOptions = {}): WavRecording {
  const { bytes: raw, ...wav } = wavChannelBytes(bytes, options);
  let samples: Int32Array | Float32Array;
  try {
    samples = decodeSamples(raw, wav.encoding);
  } catch (error) {
    throw new Error(`invalid WAV: ${(error as Error).message}`);
  }
  return { ...wav, samples };
}

/**
 * Writes a mono WAV file in memory (PCM 16/24/32 from integer counts, or float 32) —
 * the inverse of {@link readWav}, for tests, fixtures and exports.
 *
 * Source: RIFF/WAVE specification (1991).
 */
export function writeWav(
  samples: ArrayLike<number>,
  sampleRateHz: number,
  encoding: SampleEncoding,
): Uint8Array {
  const width = BYTES_PER_SAMPLE[encoding];
  const dataSize = samples.length * width;
  const bytes = new Uint8Array(44 + dataSize + (dataSize % 2));
  const view = new DataView(bytes.buffer);
  const ascii = (o: number, s: string): void => {
    for (let i = 0; i < 4; i++) bytes[o + i] = s.charCodeAt(i);
  };
  ascii(0, 'RIFF');
  view.setUint32(4, bytes.length - 8, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  view.setUint32(16, 16, true);
  view.setUint16(20, encoding === 'float32' ? IEEE_FLOAT : PCM, true);
  view.setUint16(22, 1, true);
  view.setUint32(24, sampleRateHz, true);
  view.setUint32(28, sampleRateHz * width, true);
  view.setUint16(32, width, true);
  view.setUint16(34, width * 8, true);
  ascii(36, 'data');
  view.setUint32(40, dataSize, true);
  putSamples(view, 44, samples, encoding);
  return bytes;
}
