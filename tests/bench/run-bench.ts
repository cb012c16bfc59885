// Runs every tests/bench/*-bench.ts in turn with tsx (npm run bench).
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = fileURLToPath(new URL('.', import.meta.url));
const root = resolve(here, '../..');
const tsx = join(root, 'node_modules', '.bin', 'tsx');
const files = readdirSync(here)
  .filter((f) => f.endsWith('-bench.ts') && f !== 'run-bench.ts')
  .sort();

let failed = 0;
for (const file of files) {
  console.log(`\n== ${file}`);
  const r = spawnSync(tsx, [join(here, file)], { stdio: 'inherit', cwd: root });
  if (r.status !== 0) {
    failed++;
    console.error(`${file} exited with ${r.status ?? r.signal}`);
  }
}
process.exitCode = failed > 0 ? 1 : 0;
