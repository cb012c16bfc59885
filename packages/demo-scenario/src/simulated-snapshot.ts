/**
 * One capture of one demo channel at one moment, ready to post or store: a stable uid
 * (the tag and the capture time, so a retry or a second run sends the same uid with the
 * same bytes), the counts as bytes and the metadata a gateway sends.
 */
import type { SnapshotIn } from '@turnstone/contracts/ingest';
import type { SimChannel } from './plant-channels.ts';
import { fnv1a } from '@turnstone/dsp/seeded-random';
import { encodeSamples } from '@turnstone/dsp/sample-codec';
import { storyRecipe } from './story-recipe.ts';
import { synthesizeCapture } from './synthesize-capture.ts';

export interface SimSnapshot {
  uid: string;
  pointTag: string;
  takenAt: Date;
  sampleRateHz: number;
  encoding: 'int16' | 'int24';
  bytes: Buffer;
  adc: { bits: number; fullScaleV: number };
  sensitivityMvPerG: number;
  speedRpm: number | null;
  tach: { pulseTimesS: number[]; pulsesPerRev: number } | null;
}

/** `MFP-P101-MDE-H@20261201T120000Z`: unique per point and capture time, never random. */
export function captureUid(tag: string, takenAt: Date): string {
  const stamp = takenAt
    .toISOString()
    .replace(/[-:]/g, '')
    .replace(/\.\d{3}Z$/, 'Z');
  return `${tag}@${stamp}`;
}

export function simulateSnapshot(
  channel: SimChannel,
  takenAt: Date,
  progress: number,
  options: { faults?: boolean } = {},
): SimSnapshot {
  const uid = captureUid(channel.tag, takenAt);
  const recipe = storyRecipe(channel, {
    progress,
    takenAtMs: takenAt.getTime(),
    seed: fnv1a(uid),
    faults: options.faults ?? true,
  });
  const cap = synthesizeCapture(recipe);
  return {
    uid,
    pointTag: channel.tag,
    takenAt,
    sampleRateHz: cap.sampleRateHz,
    encoding: cap.encoding,
    bytes: Buffer.from(encodeSamples(cap.counts, cap.encoding)),
    adc: cap.adc,
    sensitivityMvPerG: recipe.sensitivityMvPerG,
    // A gateway with a speed input reports it to 0.1 r/min; with a tach it sends the pulses.
    speedRpm: channel.speedInput === 'rpm' ? Math.round(cap.rpm * 10) / 10 : null,
    tach: channel.speedInput === 'tach' && cap.tach ? cap.tach : null,
  };
}

/** The JSON body item of `POST /api/ingest/v1/snapshots` (samples in base64). */
export function toIngestItem(s: SimSnapshot): SnapshotIn {
  return {
    uid: s.uid,
    pointTag: s.pointTag,
    takenAt: s.takenAt.toISOString(),
    sampleRateHz: s.sampleRateHz,
    encoding: s.encoding,
    samples: s.bytes.toString('base64'),
    adc: s.adc,
    sensor: { sensitivityMvPerG: s.sensitivityMvPerG },
    ...(s.speedRpm !== null ? { speedRpm: s.speedRpm } : {}),
    ...(s.tach ? { tach: s.tach } : {}),
  };
}
