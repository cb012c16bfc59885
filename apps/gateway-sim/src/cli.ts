/**
 * `npm run sim -- --key <gatewayApiKey> [--site MFP] [--url http://127.0.0.1:8080] …` — a field gateway
 * for the demo plant (see cli-args.ts for the options). Exit 0 when every capture was
 * confirmed, 1 when some failed, 2 on a usage error.
 */
import { parseSimArgs, UsageError } from './cli-args.ts';
import { runSimulator, summaryLine } from './run-simulator.ts';

async function main(): Promise<number> {
  let options;
  try {
    options = parseSimArgs(process.argv.slice(2), process.env);
  } catch (err) {
    if (err instanceof UsageError) {
      console.error(err.message);
      return 2;
    }
    throw err;
  }
  const stop = new AbortController();
  process.once('SIGINT', () => {
    console.error('stopping after the current request…');
    stop.abort();
  });
  const result = await runSimulator(options, { signal: stop.signal, log: (m) => console.log(m) });
  console.log(summaryLine(result));
  for (const [uid, why] of [...result.failed].slice(0, 20)) console.log(`  failed ${uid}: ${why}`);
  return result.failures > 0 ? 1 : 0;
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(err instanceof Error ? err.message : err);
    process.exit(1);
  },
);
