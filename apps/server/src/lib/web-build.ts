/**
 * The web app is built by Vite into apps/web/dist. At start we build it when it is missing
 * or older than any of its sources, so `npm start` on a fresh clone needs no extra step.
 */
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const repoRoot = fileURLToPath(new URL('../../../../', import.meta.url));
export const webDist = join(repoRoot, 'apps/web/dist');

function newestMtime(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of readdirSync(path)) {
    if (entry === 'node_modules' || entry === 'dist') continue;
    newest = Math.max(newest, newestMtime(join(path, entry)));
  }
  return newest;
}

export function webBuildIsStale(): boolean {
  const index = join(webDist, 'index.html');
  if (!existsSync(index)) return true;
  const built = statSync(index).mtimeMs;
  const sources = [
    'apps/web/src',
    'apps/web/index.html',
    'packages/contracts/src',
    'packages/dsp/src',
    'vite.config.ts',
  ];
  return sources.some((s) => newestMtime(join(repoRoot, s)) > built);
}

export async function ensureWebBuilt(log: (m: string) => void): Promise<void> {
  if (!webBuildIsStale()) return;
  log('Building the web app (first start or changed sources)…');
  const { build } = await import('vite');
  // Always React's (and every library's) production build: Vite follows NODE_ENV, which a
  // test runner sets to `test` (vitest) and which would ship development builds.
  const nodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    await build({ configFile: join(repoRoot, 'vite.config.ts'), logLevel: 'warn' });
  } finally {
    if (nodeEnv === undefined) delete process.env.NODE_ENV;
    else process.env.NODE_ENV = nodeEnv;
  }
}
