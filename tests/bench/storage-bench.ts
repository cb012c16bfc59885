/**
 * Bytes on disk per capture (issue 18): demo-plant captures from the gateway simulator
 * (every channel of both sites, its story advancing over the run, so spectra vary) posted
 * through ingest, drained by one in-process worker (the real analysis and persistence
 * path), then InnoDB data + index bytes per table from information_schema.TABLES after
 * ANALYZE TABLE, and the tablespace files' allocated bytes, divided by the captures.
 *
 * Reference measured in the same run: the bytes the spectra of those same analyses take as
 * float64 (8 bytes a line, summed over the four spectra the worker produced). Issue 18's
 * plant-year target is ≤ 2 kB per capture amortised after retention thinning.
 *
 * Then the tiered retention pass (apps/server/src/features/worker/retention.ts, default
 * policy) runs over the same captures at simulated ages — all in the hourly tier, then all
 * in the daily tier, then raw waveforms past RETENTION_DAYS — each measured as thinning left
 * it and after the nightly compaction's online rebuild (compaction.ts) — InnoDB keeps the
 * pages thinning emptied until a rebuild; the figures are the rebuilt ones
 * measurement (InnoDB reuses freed pages but does not return them on its own), and the
 * plant-year amortised bytes per capture are worked out from the measured whole and thinned
 * row sizes for the captures' cadence. BENCH_STORAGE_COUNT (3000) captures.
 *
 * Then one point's year at the real cadence (storage-year.ts): trend and fleet API times
 * against raw queries, and ingest p99 with and without the retention pass running.
 */
import { simulateSnapshot, toIngestItem } from '@turnstone/demo-scenario/simulated-snapshot';
import { demoChannels } from '@turnstone/demo-scenario/plant-channels';
import { createWorker } from '../../apps/server/src/features/worker/worker.ts';
import {
  expireRawSamplesPass,
  retentionPolicy,
  thinningCandidates,
  thinningCutoffs,
  thinSpectra,
} from '../../apps/server/src/features/worker/retention.ts';
import { loadConfig } from '../../apps/server/src/config.ts';
import {
  DONE_JOBS_KEEP_DAYS,
  runCompaction,
} from '../../apps/server/src/features/worker/compaction.ts';
import { sql } from 'drizzle-orm';
import { decodeSpectra } from '@turnstone/db/spectra-codec';
import { createGatewayKey, signInCookie, startBenchServer } from './bench-support.ts';
import { plantYearFigures } from './storage-year.ts';
import { existingTables, printComposition } from './storage-composition.ts';

const COUNT = Number(process.env.BENCH_STORAGE_COUNT ?? 3000);
const POST_BATCH = 10;
/** BENCH_STORAGE_YEAR=0 skips the plant-year part (trend, fleet, ingest under retention). */
const YEAR = process.env.BENCH_STORAGE_YEAR !== '0';

interface TableSize {
  dataIndex: number;
  allocated: number;
  rows: number;
}

const bench = await startBenchServer('storage');
const { srv } = bench;
const pool = srv.ctx.dbHandle.pool;
const q = async <T>(text: string, params: unknown[] = []) =>
  (await pool.query(text, params))[0] as T;
// Every table that grows with the captures: the three partitioned ones, and the uid, job,
// daily-sum and trend-aggregate rows each capture leaves behind.
const TABLES = await existingTables(q);

const count = async () =>
  Number((await q<{ n: number }[]>('SELECT COUNT(*) AS n FROM analyses'))[0]!.n);

/** Data + index bytes (InnoDB statistics) and the tablespace file's allocated bytes. */
async function sizes(): Promise<Record<string, TableSize>> {
  await q(`ANALYZE TABLE ${TABLES.join(', ')}`);
  const rows = await q<
    { name: string; data: number; idx: number; tableRows: number; allocated: number | null }[]
  >(
    // A partitioned table has a tablespace per partition: `<db>/<table>#P#<partition>`.
    `SELECT t.TABLE_NAME AS name, t.DATA_LENGTH AS data, t.INDEX_LENGTH AS idx,
            t.TABLE_ROWS AS tableRows,
            (SELECT SUM(s.ALLOCATED_SIZE) FROM information_schema.INNODB_SYS_TABLESPACES s
              WHERE s.NAME = CONCAT(t.TABLE_SCHEMA, '/', t.TABLE_NAME)
                 OR s.NAME LIKE CONCAT(t.TABLE_SCHEMA, '/', t.TABLE_NAME, '#P#%')) AS allocated
       FROM information_schema.TABLES t
      WHERE t.TABLE_SCHEMA = DATABASE() AND t.TABLE_NAME IN (?)`,
    [TABLES],
  );
  return Object.fromEntries(
    rows.map((r) => [
      r.name,
      {
        dataIndex: Number(r.data) + Number(r.idx),
        allocated: Number(r.allocated ?? 0),
        rows: Number(r.tableRows),
      },
    ]),
  );
}

try {
  const cookie = await signInCookie(srv.url, 'admin@turnstone.local');
  const sites = await q<{ id: number; code: string }[]>('SELECT id, code FROM sites');
  const keys = new Map<string, string>();
  for (const s of sites)
    keys.set(s.code, await createGatewayKey(srv.url, cookie, s.id, `storage-${s.code}`));
  const channels = demoChannels().filter((c) => keys.has(c.siteCode));
  await q("UPDATE jobs SET state = 'done' WHERE state = 'queued'");
  const analysesBefore = await count();
  const before = await sizes();

  // Captures ten minutes apart per channel, the story's progress running 0 → 1 over the run.
  const t0 = Date.parse('2026-01-05T00:00:00Z');
  const perChannel = Math.ceil(COUNT / channels.length);
  const items: { site: string; body: ReturnType<typeof toIngestItem> }[] = [];
  for (let i = 0; i < COUNT; i++) {
    const ch = channels[i % channels.length]!;
    const round = Math.floor(i / channels.length);
    const snap = simulateSnapshot(ch, new Date(t0 + round * 600_000), round / perChannel);
    items.push({ site: ch.siteCode, body: toIngestItem(snap) });
  }
  for (const site of keys.keys()) {
    const mine = items.filter((it) => it.site === site).map((it) => it.body);
    for (let i = 0; i < mine.length; i += POST_BATCH) {
      const res = await fetch(`${srv.url}/api/ingest/v1/snapshots`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', authorization: `Bearer ${keys.get(site)}` },
        body: JSON.stringify({ snapshots: mine.slice(i, i + POST_BATCH) }),
      });
      if (res.status >= 300) throw new Error(`ingest answered ${res.status}: ${await res.text()}`);
    }
  }
  const worker = createWorker(srv.ctx, { owner: 'storage-bench', batch: 16 });
  const t1 = performance.now();
  const jobs = await worker.drain();
  const drainS = (performance.now() - t1) / 1000;

  const analysesAfter = await count();
  const captures = analysesAfter - analysesBefore;
  if (captures < COUNT * 0.9) throw new Error(`only ${captures} of ${COUNT} captures analysed`);
  // Reference: the float64 bytes of the spectra these analyses hold (lines of the stored spectra).
  const blobs = await q<{ spectra: Buffer | null }[]>(
    `SELECT spectra FROM analyses WHERE id > (SELECT COALESCE(MAX(id), 0) FROM analyses) - ?`,
    [captures],
  );
  let nlines = 0;
  for (const { spectra } of blobs)
    if (spectra) for (const v of Object.values(decodeSpectra(spectra))) nlines += v ? v.length : 0;
  const float64PerCapture = (Number(nlines) * 8) / captures;
  const after = await sizes();
  // The long columns of the new analyses, average stored bytes: what decides whether a row
  // fits its page (DYNAMIC keeps a row whole up to about half a 16 kB page) or sends its
  // longest columns off-page, each to pages of its own.
  const longColumns = await q<{ name: string }[]>(
    `SELECT COLUMN_NAME AS name FROM information_schema.COLUMNS
      WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = 'analyses'
        AND DATA_TYPE IN ('mediumblob', 'blob', 'longblob', 'longtext', 'mediumtext', 'text')
      ORDER BY ORDINAL_POSITION`,
  );
  const [avg] = await q<Record<string, number | string | null>[]>(
    `SELECT ${longColumns.map((c) => `AVG(LENGTH(\`${c.name}\`)) AS \`${c.name}\``).join(', ')}
       FROM analyses WHERE id > (SELECT COALESCE(MAX(id), 0) FROM analyses) - ?`,
    [captures],
  );
  const per = (t: string, k: 'dataIndex' | 'allocated') =>
    (after[t]![k] - before[t]![k]) / captures;
  const total = (k: 'dataIndex' | 'allocated') => TABLES.reduce((s, t) => s + per(t, k), 0);

  console.log(
    `\nStorage per capture (${captures} demo-plant captures, ${jobs} jobs drained in ${drainS.toFixed(0)} s)`,
  );
  console.log('| table | data+index B/capture | file allocated B/capture | / float64 spectra |');
  console.log('|---|---|---|---|');
  for (const t of TABLES)
    console.log(
      `| ${t} | ${per(t, 'dataIndex').toFixed(0)} | ${per(t, 'allocated').toFixed(0)} | ${(per(t, 'dataIndex') / float64PerCapture).toFixed(3)} |`,
    );
  console.log(
    `| total | ${total('dataIndex').toFixed(0)} | ${total('allocated').toFixed(0)} | ${(total('dataIndex') / float64PerCapture).toFixed(3)} |`,
  );
  console.log(`| float64 spectra (reference) | ${float64PerCapture.toFixed(0)} | | 1.000 |`);
  console.log(
    `analyses / float64 spectra: ${(per('analyses', 'dataIndex') / float64PerCapture).toFixed(3)}; target for a year amortised after thinning: ≤ 2048 B/capture (total now ${total('dataIndex').toFixed(0)})`,
  );
  console.log(
    `analyses long columns, mean stored bytes: ${longColumns
      .map((c) => `${c.name} ${Number(avg![c.name] ?? 0).toFixed(0)}`)
      .join(', ')}`,
  );

  // ---- tiered retention over these captures at simulated ages
  const policy = retentionPolicy(loadConfig({}));
  const [span] = await q<[{ first: Date; last: Date }]>(
    `SELECT MIN(taken_at) AS first, MAX(taken_at) AS last FROM analyses
      WHERE id > (SELECT COALESCE(MAX(id), 0) FROM analyses) - ?`,
    [captures],
  );
  const perHour =
    captures /
    channels.length /
    Math.max(1, (span.last.getTime() - span.first.getTime()) / 3_600_000);
  // As thinning left it (its total kept for the table), then after the compaction's rebuild.
  const asThinned: number[] = [];
  const optimized = async () => {
    const raw = await sizes();
    asThinned.push(
      TABLES.reduce((a, t) => a + (raw[t]!.dataIndex - before[t]!.dataIndex), 0) / captures,
    );
    await runCompaction(srv.ctx.db, policy, new Date(), { rebuild: true });
    // The tables compaction does not rebuild (never thinned): as they are.
    return sizes();
  };
  const delta = (s: Record<string, TableSize>, t: string) =>
    (s[t]!.dataIndex - before[t]!.dataIndex) / captures;
  const kept = async () =>
    Number(
      (
        await q<{ n: number }[]>(
          `SELECT COUNT(*) AS n FROM analyses WHERE spectra_thinned_at IS NULL
             AND id > (SELECT COALESCE(MAX(id), 0) FROM analyses) - ?`,
          [captures],
        )
      )[0]!.n,
    );
  const [{ firstId }] = await q<[{ firstId: number }]>(
    'SELECT COALESCE(MAX(id), 0) - ? + 1 AS firstId FROM analyses',
    [captures],
  );
  const withSamples = async () =>
    Number(
      (
        await q<{ n: number }[]>(
          `SELECT COUNT(*) AS n FROM snapshots s JOIN analyses a ON a.snapshot_id = s.id
            WHERE a.id >= ? AND s.samples IS NOT NULL`,
          [firstId],
        )
      )[0]!.n,
    );
  const DAY = 86_400_000;
  const stages: {
    name: string;
    s: Record<string, TableSize>;
    kept: number;
    samples: number;
    seconds: number;
  }[] = [];
  stages.push({
    name: 'whole',
    s: await optimized(),
    kept: await kept(),
    samples: await withSamples(),
    seconds: 0,
  });
  const opts = { batchSize: policy.batchSize, batchPauseMs: 0 };
  let t2 = performance.now();
  await thinSpectra(srv.ctx.db, policy, new Date(span.last.getTime() + 30 * DAY), opts);
  let secs = (performance.now() - t2) / 1000;
  stages.push({
    name: 'aged 30 d (hourly tier)',
    s: await optimized(),
    kept: await kept(),
    samples: await withSamples(),
    seconds: secs,
  });
  t2 = performance.now();
  await thinSpectra(srv.ctx.db, policy, new Date(span.last.getTime() + 200 * DAY), opts);
  secs = (performance.now() - t2) / 1000;
  stages.push({
    name: 'aged 200 d (daily tier)',
    s: await optimized(),
    kept: await kept(),
    samples: await withSamples(),
    seconds: secs,
  });
  // A pass with nothing left to thin: what every night costs once the history is thinned,
  // and how MariaDB reaches the analyses rows for it.
  t2 = performance.now();
  const again = await thinSpectra(
    srv.ctx.db,
    policy,
    new Date(span.last.getTime() + 200 * DAY),
    opts,
  );
  const rescanS = (performance.now() - t2) / 1000;
  const [maxRow] = await q<{ m: number }[]>('SELECT MAX(id) AS m FROM analyses');
  const [plan] = (await srv.ctx.db.execute(
    sql`EXPLAIN ${thinningCandidates(
      thinningCutoffs(policy, new Date(span.last.getTime() + 200 * DAY)),
      0,
      Number(maxRow!.m),
      policy.batchSize,
    )}`,
  )) as unknown as [{ table: string; type: string; key: string | null; rows: number }[]];
  const outer = plan.find((r) => r.table === 'a');
  t2 = performance.now();
  await expireRawSamplesPass(
    srv.ctx.db,
    policy.rawSamplesDays,
    new Date(Date.now() + 100 * DAY),
    opts,
  );
  secs = (performance.now() - t2) / 1000;
  stages.push({
    name: '+ raw waveforms expired',
    s: await optimized(),
    kept: await kept(),
    samples: await withSamples(),
    seconds: secs,
  });

  console.log(
    `\nTiered retention over the same captures (${perHour.toFixed(1)} captures per point per hour)`,
  );
  console.log(
    `| stage | whole spectra kept | raw waveforms kept | pass s | total B/capture as thinned, no rebuild | ${TABLES.join(' B/capture | ')} B/capture | total B/capture after rebuild |`,
  );
  console.log(`|---|---|---|---|---|${TABLES.map(() => '---|').join('')}---|`);
  stages.forEach((st, i) =>
    console.log(
      `| ${st.name} | ${st.kept} | ${st.samples} | ${st.seconds.toFixed(2)} | ${asThinned[i]!.toFixed(0)} | ${TABLES.map((t) => delta(st.s, t).toFixed(0)).join(' | ')} | ${TABLES.reduce((a, t) => a + delta(st.s, t), 0).toFixed(0)} |`,
    ),
  );
  // Whole and thinned analyses row bytes, solved from the whole stage and the daily stage;
  // snapshot rows with and without their raw waveform, from the whole stage and the last.
  const solve = (
    t: string,
    wholeStage: number,
    stage: number,
    keptOf: (x: (typeof stages)[number]) => number,
  ) => {
    const w = delta(stages[wholeStage]!.s, t);
    const st = stages[stage]!;
    const k = keptOf(st);
    return {
      whole: w,
      thinned: k < captures ? (delta(st.s, t) * captures - k * w) / (captures - k) : w,
    };
  };
  const an = solve('analyses', 0, 2, (st) => st.kept);
  const sn = solve('snapshots', 0, 3, (st) => st.samples);
  const whole = an.whole;
  const thinnedRow = an.thinned;
  // A plant-year at this cadence under the default policy. Captures kept whole (alert
  // windows, findings, pins, uploads) are not counted: their share is the plant's own (this
  // run's story packs a fault's whole progression into a few hours, so many of its captures
  // sit in alert windows). The share of captures that keep their spectra, and of those that
  // keep their raw waveform (the spectra's tiers, cut at RETENTION_DAYS):
  const share = (days: number) =>
    (Math.min(days, policy.spectraWholeDays) +
      Math.max(0, Math.min(days, policy.spectraHourlyDays) - policy.spectraWholeDays) /
        Math.max(1, perHour) +
      Math.max(0, days - policy.spectraHourlyDays) / Math.max(1, 24 * perHour)) /
    365;
  const wholeShare = share(365);
  const rawShare = share(policy.rawSamplesDays > 0 ? Math.min(365, policy.rawSamplesDays) : 365);
  const forever = TABLES.filter((t) => t !== 'analyses' && t !== 'snapshots');
  const parts: [string, number][] = [
    ['analyses', thinnedRow + wholeShare * (whole - thinnedRow)],
    ['snapshots', sn.thinned + rawShare * (sn.whole - sn.thinned)],
    // Done jobs are removed DONE_JOBS_KEEP_DAYS after they ran (compaction.ts).
    ...forever.map(
      (t) =>
        [t, delta(stages[3]!.s, t) * (t === 'jobs' ? DONE_JOBS_KEEP_DAYS / 365 : 1)] as [
          string,
          number,
        ],
    ),
  ];
  const year = parts.reduce((a, [, b]) => a + b, 0);
  console.log(
    `a pass with nothing left to thin: ${again.rows} rows, ${rescanS.toFixed(2)} s; analyses reached by ${outer?.type ?? '?'} on ${outer?.key ?? 'no index'} (~${outer?.rows ?? '?'} rows estimated)`,
  );
  console.log(
    `analyses row: whole ${whole.toFixed(0)} B, thinned ${thinnedRow.toFixed(0)} B; snapshot row: with raw waveform ${sn.whole.toFixed(0)} B, without ${sn.thinned.toFixed(0)} B; share keeping spectra over a year ${(wholeShare * 100).toFixed(1)} %, raw waveforms ${(rawShare * 100).toFixed(1)} %`,
  );
  console.log(
    `plant-year parts, B/capture: ${parts.map(([t, b]) => `${t} ${b.toFixed(0)}`).join(', ')}`,
  );
  console.log(
    `plant-year amortised at this cadence: ${year.toFixed(0)} B/capture (target ≤ 2048; before retention ${total('dataIndex').toFixed(0)})`,
  );
  await printComposition(q, captures, firstId);
  if (YEAR) await plantYearFigures(bench);
} finally {
  await bench.stop();
}
