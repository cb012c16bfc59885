/**
 * `npm run dev`: the API (start(), as `npm start` but without building the web app) and the
 * web app's Vite dev server with hot reload, whose proxy sends `/api` to the API. Open the
 * Vite address (printed; 5173 unless VITE_PORT says otherwise).
 */
import { start } from './server.ts';
import { startViteDev } from './dev-vite.ts';

const server = await start({ BUILD_WEB: 'false' }).catch((err: Error) => {
  process.stderr.write(`Turnstone could not start: ${err.message}\n`);
  process.exit(1);
});
const vitePort = Number(process.env.VITE_PORT ?? 5173);
const dev = await startViteDev({ apiUrl: server.url, port: vitePort }).catch(async (err: Error) => {
  process.stderr.write(`The Vite dev server could not start: ${err.message}\n`);
  await server.stop();
  process.exit(1);
});
process.stdout.write(
  `\nTurnstone (development) at ${dev.url} — API at ${server.url}. Press Ctrl+C to stop.\n`,
);

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    void (async () => {
      await dev.vite.close().catch(() => {});
      await server.stop().catch(() => {});
      process.exit(0);
    })();
  });
}
