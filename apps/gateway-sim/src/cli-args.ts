/** Command-line options of the gateway simulator, parsed and checked (no I/O). */

export interface SimOptions {
  url: string;
  key: string;
  /** Site code whose points this gateway serves. @default 'MFP' */
  site: string;
  /** Seconds between capture rounds. @default 60 */
  intervalS: number;
  /** Rounds to send; null = until SIGINT. */
  count: number | null;
  /** Snapshots per request (1 = single-snapshot requests). @default 10 */
  batch: number;
  /** Upper bound on snapshots sent per second; null = no limit. */
  ratePerS: number | null;
  /** Simulate the demo plant's measurement faults (clipping, under-range, aliasing). */
  faults: boolean;
  /** Backfill from this time (rounds at from + k·interval, sent without waiting). */
  from: Date | null;
  /** Give up on a capture after this many retries (it is then reported as a failure). */
  maxRetries: number;
  allowRemote: boolean;
}

export const USAGE = `Usage: npm run sim -- --key <gatewayApiKey> [--site MFP]
  [--url http://127.0.0.1:8080] [--interval-s 60] [--count N] [--batch N] [--rate-per-s N] [--faults]
  [--from 2026-11-01T00:00:00Z] [--max-retries 10] [--allow-remote]

Behaves like a field gateway of the demo plant: every interval it captures each point of
its site (--site: MFP or TRB, the site the key's gateway belongs to; the demo seed writes
one "SITE key" line per site to DATA_DIR/demo-gateway-keys.txt) and posts the snapshots to POST /api/ingest/v1/snapshots, retrying network
errors and 5xx with exponential back-off and honouring Retry-After on 429/503. A retry
reuses the capture's uid, so nothing is dropped or stored twice. Without --count it runs
until Ctrl+C. --url defaults to the product on this machine, http://127.0.0.1:$PORT (8080).
Only loopback URLs unless --allow-remote.`;

export class UsageError extends Error {}

const LOOPBACK = new Set(['localhost', '127.0.0.1', '::1', '[::1]']);

/** Whether `url` points at this machine (localhost, 127.0.0.0/8 or ::1). */
export function isLoopbackUrl(url: URL): boolean {
  const h = url.hostname.toLowerCase();
  return LOOPBACK.has(h) || /^127(\.\d{1,3}){3}$/.test(h);
}

function positiveNumber(flag: string, raw: string | undefined, integer: boolean): number {
  const n = Number(raw);
  if (raw === undefined || !Number.isFinite(n) || n <= 0 || (integer && !Number.isInteger(n)))
    throw new UsageError(
      `${flag} needs a positive ${integer ? 'whole ' : ''}number, got "${raw ?? ''}"`,
    );
  return n;
}

/** Where `npm start` listens with the same environment: 127.0.0.1 on PORT (8080). */
export function defaultUrl(env: Record<string, string | undefined> = {}): string {
  const port = env.PORT && /^\d+$/.test(env.PORT) && env.PORT !== '0' ? env.PORT : '8080';
  return `http://127.0.0.1:${port}`;
}

export function parseSimArgs(
  argv: readonly string[],
  env: Record<string, string | undefined> = {},
): SimOptions {
  const o: Partial<SimOptions> & { faults: boolean; allowRemote: boolean } = {
    faults: false,
    allowRemote: false,
  };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    const [flag, inline] = arg.includes('=')
      ? [arg.slice(0, arg.indexOf('=')), arg.slice(arg.indexOf('=') + 1)]
      : [arg, undefined];
    const value = () => {
      const v = inline ?? argv[++i];
      if (v === undefined) throw new UsageError(`${flag} needs a value`);
      return v;
    };
    switch (flag) {
      case '--url':
        o.url = value();
        break;
      case '--key':
        o.key = value();
        break;
      case '--site':
        o.site = value().toUpperCase();
        break;
      case '--interval-s':
        o.intervalS = positiveNumber(flag, value(), false);
        break;
      case '--count':
        o.count = positiveNumber(flag, value(), true);
        break;
      case '--batch':
        o.batch = positiveNumber(flag, value(), true);
        if (o.batch > 100) throw new UsageError('--batch is at most 100 (the ingest API limit)');
        break;
      case '--rate-per-s':
        o.ratePerS = positiveNumber(flag, value(), false);
        break;
      case '--max-retries':
        o.maxRetries = Math.floor(positiveNumber(flag, value(), true));
        break;
      case '--from': {
        const v = value();
        const d = new Date(v);
        if (Number.isNaN(d.getTime()))
          throw new UsageError(`--from needs an ISO date-time, got "${v}"`);
        o.from = d;
        break;
      }
      case '--faults':
        o.faults = true;
        break;
      case '--allow-remote':
        o.allowRemote = true;
        break;
      case '--help':
      case '-h':
        throw new UsageError(USAGE);
      default:
        throw new UsageError(`unknown option ${arg}\n\n${USAGE}`);
    }
  }
  o.url ??= defaultUrl(env);
  if (!o.key) throw new UsageError(`--key is required\n\n${USAGE}`);
  let url: URL;
  try {
    url = new URL(o.url);
  } catch {
    throw new UsageError(`--url is not a URL: ${o.url}`);
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:')
    throw new UsageError('--url must be http or https');
  if (!o.allowRemote && !isLoopbackUrl(url))
    throw new UsageError(
      `refusing to send to ${url.host}: only loopback URLs unless --allow-remote`,
    );
  return {
    url: url.toString().replace(/\/$/, ''),
    key: o.key,
    site: o.site ?? 'MFP',
    intervalS: o.intervalS ?? 60,
    count: o.count ?? null,
    batch: o.batch ?? 10,
    ratePerS: o.ratePerS ?? null,
    faults: o.faults,
    from: o.from ?? null,
    maxRetries: o.maxRetries ?? 10,
    allowRemote: o.allowRemote,
  };
}
