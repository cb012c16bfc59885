/** Deterministic test captures: tones of known amplitude in ADC counts. Not demo data. */
import { mulberry32 } from '@turnstone/dsp/seeded-random';
import { encodeSamples } from '@turnstone/dsp/sample-codec';
import { writeWav } from '@turnstone/dsp/read-wav';

/** Mulberry32, seeded, so every run sends the same noise. */
export const prng = mulberry32;

export interface ToneOptions {
  n?: number;
  fs?: number;
  /** Tones: frequency (Hz) and peak amplitude (g). */
  tones?: { hz: number; peakG: number }[];
  noiseG?: number;
  sensitivityMvPerG?: number;
  bits?: number;
  fullScaleV?: number;
  seed?: number;
}

/** int16 counts of the tones, as a gateway with the given ADC would send them. */
export function toneCounts(o: ToneOptions = {}): Int16Array {
  const n = o.n ?? 4096;
  const fs = o.fs ?? 10240;
  const tones = o.tones ?? [{ hz: 24.7, peakG: 0.5 }];
  const sens = (o.sensitivityMvPerG ?? 100) / 1000; // V per g
  const bits = o.bits ?? 16;
  const fullScale = o.fullScaleV ?? 5;
  const countsPerV = 2 ** (bits - 1) / fullScale;
  const rand = prng(o.seed ?? 1);
  const out = new Int16Array(n);
  for (let i = 0; i < n; i++) {
    let g = 0;
    for (const t of tones) g += t.peakG * Math.sin((2 * Math.PI * t.hz * i) / fs);
    g += (o.noiseG ?? 0.005) * (rand() + rand() + rand() - 1.5);
    const c = Math.round(g * sens * countsPerV);
    out[i] = Math.max(-32768, Math.min(32767, c));
  }
  return out;
}

export function base64Of(counts: Int16Array): string {
  return Buffer.from(encodeSamples(counts, 'int16')).toString('base64');
}

/** An ingest body for one snapshot of `pointTag`. */
export function snapshotBody(
  pointTag: string,
  uid: string,
  o: ToneOptions & { takenAt?: string; speedRpm?: number } = {},
) {
  const counts = toneCounts(o);
  return {
    uid,
    pointTag,
    takenAt: o.takenAt ?? new Date().toISOString(),
    sampleRateHz: o.fs ?? 10240,
    encoding: 'int16',
    samples: base64Of(counts),
    adc: { bits: o.bits ?? 16, fullScaleV: o.fullScaleV ?? 5 },
    sensor: { sensitivityMvPerG: o.sensitivityMvPerG ?? 100 },
    ...(o.speedRpm ? { speedRpm: o.speedRpm } : {}),
  };
}

/**
 * The upload form of a route recording from a portable instrument: 8192 samples at 10240 Hz
 * of `tones` over 0.001 g of noise (seeded), from a 100 mV/g sensor on a ±5 V, 16-bit range,
 * as a WAV file, with the shaft speed and the time taken.
 */
export function routeRecordingForm(o: {
  tones: ToneOptions['tones'];
  seed: number;
  speedRpm: number;
  takenAt: string;
  fileName: string;
}): FormData {
  const counts = toneCounts({ n: 8192, fs: 10240, tones: o.tones, noiseG: 0.001, seed: o.seed });
  const form = new FormData();
  const fields = {
    sensitivityMvPerG: '100',
    fullScaleV: '5',
    bits: '16',
    speedRpm: String(o.speedRpm),
    takenAt: o.takenAt,
  };
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  const wav = writeWav(counts, 10240, 'int16');
  form.append('file', new Blob([wav as Uint8Array<ArrayBuffer>]), o.fileName);
  return form;
}
