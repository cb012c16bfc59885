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
 * Each capture's cost is constant: the first capture of each (point, bucket) of a batch and
 * the first capture after each limit change are one index seek each with constant bounds,
 * never a scan of the point's earlier captures per capture.
 */
import { setTimeout as sleep } from 'node:timers/promises';
import type { Db } from '@turnstone/db/client';
import type { RetentionPolicyView } from '@turnstone/contracts/retention';
import {
  clearRawSamples,
  clearSpectra,
  firstAnalysesFrom,
  firstCapturesAfterLimitChanges,
  maxAnalysisId,
  maxSnapshotId,
  rawSampleCandidates,
  thinningCandidateRows,
  type TimeSpan,
} from './retention-repository.ts';

import { dropExpiredPartitions } from './partitions.ts';
import type { Config } from '../../config.ts';

/** When the worker runs the nightly retention pass (node-cron, server time). */
export const RETENTION_CRON = '45 2 * * *';

/**
 * The policy the retention pass follows: the contract's view of it (each field documented
 * there) without the schedule. `batchSize`: rows per batch (one SELECT and one UPDATE);
 * `batchPauseMs`: the pause between batches.
 */
export type RetentionPolicy = Omit<RetentionPolicyView, 'schedule'>;

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
 * non-empty batch of rows to `update`, pausing between batches. `select` returns at most
 * `limit` rows in ascending id order; exactly `limit` means more may follow after the last.
 */
async function inBatches<R extends { id: number }>(
  maxId: number,
  opts: Required<BatchOptions>,
  select: (lo: number, hi: number, limit: number) => Promise<R[]>,
  update: (rows: R[]) => Promise<number>,
): Promise<PassResult> {
  let cursor = 0;
  let rows = 0;
  let batches = 0;
  while (cursor < maxId) {
    const hi = Math.min(cursor + opts.scanSpan, maxId);
    const got = await select(cursor, hi, opts.batchSize);
    cursor = got.length === opts.batchSize ? got[got.length - 1]!.id : hi;
    if (got.length === 0) continue;
    rows += await update(got);
    batches++;
    if (opts.batchPauseMs > 0) await sleep(opts.batchPauseMs);
  }
  return { rows, batches };
}

/**
 * A `select` for `inBatches` out of one whose rows the pass still sifts: `kept` names those
 * of a read that stay. Reads on after the last row read until it has `limit` rows or (lo, hi]
 * is done, so the contract of `inBatches` holds.
 */
function sifted<R extends { id: number }>(
  select: (lo: number, hi: number, limit: number) => Promise<R[]>,
  kept: (rows: R[]) => Promise<Set<number>>,
) {
  return async (lo: number, hi: number, limit: number): Promise<R[]> => {
    const out: R[] = [];
    let cursor = lo;
    for (;;) {
      const rows = await select(cursor, hi, limit);
      const keep = rows.length ? await kept(rows) : new Set<number>();
      for (const r of rows) {
        if (keep.has(r.id)) continue;
        out.push(r);
        if (out.length === limit) return out;
      }
      if (rows.length < limit) return out;
      cursor = rows[rows.length - 1]!.id;
    }
  };
}

/** The analyses that are the first capture of their point after a change of its limits. */
async function firstAfterLimitChanges(db: Db, before: Date): Promise<Set<number>> {
  return new Set((await firstCapturesAfterLimitChanges(db, before)).map((r) => r.id));
}

const HOUR_MS = 3_600_000;

/** The bucket whose first capture keeps its spectra: the UTC day before `dailyCutoff`, else the UTC hour. */
function bucketOf(pointId: number, takenAt: Date, dailyCutoff: Date): TimeSpan {
  const t = takenAt.getTime();
  const size = t < dailyCutoff.getTime() ? DAY_MS : HOUR_MS;
  const from = t - (((t % size) + size) % size);
  return { pointId, from: new Date(from), to: new Date(from + size) };
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
  const afterLimits = await firstAfterLimitChanges(db, now);
  return inBatches(
    await maxSnapshotId(db),
    o,
    sifted(
      (lo, hi, limit) => rawSampleCandidates(db, cutoff, win, lo, hi, limit),
      async (rows) =>
        new Set(
          rows
            .filter((r) => r.analysisId !== null && afterLimits.has(r.analysisId))
            .map((r) => r.id),
        ),
    ),
    (rows) =>
      clearRawSamples(
        db,
        rows.map((r) => r.id),
      ),
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
  // A change at or after the whole tier's start is followed by captures of that tier only.
  const afterLimits = await firstAfterLimitChanges(db, cut.wholeCutoff);
  return inBatches(
    await maxAnalysisId(db),
    o,
    sifted(
      (lo, hi, limit) => thinningCandidateRows(db, cut, lo, hi, limit),
      async (rows) => {
        const buckets = new Map<string, TimeSpan>();
        for (const r of rows) {
          const b = bucketOf(r.pointId, r.takenAt, cut.dailyCutoff);
          buckets.set(`${b.pointId}/${b.from.getTime()}`, b);
        }
        const firsts = await firstAnalysesFrom(db, [...buckets.values()]);
        const keep = new Set(firsts.map((f) => f.id));
        for (const r of rows) if (afterLimits.has(r.id)) keep.add(r.id);
        return keep;
      },
    ),
    (rows) => clearSpectra(db, rows, now),
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
