/**
 * A flood of made-up password-reset tokens (300 requests, 60 at a time, from a separate
 * process) and what it does to the answer time of /api/health, probed every 50 ms from here.
 * Run twice: with the limits as shipped and with the per-client limit lifted (so every
 * request reaches the token check), against an idle baseline measured in the same run.
 */
import { spawn } from 'node:child_process';
import { probeWhile, startBenchServer } from './bench-support.ts';

const FLOOD = `
const [url, total, conc] = process.argv.slice(1);
let next = 0; const codes = {};
async function one() {
  while (next < Number(total)) {
    next++;
    try {
      const r = await fetch(url + '/api/v1/auth/reset-password', { method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ token: 'z'.repeat(43), password: 'flood-password-1' }) });
      codes[r.status] = (codes[r.status] ?? 0) + 1; await r.arrayBuffer();
    } catch (e) { codes[e.cause?.code ?? 'error'] = (codes[e.cause?.code ?? 'error'] ?? 0) + 1; }
  }
}
await Promise.all(Array.from({ length: Number(conc) }, one));
console.log(JSON.stringify(codes));
`;

function pct(xs: number[], p: number) {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))] ?? NaN;
}

async function run(label: string, env: Record<string, string>) {
  const b = await startBenchServer('link-flood', env);
  try {
    const url = b.srv.url;
    const idle = await probeWhile(url, new Promise((r) => setTimeout(r, 1500)));
    const t0 = performance.now();
    let out = '';
    const child = spawn(process.execPath, ['--input-type=module', '-e', FLOOD, url, '300', '60'], {
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    child.stdout.on('data', (d) => (out += d));
    const done = new Promise((r) => child.on('exit', r));
    const busy = await probeWhile(url, done);
    const secs = (performance.now() - t0) / 1000;
    console.log(
      `${label}: flood took ${secs.toFixed(1)} s, answers ${out.trim()}; /api/health ms ` +
        `idle p50 ${pct(idle, 50).toFixed(1)}, during flood p50 ${pct(busy, 50).toFixed(1)} ` +
        `p95 ${pct(busy, 95).toFixed(1)} max ${Math.max(...busy).toFixed(1)} ` +
        `(${busy.length} probes; max/idle-p50 ratio ${(Math.max(...busy) / pct(idle, 50)).toFixed(0)})`,
    );
  } finally {
    await b.stop();
  }
}

await run('as shipped', {});
await run('per-client limit lifted', { SIGN_IN_MAX_PER_IP: '100000' });
