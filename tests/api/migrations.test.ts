/**
 * Upgrades: a database made by the oldest migration set still supported, filled with rows
 * in every table, is started by this Turnstone. It backs up first (a pending migration is
 * destructive), migrates, and every row keeps every value it had. A database newer than
 * the code is refused with a clear message and left untouched.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Pool, RowDataPacket } from 'mysql2/promise';
import { drizzle } from 'drizzle-orm/mysql2';
import { migrate } from 'drizzle-orm/mysql2/migrator';
import { codeMigrations, OLDEST_SUPPORTED } from '@turnstone/db/migrate';
import { startQuietServer } from '../support/test-server.ts';
import { databaseForBlock, migrationsUpTo, upgradeByStarting } from '../support/old-migrations.ts';

const ROWS = 25;
const tmp = () => process.env.TURNSTONE_TEST_TMP ?? tmpdir();

interface Column {
  name: string;
  dataType: string;
  columnType: string;
  maxLen: number | null;
  key: string;
}

async function tables(pool: Pool): Promise<Map<string, Column[]>> {
  const [rows] = await pool.query<RowDataPacket[]>(
    `SELECT table_name AS t, column_name AS c, data_type AS dt, column_type AS ct,
            character_maximum_length AS ml, column_key AS k
       FROM information_schema.columns
      WHERE table_schema = DATABASE() AND table_name <> '__drizzle_migrations'
      ORDER BY table_name, ordinal_position`,
  );
  const out = new Map<string, Column[]>();
  for (const r of rows) {
    const list = out.get(String(r.t)) ?? [];
    list.push({
      name: String(r.c),
      dataType: String(r.dt),
      columnType: String(r.ct),
      maxLen: r.ml === null ? null : Number(r.ml),
      key: String(r.k),
    });
    out.set(String(r.t), list);
  }
  return out;
}

/** A value of the column's type for row i (unique per row where a unique key may need it). */
function valueFor(col: Column, i: number): unknown {
  const t = col.dataType;
  if (t === 'tinyint') return col.columnType.startsWith('tinyint(1)') ? i % 2 : i % 100;
  if (['smallint', 'mediumint', 'int', 'bigint'].includes(t)) return i;
  if (['double', 'float', 'decimal'].includes(t)) return i + 0.25;
  if (t === 'enum') {
    const options = [...col.columnType.matchAll(/'((?:[^']|'')*)'/g)].map((m) => m[1]!);
    return options[i % options.length];
  }
  if (t === 'datetime' || t === 'timestamp') return new Date(Date.UTC(2025, 0, 1) + i * 61_000);
  if (t === 'date') return `2025-01-${String((i % 28) + 1).padStart(2, '0')}`;
  if (['blob', 'longblob', 'mediumblob', 'varbinary', 'binary'].includes(t))
    return Buffer.from(
      Array.from({ length: Math.min(col.maxLen ?? 48, 48) }, (_, k) => (i * 31 + k) % 256),
    );
  if (t.endsWith('text')) return JSON.stringify(`${i}:${col.name}`); // valid JSON for json columns
  if (t === 'varchar' || t === 'char') return `${i}:${col.name}`.slice(0, col.maxLen ?? 20);
  throw new Error(`no test value for ${col.name} (${col.columnType})`);
}

/** Each row of each table as primary key → its values, for the columns given. */
async function snapshotRows(
  pool: Pool,
  schema: Map<string, Column[]>,
): Promise<Map<string, Map<string, string>>> {
  const out = new Map<string, Map<string, string>>();
  for (const [table, cols] of schema) {
    const pk = cols.filter((c) => c.key === 'PRI').map((c) => `\`${c.name}\``);
    const list = cols.map((c) => `IFNULL(HEX(\`${c.name}\`), 'NULL')`).join(", '|', ");
    const [rows] = await pool.query<RowDataPacket[]>(
      `SELECT CONCAT_WS('/', ${pk.join(', ')}) AS k, CONCAT(${list}) AS v FROM \`${table}\``,
    );
    out.set(table, new Map(rows.map((r) => [String(r.k), String(r.v)])));
  }
  return out;
}

describe('upgrading a database made by the oldest supported migration set', () => {
  const db = databaseForBlock();

  it('backs up first, migrates, and every row keeps every value', async () => {
    const { pool } = db;
    // The database as the oldest supported Turnstone left it.
    const old = drizzle(pool);
    await migrate(old, { migrationsFolder: migrationsUpTo(OLDEST_SUPPORTED) });
    const oldSchema = await tables(pool);
    expect(oldSchema.size).toBeGreaterThan(20);
    const conn = await pool.getConnection();
    try {
      // Every table, every column: references need not resolve for this check.
      await conn.query('SET FOREIGN_KEY_CHECKS = 0');
      for (const [table, cols] of oldSchema) {
        for (let i = 1; i <= ROWS; i++) {
          await conn.query(
            `INSERT INTO \`${table}\` (${cols.map((c) => `\`${c.name}\``).join(', ')}) VALUES (?)`,
            [cols.map((c) => valueFor(c, i))],
          );
        }
      }
    } finally {
      conn.release();
    }
    const before = await snapshotRows(pool, oldSchema);
    for (const [table, rows] of before) expect({ table, n: rows.size }).toEqual({ table, n: ROWS });

    const pending = codeMigrations().filter((m) => m.tag > OLDEST_SUPPORTED);
    expect(pending.some((m) => m.destructive.length > 0)).toBe(true);
    const dataDir = await upgradeByStarting(db.url, 'upgrade-');

    // The backup taken before the destructive migration holds the old database.
    const backups = readdirSync(join(dataDir, 'backups'));
    expect(backups).toHaveLength(1);
    const manifest = JSON.parse(
      readFileSync(join(dataDir, 'backups', backups[0]!, 'manifest.json'), 'utf8'),
    );
    expect(manifest.migrations).toEqual({ level: 1, tag: OLDEST_SUPPORTED });
    expect(manifest.reason).toMatch(/^before migrations/);
    for (const table of oldSchema.keys()) expect(manifest.rows[table]).toBe(ROWS);

    // Upgraded to the code's level, every old row with every old value.
    const [[level]] = await pool.query<RowDataPacket[]>(
      'SELECT COUNT(*) AS n FROM __drizzle_migrations',
    );
    expect(Number(level!.n)).toBe(codeMigrations().length);
    const after = await snapshotRows(pool, oldSchema);
    for (const [table, rows] of before) {
      const lost = [...rows].filter(([k, v]) => after.get(table)?.get(k) !== v).map(([k]) => k);
      expect({ table, lost }).toEqual({ table, lost: [] });
      // (the start may add rows of its own, e.g. settings it keeps)
      expect(after.get(table)!.size).toBeGreaterThanOrEqual(ROWS);
    }

    // 0018_time-partitioning: the captures' tables are partitioned by month from the first
    // month holding captures (the rows above are taken in January 2025), each old row in
    // its month's partition, and every snapshot's uid is registered for its sender.
    for (const table of ['snapshots', 'analyses', 'band_values']) {
      const [parts] = await pool.query<RowDataPacket[]>(
        `SELECT PARTITION_NAME AS name, TABLE_ROWS AS n FROM information_schema.PARTITIONS
          WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ? ORDER BY PARTITION_ORDINAL_POSITION`,
        [table],
      );
      const names = parts.map((r) => String(r.name));
      expect(names.slice(0, 3)).toEqual(['p_before', 'p202501', 'p202502']);
      expect(names.at(-1)).toBe('p_future');
      const [[inJanuary]] = await pool.query<RowDataPacket[]>(
        `SELECT COUNT(*) AS n FROM \`${table}\` PARTITION (p202501)`,
      );
      expect({ table, n: Number(inJanuary!.n) }).toEqual({ table, n: ROWS });
    }
    const [[uids]] = await pool.query<RowDataPacket[]>(
      `SELECT COUNT(*) AS n FROM snapshot_uids u JOIN snapshots s
          ON s.id = u.snapshot_id AND s.uid = u.uid AND s.sender_id = u.sender_id`,
    );
    expect(Number(uids!.n)).toBe(ROWS);
  }, 120_000);

  it('refuses to start on a database a newer Turnstone has migrated, and changes nothing', async () => {
    const { pool } = db;
    const last = codeMigrations().at(-1)!;
    await pool.query('INSERT INTO __drizzle_migrations (hash, created_at) VALUES (?, ?)', [
      'a-migration-from-the-future',
      last.when + 1000,
    ]);
    const schema = await tables(pool);
    const before = await snapshotRows(pool, schema);
    await expect(
      startQuietServer(db.url, mkdtempSync(join(tmp(), 'newer-')), { SEED_DEMO: 'false' }),
    ).rejects.toThrow(/newer Turnstone has upgraded it/);
    expect(await snapshotRows(pool, schema)).toEqual(before);
  }, 60_000);
});
