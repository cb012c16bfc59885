/**
 * `npm run backup -- [--to DIR]`: a consistent backup of the database and the data folder's
 * files while Turnstone keeps running. Uses DATABASE_URL, or the private MariaDB of DATA_DIR
 * (the running one, or one started for the backup).
 */
import { parseArgs } from 'node:util';
import { resolve } from 'node:path';
import { loadConfig } from './config.ts';
import { backup } from './backup/backup.ts';

const { values } = parseArgs({ options: { to: { type: 'string' } }, allowPositionals: false });
const config = loadConfig();
const say = (m: string) => process.stdout.write(m + '\n');

try {
  const { dir, manifest } = await backup({
    dataDir: resolve(config.DATA_DIR),
    databaseUrl: config.DATABASE_URL,
    to: values.to,
    log: say,
  });
  const rows = Object.values(manifest.rows).reduce((a, b) => a + b, 0);
  say(
    `Backup written to ${dir}\n` +
      `  ${rows.toLocaleString('en')} rows in ${Object.keys(manifest.rows).length} tables, ` +
      `migration level ${manifest.migrations.level} (${manifest.migrations.tag ?? 'none'}), ` +
      `${manifest.files.length} data-folder files\n` +
      `  database ${(manifest.database.bytes / 1e6).toFixed(1)} MB gzipped, ` +
      `${(manifest.durationMs / 1000).toFixed(1)} s`,
  );
} catch (err) {
  process.stderr.write(`Backup failed: ${(err as Error).message}\n`);
  process.exit(1);
}
