/**
 * Reads an uploaded recording (WAV or CSV, the content decides) into the sample bytes a
 * snapshot stores. CPU-bound and up to a second for the largest accepted file, so the
 * server runs it in a worker thread (upload-pool.ts), never on the event loop; it imports
 * nothing of the server but the sample encoding.
 */
import { createHash } from 'node:crypto';
import {
  CSV_DEFAULT_BITS,
  CSV_DEFAULT_FULL_SCALE_V,
  readCsv,
  wavCaptureBytes,
} from '@turnstone/dsp';
import { MAX_SAMPLES, MIN_SAMPLES } from '@turnstone/contracts/ingest';
import { encodeSamples } from '@turnstone/dsp/sample-codec';
import { isWavBytes, looksLikeText, tooManySamples } from './upload-bounds.ts';

export interface ReadRecordingInput {
  bytes: Uint8Array;
  bits?: number | undefined;
  fullScaleV?: number | undefined;
  sampleRateHz?: number | undefined;
  unit: 'g' | 'volts';
  sensitivityMvPerG: number;
}

export type ReadRecordingResult =
  | {
      ok: true;
      encoding: 'int16' | 'int24' | 'int32' | 'float32';
      sampleBytes: Uint8Array;
      sampleRateHz: number;
      adcBits: number;
      fullScaleV: number;
      count: number;
      /** SHA-256 of the file as sent, hex. */
      digest: string;
    }
  | { ok: false; status: 400 | 413; message: string };

const bad = (message: string) => ({ ok: false as const, status: 400 as const, message });

export function readRecording(input: ReadRecordingInput): ReadRecordingResult {
  const { bytes } = input;
  let encoding: 'int16' | 'int24' | 'int32' | 'float32';
  let sampleBytes: Uint8Array;
  let sampleRateHz: number;
  let adcBits: number;
  let fullScaleV: number;
  let count: number;
  if (isWavBytes(bytes)) {
    // The same reading as the analyzer CLI: full scale of the container (PCM samples are
    // left-justified), float 1.0 = full scale; float samples are stored as volts. The file's
    // sample bytes are stored as they are where they already hold the stored values.
    let wav;
    try {
      wav = wavCaptureBytes(bytes, {
        ...(input.bits === undefined ? {} : { bits: input.bits }),
        ...(input.fullScaleV === undefined ? {} : { fullScaleV: input.fullScaleV }),
      });
    } catch (err) {
      return bad(`Not a readable WAV file: ${(err as Error).message}`);
    }
    encoding = wav.encoding;
    sampleRateHz = wav.sampleRateHz;
    adcBits = wav.adc.bits;
    fullScaleV = wav.adc.fullScaleV;
    count = wav.count;
    if (count > MAX_SAMPLES) return { ok: false, status: 413, message: tooManySamples(count) };
    sampleBytes = wav.sampleBytes;
  } else if (looksLikeText(bytes)) {
    let csv;
    try {
      csv = readCsv(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('utf8'));
    } catch (err) {
      return bad(`Not a readable CSV file: ${(err as Error).message}`);
    }
    const rate = csv.sampleRateHz ?? input.sampleRateHz;
    if (!rate) return bad('This CSV has no time column: give the sample rate (sampleRateHz).');
    sampleRateHz = rate;
    encoding = 'float32';
    adcBits = input.bits ?? CSV_DEFAULT_BITS;
    fullScaleV = input.fullScaleV ?? CSV_DEFAULT_FULL_SCALE_V;
    count = csv.values.length;
    if (count > MAX_SAMPLES) return { ok: false, status: 413, message: tooManySamples(count) };
    const toVolts = input.unit === 'g' ? input.sensitivityMvPerG / 1000 : 1;
    const volts = csv.values;
    if (toVolts !== 1) for (let i = 0; i < volts.length; i++) volts[i] = volts[i]! * toVolts;
    try {
      sampleBytes = Buffer.from(encodeSamples(volts, 'float32'));
    } catch (err) {
      return bad(`Not a usable CSV file: ${(err as Error).message}`);
    }
  } else {
    return bad('The file is neither WAV (RIFF/WAVE) nor CSV text.');
  }
  if (count < MIN_SAMPLES)
    return bad(
      `The recording holds ${count} samples; ${MIN_SAMPLES} to ${MAX_SAMPLES} are accepted.`,
    );
  if (sampleRateHz < 100 || sampleRateHz > 1_000_000)
    return bad(`Sample rate ${sampleRateHz} Hz is outside 100 Hz to 1 MHz.`);
  const digest = createHash('sha256').update(bytes).digest('hex');
  return { ok: true, encoding, sampleBytes, sampleRateHz, adcBits, fullScaleV, count, digest };
}
