/**
 * Large recording uploads and what they do to everyone else: four uploads at once (two
 * users, two each) posted from a separate process while /api/health is probed every 50 ms
 * from here, where the server runs. Two loads: four 16 M-row CSV files (far past the sample
 * limit, just under the byte limit) and four CSV files at the sample limit (1 Mi rows, the
 * largest that is accepted). Printed per load: the answers, the server process's peak RSS
 * (VmHWM, reset before each load) and its longest event-loop stall (monitorEventLoopDelay),
 * against the idle figures measured in the same run.
 */
import { spawn } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { MAX_SAMPLES } from '@turnstone/contracts/ingest';
import { probeWhile, signInCookie, startBenchServer } from './bench-support.ts';

// The uploader: builds its CSV text once and posts it `per` times for each cookie, all at once.
const UPLOADER = `
const [url, pointId, rows, per, ...cookies] = process.argv.slice(1);
const codes = {};
const messages = new Set();
async function one(cookie, i) {
  // A different first value per upload, so each is a new file rather than a repeat.
  const text = (i + 1) + '\\n' + '1\\n'.repeat(Number(rows) - 1);
  const form = new FormData();
  form.append('sampleRateHz', '25600');
  form.append('file', new Blob([text]), 'big-' + i + '.csv');
  try {
    const r = await fetch(url + '/api/v1/points/' + pointId + '/uploads', { method: 'POST',
      headers: { cookie }, body: form });
    codes[r.status] = (codes[r.status] ?? 0) + 1;
    const body = await r.json().catch(() => ({}));
    if (body.error) messages.add(body.error.message);
  } catch (e) { codes[e.cause?.code ?? 'error'] = (codes[e.cause?.code ?? 'error'] ?? 0) + 1; }
}
const jobs = [];
let i = 0;
for (const c of cookies) for (let k = 0; k < Number(per); k++) jobs.push(one(c, i++));
await Promise.all(jobs);
console.log(JSON.stringify({ codes, messages: [...messages] }));
`;

function pct(xs: number[], p: number) {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))] ?? NaN;
}

/** Peak resident set of this process since the last reset, in MiB (Linux /proc). */
function peakRssMiB(): number {
  const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync('/proc/self/status', 'utf8'));
  return m ? Number(m[1]) / 1024 : NaN;
}
function resetPeakRss() {
  try {
    writeFileSync('/proc/self/clear_refs', '5');
  } catch {
    // Not Linux, or not allowed: the peak then covers the whole run.
  }
}

interface Phase {
  label: string;
  secs: number;
  answers: string;
  peakRss: number;
  stallMs: number;
  health: number[];
}

async function phase(
  label: string,
  url: string,
  uploaderArgs: string[] | null,
  idleMs = 2000,
): Promise<Phase> {
  if (typeof globalThis.gc === 'function') globalThis.gc();
  resetPeakRss();
  const h = monitorEventLoopDelay({ resolution: 10 });
  h.enable();
  const t0 = performance.now();
  let out = '';
  let done: Promise<unknown>;
  if (uploaderArgs) {
    const child = spawn(
      process.execPath,
      ['--input-type=module', '-e', UPLOADER, url, ...uploaderArgs],
      { stdio: ['ignore', 'pipe', 'inherit'] },
    );
    child.stdout.on('data', (d) => (out += d));
    done = new Promise((r) => child.on('exit', r));
  } else {
    done = new Promise((r) => setTimeout(r, idleMs));
  }
  const health = await probeWhile(url, done);
  h.disable();
  return {
    label,
    secs: (performance.now() - t0) / 1000,
    answers: out.trim() || '-',
    peakRss: peakRssMiB(),
    stallMs: h.max / 1e6,
    health,
  };
}

function show(p: Phase, idle: Phase) {
  console.log(
    `${p.label}: ${p.secs.toFixed(1)} s, answers ${p.answers}\n` +
      `  server peak RSS ${p.peakRss.toFixed(0)} MiB (idle ${idle.peakRss.toFixed(0)} MiB, ` +
      `ratio ${(p.peakRss / idle.peakRss).toFixed(2)}); longest event-loop stall ` +
      `${p.stallMs.toFixed(0)} ms (idle ${idle.stallMs.toFixed(0)} ms, ratio ` +
      `${(p.stallMs / idle.stallMs).toFixed(0)})\n` +
      `  /api/health ms p50 ${pct(p.health, 50).toFixed(1)} max ${Math.max(...p.health).toFixed(1)} ` +
      `(${p.health.length} probes; idle p50 ${pct(idle.health, 50).toFixed(1)}, ` +
      `max/idle-p50 ratio ${(Math.max(...p.health) / pct(idle.health, 50)).toFixed(0)})`,
  );
}

const b = await startBenchServer('upload-stall');
try {
  const url = b.srv.url;
  const cookies = [
    await signInCookie(url, 'engineer@turnstone.local'),
    await signInCookie(url, 'admin@turnstone.local'),
  ];
  const [rows] = await b.srv.ctx.dbHandle.pool.query(
    "SELECT id FROM points WHERE tag = 'MFP-P101-MDE-H'",
  );
  const pointId = String((rows as { id: number }[])[0]!.id);
  const idle = await phase('idle', url, null);
  show(idle, idle);
  show(
    await phase('four 16 M-row CSV uploads', url, [pointId, String(16_000_000), '2', ...cookies]),
    idle,
  );
  show(
    await phase(`four ${MAX_SAMPLES}-row CSV uploads (the sample limit)`, url, [
      pointId,
      String(MAX_SAMPLES),
      '2',
      ...cookies,
    ]),
    idle,
  );
} finally {
  await b.stop();
}
