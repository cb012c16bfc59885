import type { SampleEncoding } from './sample-codec.ts';
import { readWav } from './read-wav.ts';
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
  const wav = readWav(bytes, options.channel === undefined ? {} : { channel: options.channel });
  const fullScaleV = options.fullScaleV ?? 1;
  const container = { bits: wav.bitsPerSample, validBits: wav.validBits };
  if (wav.encoding === 'float32') {
    const bits = options.bits ?? 24;
    checkAdc(bits, fullScaleV);
    const volts = new Float32Array(wav.samples.length);
    for (let i = 0; i < volts.length; i++) volts[i] = wav.samples[i]! * fullScaleV;
    return {
      samples: volts,
      encoding: 'float32',
      sampleRateHz: wav.sampleRateHz,
      adc: { bits, fullScaleV },
      container,
    };
  }
  const bits = options.bits ?? wav.validBits;
  checkAdc(bits, fullScaleV);
  if (bits > wav.bitsPerSample) {
    throw new RangeError(
      `ADC bits ${bits} exceed the file's ${wav.bitsPerSample}-bit samples; give at most ${wav.bitsPerSample}`,
    );
  }
  const step = 2 ** (wav.bitsPerSample - bits);
  const codes = new Int32Array(wav.samples.length);
  for (let i = 0; i < codes.length; i++) codes[i] = Math.floor(wav.samples[i]! / step);
  return {
    samples: codes,
    encoding: wav.encoding,
    sampleRateHz: wav.sampleRateHz,
    adc: { bits, fullScaleV },
    container,
  };
}
