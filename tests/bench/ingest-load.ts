/**
 * The load generator of ingest-bench.ts, run as a second process: posts `count` prepared
 * snapshots with `concurrency` requests in flight, retrying 429/503 by Retry-After, and
 * prints one JSON line with the accepted uids' statuses and latencies.
 * argv: url key count concurrency prefix samples [ratePerS] [pointTag] [batch]
 * With ratePerS > 0 the requests are paced (a gateway's steady flow) instead of flat out.
 * With batch > 1 each request carries { snapshots: [...] } of that many (a gateway that
 * buffers); statuses then count the items' results, latencies and the rate the requests.
 *
 * It posts with node:http over a keep-alive agent (one connection per request in flight)
 * and bodies encoded once beforehand: on this 2-core machine the load generator shares the
 * cores with the server and MariaDB, and undici's fetch cost about 1.4 ms of CPU per post,
 * as much as the server itself. A field gateway is another machine; its CPU is not ours.
 * It prints its own CPU time so the bench can show what it took.
 */
import { Agent, request } from 'node:http';
import { snapshotBody } from '../support/signals.ts';

const [url, key, countS, concS, prefix, samplesS, rateS, tagArg, batchS] = process.argv.slice(2);
const batch = Math.max(1, Number(batchS ?? 1));
const ratePerS = Number(rateS ?? 0);
const count = Number(countS);
const concurrency = Number(concS);
const n = Number(samplesS ?? 4096);
const template = snapshotBody(tagArg ?? 'MFP-P101-MDE-H', 'x', { n, seed: 7 });
const t0 = Date.parse('2026-06-01T00:00:00Z');
const snapshot = (i: number) => ({
  ...template,
  uid: `${prefix}-${i}`,
  takenAt: new Date(t0 + i * 1000).toISOString(),
});
const bodies = Array.from({ length: Math.ceil(count / batch) }, (_, r) =>
  Buffer.from(
    JSON.stringify(
      batch === 1
        ? snapshot(r)
        : {
            snapshots: Array.from({ length: Math.min(batch, count - r * batch) }, (_, k) =>
              snapshot(r * batch + k),
            ),
          },
    ),
  ),
);
const agent = new Agent({ keepAlive: true, maxSockets: concurrency });
const target = new URL(`${url}/api/ingest/v1/snapshots`);

/** One POST; resolves with the status, Retry-After and (batches) the body once read. */
function post(
  body: Buffer,
): Promise<{ status: number; retryAfter: string | undefined; text: string }> {
  return new Promise((resolve, reject) => {
    const req = request(
      target,
      {
        method: 'POST',
        agent,
        headers: {
          'content-type': 'application/json',
          'content-length': body.length,
          authorization: `Bearer ${key}`,
        },
      },
      (res) => {
        let text = '';
        res.on('data', (d: Buffer) => {
          if (batch > 1) text += d;
        });
        res.on('end', () =>
          resolve({ status: res.statusCode!, retryAfter: res.headers['retry-after'], text }),
        );
        res.on('error', reject);
      },
    );
    req.on('error', reject);
    req.end(body);
  });
}

const latencies: number[] = [];
const statuses: Record<string, number> = {};
let retries = 0;
let next = 0;
const wall0 = performance.now();
const cpu0 = process.cpuUsage();
async function one(body: Buffer) {
  for (;;) {
    const started = performance.now();
    const res = await post(body);
    latencies.push(performance.now() - started);
    if (res.status === 429 || res.status === 503) {
      retries++;
      await new Promise((r) => setTimeout(r, 1000 * Number(res.retryAfter ?? 1)));
      continue;
    }
    if (batch > 1 && res.status === 200) {
      for (const r of (JSON.parse(res.text) as { results: { httpStatus: number }[] }).results)
        statuses[r.httpStatus] = (statuses[r.httpStatus] ?? 0) + 1;
    } else statuses[res.status] = (statuses[res.status] ?? 0) + 1;
    return;
  }
}
await Promise.all(
  Array.from({ length: concurrency }, async () => {
    while (next < bodies.length) {
      const i = next++;
      if (ratePerS > 0) {
        const due = wall0 + (i * 1000) / ratePerS;
        const wait = due - performance.now();
        if (wait > 0) await new Promise((r) => setTimeout(r, wait));
      }
      await one(bodies[i]!);
    }
  }),
);
const wallS = (performance.now() - wall0) / 1000;
const cpu = process.cpuUsage(cpu0);
const cpuMs = (cpu.user + cpu.system) / 1000;
latencies.sort((a, b) => a - b);
const q = (p: number) =>
  latencies[Math.min(latencies.length - 1, Math.floor(p * latencies.length))]!;
agent.destroy();
console.log(
  JSON.stringify({
    wallS,
    perS: count / wallS,
    p50: q(0.5),
    p99: q(0.99),
    statuses,
    retries,
    cpuMs,
  }),
);
