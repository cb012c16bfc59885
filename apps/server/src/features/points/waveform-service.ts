/**
 * The time waveform of a capture from its raw snapshot, and the raw capture as WAV or CSV.
 * Raw samples expire under the retention policy (410); spectra and trend values stay.
 */
import { decodeSamples, scaleToAcceleration, writeWav } from '@turnstone/dsp';

import type { Waveform } from '@turnstone/contracts/points';

import { AppError, notFound } from '../../lib/app-error.ts';
import type { AppContext } from '../../lib/context.ts';

import { type SessionUser } from '../../lib/session-user.ts';

import * as repo from './points-repository.ts';
import { accessibleAnalysis } from './points-service.ts';
import { storedSampleBytesAsync } from '../ingest/sample-storage.ts';

const iso = (d: Date) => d.toISOString();

/** The raw counts of an analysis' snapshot, or 410 when retention has dropped them. */
async function rawCounts(ctx: AppContext, user: SessionUser, analysisId: number) {
  const found = await accessibleAnalysis(ctx, user, analysisId);
  const snap = await repo.snapshotRow(ctx.db, found.analysis.snapshotId);
  if (!snap) throw notFound('Snapshot');
  if (!snap.samples)
    throw new AppError(
      'samples_expired',
      `The raw samples of this capture were removed by the retention policy${
        snap.samplesExpiredAt ? ` on ${snap.samplesExpiredAt.toISOString().slice(0, 10)}` : ''
      }; its spectra and trend values are kept.`,
      410,
    );
  const bytes = await storedSampleBytesAsync(snap.samples, snap.samplesCodec);
  const counts = decodeSamples(
    new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength),
    snap.encoding,
  );
  return { ...found, snap, counts };
}

export async function waveform(
  ctx: AppContext,
  user: SessionUser,
  analysisId: number,
): Promise<Waveform> {
  const { analysis, snap, counts } = await rawCounts(ctx, user, analysisId);
  const scale = {
    encoding: snap.encoding,
    bits: snap.adcBits,
    fullScaleV: snap.fullScaleV,
    sensitivityMvPerG: snap.sensitivityMvPerG,
  };
  const g = Float32Array.from(scaleToAcceleration(counts, scale));
  // Integer encodings: codes −2^(bits−1) … 2^(bits−1)−1 (bipolar ADC, Kester MT-001);
  // float32 samples are volts, so the rails are ± full scale.
  const half = 2 ** (snap.adcBits - 1);
  const [lowG, highG] =
    snap.encoding === 'float32'
      ? Array.from(scaleToAcceleration([-snap.fullScaleV, snap.fullScaleV], scale))
      : Array.from(scaleToAcceleration([-half, half - 1], scale));
  const findings = (analysis.qualityFindings ?? []) as Waveform['findings'];
  return {
    analysisId: analysis.id,
    takenAt: iso(analysis.takenAt),
    unit: 'g',
    sampleRateHz: snap.sampleRateHz,
    sampleCount: g.length,
    values: Buffer.from(g.buffer, g.byteOffset, g.byteLength).toString('base64'),
    rails: { lowG: lowG!, highG: highG! },
    clipped: findings.some((f) => f.code === 'clipped'),
    adcBits: snap.adcBits,
    bitsUsed: analysis.bitsUsed,
    verdict: analysis.qualityVerdict,
    findings,
  };
}

/** A file name safe for Content-Disposition: tag and UTC time, no spaces or colons. */
export function fileStem(tag: string, takenAt: Date): string {
  const t = takenAt
    .toISOString()
    .replace(/\.\d+Z$/, 'Z')
    .replace(/[:]/g, '');
  return `${tag.replace(/[^A-Za-z0-9._-]+/g, '_')}_${t}`;
}

/** The raw capture as a WAV file of its own counts (PCM) or volts (float32). */
export async function waveformWav(ctx: AppContext, user: SessionUser, analysisId: number) {
  const { point, snap, counts } = await rawCounts(ctx, user, analysisId);
  return {
    fileName: `${fileStem(point.tag, snap.takenAt)}.wav`,
    bytes: writeWav(counts, Math.round(snap.sampleRateHz), snap.encoding),
  };
}

/** The capture as CSV: time in seconds and acceleration in g, with a header row. */
export async function waveformCsv(ctx: AppContext, user: SessionUser, analysisId: number) {
  const { point, snap, counts } = await rawCounts(ctx, user, analysisId);
  const g = scaleToAcceleration(counts, {
    encoding: snap.encoding,
    bits: snap.adcBits,
    fullScaleV: snap.fullScaleV,
    sensitivityMvPerG: snap.sensitivityMvPerG,
  });
  const lines = ['time_s,acceleration_g'];
  for (let i = 0; i < g.length; i++)
    lines.push(`${(i / snap.sampleRateHz).toPrecision(9)},${g[i]!.toPrecision(7)}`);
  return { fileName: `${fileStem(point.tag, snap.takenAt)}.csv`, text: lines.join('\n') + '\n' };
}
