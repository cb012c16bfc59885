/**
 * Tiered retention: what a plant-year of captures keeps.
 *
 * Spectra (the policy; defaults are common practice, no source):
 * - younger than `spectraWholeDays` (14): every capture keeps its spectra;
 * - then until `spectraHourlyDays` (90): the first capture of each point in each UTC hour;
 * - older: the first capture of each point in each UTC day (for ever).
 * The hourly/daily boundary is moved back to a UTC midnight, so a day's captures are all in
 * the same tier and every bucket keeps exactly its first capture.
 *
 * Always kept whole, whatever their age:
 * - captures of a point taken within ±`keepWindowMinutes` (60) of any event of one of its
 *   alerts (raised, escalated, acknowledged — with its note — cleared), and the capture at
 *   an alert's peak;
 * - captures of a point taken within ±`keepWindowMinutes` of the creation of a finding on
 *   that point (findings name a point and an alert, not a capture);
 * - the capture a `suspect` quality notice refers to (where a point's captures turned suspect;
 *   unusable captures are thinned like any other, or a dead sensor would keep them all);
 * - uploads (`snapshots.source = 'upload'`);
 * - captures a person pinned (`capture_pins`);
 * - the first capture of a point after each change of its limits (the audit log's
 *   `limits.update` / `limits.baseline` entries, and the point's limit set's `updated_at`).
 *
 * Thinning clears `spectra` and the four float32 columns of the rows written before it,
 * sets `spectra_thinned_at`, and drops the capture's raw waveform (a capture is either whole
 * or thinned), and with the spectra their stored detail (axes, peaks, fault frequencies:
 * features/points/stored-summary.ts); scalars, band values, summary and diagnosis stay,
 * so trends and alert history are whole.
 *
 * Raw waveforms of the captures that keep their spectra have a further horizon,
 * `RETENTION_DAYS` (90, by received time): they are five times larger than the compact
 * spectra. The captures kept whole above keep theirs for ever.
 *
 * Past the last tier, a capture horizon (`CAPTURE_RETENTION_MONTHS`, 0 = for ever, the
 * default) drops whole months — their partitions of snapshots, analyses and band_values —
 * where no capture kept whole lives (partitions.ts); months holding one stay and are thinned.
 *
 * Both passes work in bounded batches (a SELECT of at most `batchSize` ids over at most
 * `scanSpan` primary keys, then an UPDATE of those ids by primary key, then a pause), so no
 * statement holds locks on more than one batch of rows and ingest is never waiting long.
 */
import { setTimeout as sleep } from 'node:timers/promises';
import type { Db } from '@turnstone/db/client';
import {
  clearRawSamples,
  clearSpectra,
  maxAnalysisId,
  maxSnapshotId,
  rawSampleCandidates,
  thinningCandidateIds,
} from './retention-repository.ts';

import { dropExpiredPartitions } from './partitions.ts';
import type { Config } from '../../config.ts';

/** When the worker runs the nightly retention pass (node-cron, server time). */
export const RETENTION_CRON = '45 2 * * *';

export interface RetentionPolicy {
  /** Days raw waveforms are kept (received time); 0 keeps them for ever. */
  rawSamplesDays: number;
  /** Days every capture keeps its spectra; 0 turns spectra thinning off. */
  spectraWholeDays: number;
  /** Days (from now) until which one capture per point per hour keeps its spectra. */
  spectraHourlyDays: number;
  /** Months captures are kept at all (whole months dropped past it); 0 keeps them for ever. */
  captureMonths: number;
  /** Captures within ± this many minutes of an alert event or a finding stay whole. */
  keepWindowMinutes: number;
  /** Rows per batch (one SELECT and one UPDATE). */
  batchSize: number;
  /** Pause between batches (ms). */
  batchPauseMs: number;
}

/** The policy of a configuration (`RETENTION_*` and `SPECTRA_*` keys of config.ts). */
export function retentionPolicy(config: Config): RetentionPolicy {
  return {
    rawSamplesDays: config.RETENTION_DAYS,
    spectraWholeDays: config.SPECTRA_WHOLE_DAYS,
    spectraHourlyDays: config.SPECTRA_HOURLY_DAYS,
    captureMonths: config.CAPTURE_RETENTION_MONTHS,
    keepWindowMinutes: config.RETENTION_KEEP_WINDOW_MIN,
    batchSize: config.RETENTION_BATCH_SIZE,
    batchPauseMs: config.RETENTION_BATCH_PAUSE_MS,
  };
}

export interface PassResult {
  /** Rows changed. */
  rows: number;
  /** Batches that changed rows. */
  batches: number;
}

interface BatchOptions {
  batchSize?: number;
  batchPauseMs?: number;
  /** Primary keys one SELECT looks at, at most (bounds a statement over long kept runs). */
  scanSpan?: number;
}

const DAY_MS = 86_400_000;

/** `now - days`, moved back to the UTC midnight before it. */
function midnightBefore(now: Date, days: number): Date {
  const t = now.getTime() - days * DAY_MS;
  return new Date(t - (((t % DAY_MS) + DAY_MS) % DAY_MS));
}

/**
 * Runs `select(lo, hi, limit)` over primary keys (lo, hi] in spans of `scanSpan`, hands each
 * non-empty batch of ids to `update`, pausing between batches.
 */
async function inBatches(
  maxId: number,
  opts: Required<BatchOptions>,
  select: (lo: number, hi: number, limit: number) => Promise<number[]>,
  update: (ids: number[]) => Promise<number>,
): Promise<PassResult> {
  let cursor = 0;
  let rows = 0;
  let batches = 0;
  while (cursor < maxId) {
    const hi = Math.min(cursor + opts.scanSpan, maxId);
    const ids = await select(cursor, hi, opts.batchSize);
    cursor = ids.length === opts.batchSize ? ids[ids.length - 1]! : hi;
    if (ids.length === 0) continue;
    rows += await update(ids);
    batches++;
    if (opts.batchPauseMs > 0) await sleep(opts.batchPauseMs);
  }
  return { rows, batches };
}

function batchOptions(o: BatchOptions): Required<BatchOptions> {
  const batchSize = Math.max(1, Math.floor(o.batchSize ?? 500));
  return {
    batchSize,
    batchPauseMs: o.batchPauseMs ?? 0,
    scanSpan: Math.max(batchSize, o.scanSpan ?? batchSize * 50),
  };
}

/**
 * Drops raw waveforms older than `days` (received time); analyses, spectra and trends stay.
 * Only analysed snapshots lose samples, so nothing still queued is cut, and the captures
 * kept whole (pinned, uploads, within ±`keepWindowMinutes` of an alert event or a finding…)
 * keep theirs. 0 keeps all. Returns the number of snapshots that lost their samples.
 */
export async function expireRawSamples(
  db: Db,
  days: number,
  now = new Date(),
  opts: BatchOptions & { keepWindowMinutes?: number } = {},
): Promise<number> {
  return (await expireRawSamplesPass(db, days, now, opts)).rows;
}

export async function expireRawSamplesPass(
  db: Db,
  days: number,
  now = new Date(),
  opts: BatchOptions & { keepWindowMinutes?: number } = {},
): Promise<PassResult> {
  if (days <= 0) return { rows: 0, batches: 0 };
  const cutoff = new Date(now.getTime() - days * DAY_MS);
  const win = Math.max(0, Math.floor(opts.keepWindowMinutes ?? 60));
  const o = batchOptions(opts);
  return inBatches(
    await maxSnapshotId(db),
    o,
    (lo, hi, limit) => rawSampleCandidates(db, cutoff, win, lo, hi, limit),
    (ids) => clearRawSamples(db, ids),
  );
}

export { thinningCandidates } from './retention-repository.ts';

/** The tier boundaries of a pass at `now`. */
export function thinningCutoffs(
  policy: Pick<RetentionPolicy, 'spectraWholeDays' | 'spectraHourlyDays' | 'keepWindowMinutes'>,
  now: Date,
) {
  return {
    wholeCutoff: new Date(now.getTime() - policy.spectraWholeDays * DAY_MS),
    dailyCutoff: midnightBefore(now, Math.max(policy.spectraHourlyDays, policy.spectraWholeDays)),
    win: Math.max(0, Math.floor(policy.keepWindowMinutes)),
  };
}

/**
 * Clears the spectra of captures outside their tier's keep set (see the file comment);
 * `now` fixes the tiers. Returns the rows thinned and the batches it took.
 */
export async function thinSpectra(
  db: Db,
  policy: Pick<RetentionPolicy, 'spectraWholeDays' | 'spectraHourlyDays' | 'keepWindowMinutes'>,
  now = new Date(),
  opts: BatchOptions = {},
): Promise<PassResult> {
  if (policy.spectraWholeDays <= 0) return { rows: 0, batches: 0 };
  const cut = thinningCutoffs(policy, now);
  const o = batchOptions(opts);
  return inBatches(
    await maxAnalysisId(db),
    o,
    (lo, hi, limit) => thinningCandidateIds(db, cut, lo, hi, limit),
    (ids) => clearSpectra(db, ids, now),
  );
}

/** The nightly pass: drop months past the horizon, thin spectra, then expire raw waveforms. */
export async function runRetention(
  db: Db,
  policy: RetentionPolicy,
  now = new Date(),
): Promise<{ thinned: PassResult; expired: PassResult; droppedMonths: string[] }> {
  const opts = { batchSize: policy.batchSize, batchPauseMs: policy.batchPauseMs };
  const droppedMonths = await dropExpiredPartitions(
    db,
    policy.captureMonths,
    policy.keepWindowMinutes,
    now,
  );
  const thinned = await thinSpectra(db, policy, now, opts);
  const expired = await expireRawSamplesPass(db, policy.rawSamplesDays, now, {
    ...opts,
    keepWindowMinutes: policy.keepWindowMinutes,
  });
  return { thinned, expired, droppedMonths };
}
