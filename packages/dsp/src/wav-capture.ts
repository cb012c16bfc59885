import {
  checkFiniteFloat32,
  decodeSamples,
  encodeSamples,
  type SampleEncoding,
} from './sample-codec.ts';
import { wavChannelBytes } from './read-wav.ts';
import { checkAdc } from './scale-samples.ts';

/** A WAV file as a capture: samples in the form the analysis reads, with the ADC facts. */
export interface WavCapture {
  /** Codes of an `adc.bits` converter (PCM), or volts (float). */
  samples: Int32Array | Float32Array;
  encoding: SampleEncoding;
  sampleRateHz: number;
  /** Resolution and the volts at code 2^(bits−1) (PCM) or at 1.0 (float). */
  adc: { bits: number; fullScaleV: number };
  /** Bits per sample of the file's container, and of them the valid ones. */
  container: { bits: number; validBits: number };
}

/** A WAV file as the sample bytes a capture stores, with the same facts as {@link WavCapture}. */
export interface WavCaptureBytes extends Omit<WavCapture, 'samples'> {
  /** Little-endian samples in `encoding` (sample-codec.ts): what a gateway would send. */
  sampleBytes: Uint8Array;
  count: number;
}

/** Options for {@link wavCapture}. */
export interface WavCaptureOptions {
  /**
   * ADC resolution. For PCM it may be less than the container (the valid bits sit at the
   * top of it); for float WAV it only serves the quality checks.
   * @default the file's valid bits (PCM); 24 (float)
   */
  bits?: number;
  /** Volts at full scale: at code 2^(bits−1) for PCM, at 1.0 for float. @default 1.0 */
  fullScaleV?: number;
  /** Channel to read (0-based). @default 0 */
  channel?: number;
}

/**
 * Reads a WAV file as a capture, one convention for every path that accepts WAV (the
 * analyzer CLI and uploads): full scale is the container's full scale, and float 1.0 is
 * the same full scale as the largest integer code, both `fullScaleV` volts.
 *
 * PCM samples are left-justified in their container (WAVE_FORMAT_EXTENSIBLE with fewer
 * valid bits than the container: the unused low bits are zero), so a 20-bit code in a
 * 24-bit container is the code × 16. The codes returned are those of a `bits` converter
 * (container value ÷ 2^(container − bits)), which gives the same volts as scaling the
 * container by its own width, and lets the quality checks count bits of the real ADC.
 * Float samples come back as volts (value × fullScaleV).
 *
 * Sources: Microsoft, "WAVEFORMATEXTENSIBLE structure" (mmreg.h documentation:
 * wValidBitsPerSample, container size wBitsPerSample); Microsoft/IBM RIFF/WAVE
 * specification (1991) for PCM and IEEE float.
 */
export function wavCapture(bytes: Uint8Array, options: WavCaptureOptions = {}): WavCapture {
  const { sampleBytes, count: _count, ...capture } = wavCaptureBytes(bytes, options);
  return { ...capture, samples: decodeSamples(sampleBytes, capture.encoding) };
}

/**
 * {@link wavCapture} as the sample bytes a capture stores, for a path that stores rather than
 * analyses (uploads). Where the stored values are the file's own — PCM whose ADC bits fill the
 * container, float at a full scale of 1 V — the file's bytes are kept as they are, checked but
 * never decoded to an array; otherwise the codes are shifted or the volts scaled.
 */
export function wavCaptureBytes(
  bytes: Uint8Array,
  options: WavCaptureOptions = {},
): WavCaptureBytes {
  const wav = wavChannelBytes(
    bytes,
    options.channel === undefined ? {} : { channel: options.channel },
  );
  const fullScaleV = options.fullScaleV ?? 1;
  const container = { bits: wav.bitsPerSample, validBits: wav.validBits };
  const count = wav.bytes.length / (wav.bitsPerSample / 8);
  const of = (sampleBytes: Uint8Array, encoding: SampleEncoding, bits: number) => ({
    sampleBytes,
    count,
    encoding,
    sampleRateHz: wav.sampleRateHz,
    adc: { bits, fullScaleV },
    container,
  });
  if (wav.encoding === 'float32') {
    try {
      checkFiniteFloat32(wav.bytes);
    } catch (error) {
      throw new Error(`invalid WAV: ${(error as Error).message}`);
    }
    const bits = options.bits ?? 24;
    checkAdc(bits, fullScaleV);
    if (fullScaleV === 1) return of(wav.bytes.slice(), 'float32', bits);
    const volts = new Float32Array(decodeSamples(wav.bytes, 'float32'));
    for (let i = 0; i < volts.length; i++) volts[i] = volts[i]! * fullScaleV;
    return of(encodeSamples(volts, 'float32'), 'float32', bits);
  }
  const bits = options.bits ?? wav.validBits;
  checkAdc(bits, fullScaleV);
  if (bits > wav.bitsPerSample) {
    throw new RangeError(
      `ADC bits ${bits} exceed the file's ${wav.bitsPerSample}-bit samples; give at most ${wav.bitsPerSample}`,
    );
  }
  if (bits === wav.bitsPerSample) return of(wav.bytes.slice(), wav.encoding, bits);
  const step = 2 ** (wav.bitsPerSample - bits);
  const codes = decodeSamples(wav.bytes, wav.encoding);
  for (let i = 0; i < codes.length; i++) codes[i] = Math.floor(codes[i]! / step);
  return of(encodeSamples(codes, wav.encoding), wav.encoding, bits);
}
