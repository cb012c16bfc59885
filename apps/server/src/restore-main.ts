/**
 * `npm run restore -- FROM [--force]`: restores a backup folder into DATA_DIR (which must be
 * empty unless --force) or into DATABASE_URL's empty database. Then `npm start` as usual.
 */
import { parseArgs } from 'node:util';
import { resolve } from 'node:path';
import { loadConfig } from './config.ts';
import { restore } from './backup/restore.ts';

const { values, positionals } = parseArgs({
  options: { force: { type: 'boolean', default: false } },
  allowPositionals: true,
});
const say = (m: string) => process.stdout.write(m + '\n');
if (positionals.length !== 1) {
  process.stderr.write('Usage: npm run restore -- <backup folder> [--force]\n');
  process.exit(2);
}
const config = loadConfig();

try {
  const { manifest, rows, ms } = await restore({
    from: positionals[0]!,
    dataDir: resolve(config.DATA_DIR),
    databaseUrl: config.DATABASE_URL,
    force: values.force,
    log: say,
  });
  const total = Object.values(rows).reduce((a, b) => a + b, 0);
  say(
    `Restored the backup of ${manifest.startedAt} (Turnstone ${manifest.product.version}, ` +
      `migration level ${manifest.migrations.level}): ${total.toLocaleString('en')} rows, ` +
      `every table's count as the manifest lists, ${manifest.files.length} data-folder files, ` +
      `in ${(ms / 1000).toFixed(1)} s.\nStart Turnstone as usual (npm start).`,
  );
} catch (err) {
  process.stderr.write(`Restore failed: ${(err as Error).message}\n`);
  process.exit(1);
}
