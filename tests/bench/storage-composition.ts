/**
 * Where the bytes of the storage bench's captures go (tests/bench/storage-bench.ts prints it
 * after the retention stages): per table and partition InnoDB's data, index and free bytes
 * (information_schema.PARTITIONS), per index its pages (mysql.innodb_index_stats `size`,
 * after ANALYZE), the mean stored bytes of each long column of thinned and whole rows, and
 * what the summary JSON holds, part by part. Every byte count is divided by the captures.
 */
type Q = <T>(text: string, params?: unknown[]) => Promise<T>;

/** The tables that grow with every capture (the three partitioned ones and their companions). */
export const PER_CAPTURE_TABLES = [
  'analyses',
  'snapshots',
  'band_values',
  'snapshot_uids',
  'jobs',
  'band_day_sums',
  'band_value_hours',
] as const;

export async function existingTables(q: Q): Promise<string[]> {
  const rows = await q<{ name: string }[]>(
    `SELECT TABLE_NAME AS name FROM information_schema.TABLES
      WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME IN (?)`,
    [PER_CAPTURE_TABLES],
  );
  const names = new Set(rows.map((r) => r.name));
  return PER_CAPTURE_TABLES.filter((t) => names.has(t));
}

const f0 = (n: number) => n.toFixed(0);

export async function printComposition(q: Q, captures: number, firstAnalysisId: number) {
  const tables = await existingTables(q);
  await q(`ANALYZE TABLE ${tables.join(', ')}`);
  const parts = await q<
    {
      t: string;
      p: string | null;
      rows: number;
      data: number;
      idx: number;
      free: number;
      avg: number;
    }[]
  >(
    `SELECT TABLE_NAME AS t, PARTITION_NAME AS p, TABLE_ROWS AS \`rows\`, DATA_LENGTH AS data,
            INDEX_LENGTH AS idx, DATA_FREE AS free, AVG_ROW_LENGTH AS avg
       FROM information_schema.PARTITIONS
      WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME IN (?) AND (TABLE_ROWS > 0 OR PARTITION_NAME IS NULL)
      ORDER BY TABLE_NAME, PARTITION_ORDINAL_POSITION`,
    [tables],
  );
  console.log(
    '\nComposition (whole database; B per capture = bytes / captures of this run; partitions with rows)',
  );
  console.log(
    '| table | partition | rows | data B | index B | data_free B | avg_row_length | data+index B/capture |',
  );
  console.log('|---|---|---|---|---|---|---|---|');
  for (const r of parts)
    console.log(
      `| ${r.t} | ${r.p ?? '-'} | ${r.rows} | ${r.data} | ${r.idx} | ${r.free} | ${r.avg} | ${f0((Number(r.data) + Number(r.idx)) / captures)} |`,
    );
  const idx = await q<{ t: string; i: string; bytes: number }[]>(
    `SELECT SUBSTRING_INDEX(table_name, '#', 1) AS t, index_name AS i,
            SUM(stat_value) * @@innodb_page_size AS bytes
       FROM mysql.innodb_index_stats
      WHERE database_name = DATABASE() AND stat_name = 'size'
        AND SUBSTRING_INDEX(table_name, '#', 1) IN (?)
      GROUP BY 1, 2 ORDER BY 1, 2`,
    [tables],
  );
  console.log('| table | index (PRIMARY = the rows) | B/capture |');
  console.log('|---|---|---|');
  for (const r of idx) console.log(`| ${r.t} | ${r.i} | ${f0(Number(r.bytes) / captures)} |`);

  // Long columns of this run's rows, thinned and whole apart.
  const cols = await q<{ t: string; c: string }[]>(
    `SELECT TABLE_NAME AS t, COLUMN_NAME AS c FROM information_schema.COLUMNS
      WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME IN ('analyses', 'snapshots')
        AND DATA_TYPE IN ('mediumblob', 'blob', 'longblob', 'longtext', 'mediumtext', 'text', 'varchar')
      ORDER BY TABLE_NAME, ORDINAL_POSITION`,
  );
  const mean = (t: string, where: string) => {
    const list = cols.filter((c) => c.t === t);
    return q<Record<string, number | string | null>[]>(
      `SELECT COUNT(*) AS n, ${list.map((c) => `AVG(LENGTH(\`${c.c}\`)) AS \`${c.c}\``).join(', ')} FROM ${t} WHERE ${where}`,
    );
  };
  const show = (label: string, row: Record<string, number | string | null> | undefined) =>
    console.log(
      `${label} (${row?.n ?? 0} rows): ${Object.entries(row ?? {})
        .filter(([k, v]) => k !== 'n' && v !== null && Number(v) > 0)
        .map(([k, v]) => `${k} ${f0(Number(v))}`)
        .join(', ')}`,
    );
  const thinnedA = await mean(
    'analyses',
    `id >= ${firstAnalysisId} AND spectra_thinned_at IS NOT NULL`,
  );
  const wholeA = await mean('analyses', `id >= ${firstAnalysisId} AND spectra_thinned_at IS NULL`);
  show('analyses thinned, mean column bytes', thinnedA[0]);
  show('analyses whole, mean column bytes', wholeA[0]);
  const snapWhere = `id IN (SELECT snapshot_id FROM analyses WHERE id >= ${firstAnalysisId})`;
  show(
    'snapshots without samples',
    (await mean('snapshots', `${snapWhere} AND samples IS NULL`))[0],
  );
  show(
    'snapshots with samples',
    (await mean('snapshots', `${snapWhere} AND samples IS NOT NULL`))[0],
  );

  // The summary JSON, part by part (compact JSON bytes of each top-level key).
  const [keys] = await q<{ k: string | null }[]>(
    `SELECT JSON_KEYS(summary) AS k FROM analyses WHERE id >= ? ORDER BY id DESC LIMIT 1`,
    [firstAnalysisId],
  );
  const names: string[] = keys?.k ? (JSON.parse(keys.k) as string[]) : [];
  if (names.length) {
    const [parts2] = await q<Record<string, number | string | null>[]>(
      `SELECT ${names.map((k, i) => `AVG(LENGTH(JSON_COMPACT(JSON_EXTRACT(summary, '$.${k}')))) AS k${i}`).join(', ')}
         FROM analyses WHERE id >= ?`,
      [firstAnalysisId],
    );
    console.log(
      `summary JSON parts, mean bytes: ${names
        .map((k, i) => `${k} ${f0(Number(parts2?.[`k${i}`] ?? 0))}`)
        .join(', ')}`,
    );
  }
}
