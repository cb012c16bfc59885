/** `npm start`: the web app, API and worker in one process, with demo data by default. */
import { start } from './server.ts';
import { DEMO_ACCOUNTS } from './features/demo/demo-seed.ts';

const server = await start().catch((err: Error) => {
  process.stderr.write(`Turnstone could not start: ${err.message}\n`);
  process.exit(1);
});

const { config } = server.ctx;
process.stdout.write(
  [
    '',
    `Turnstone is running at ${server.url}`,
    config.SEED_DEMO
      ? `Demo accounts (password "${config.DEMO_PASSWORD === 'turnstone-demo' ? 'turnstone-demo' : '<DEMO_PASSWORD>'}"): ${DEMO_ACCOUNTS.map((a) => a.email).join(', ')}`
      : '',
    'Press Ctrl+C to stop.',
    '',
  ].join('\n'),
);

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    process.stdout.write(`\nStopping (${signal})…\n`);
    server.stop().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  });
}
