import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { request, type Server } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { brotliCompressSync } from 'node:zlib';
import express, { type ErrorRequestHandler } from 'express';
import { afterEach, describe, expect, it } from 'vitest';
import { precompressedAssets } from './precompressed-assets.ts';

// common practice, no source: a client that closes the connection before its file is sent
// is not a server error (the page was left, or a prefetch was cancelled).
describe('precompressed assets', () => {
  let server: Server | undefined;
  let dir: string | undefined;
  afterEach(() => {
    server?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  async function start(holdUntilClientLeft: boolean) {
    dir = mkdtempSync(join(tmpdir(), 'assets-'));
    const body = 'export const x = 1;\n'.repeat(5000);
    writeFileSync(join(dir, 'app-1.js'), body);
    writeFileSync(join(dir, 'app-1.js.br'), brotliCompressSync(body));
    const errors: unknown[] = [];
    const served: Promise<void>[] = [];
    const app = express();
    if (holdUntilClientLeft) {
      // Serve only once the browser has gone, so the abort is certain, not a race.
      app.use((req, res, next) => {
        served.push(
          new Promise((done) => {
            res.on('close', () => done());
            req.socket.once('close', () => next());
          }),
        );
      });
    }
    app.use(precompressedAssets(dir));
    const onError: ErrorRequestHandler = (err, _req, res, _next) => {
      errors.push(err);
      res.status(500).end();
    };
    app.use(onError);
    server = app.listen(0, '127.0.0.1');
    await new Promise((r) => server!.once('listening', r));
    const port = (server.address() as { port: number }).port;
    return { errors, served, port };
  }

  it('sends the brotli copy to a browser that accepts it', async () => {
    const { port } = await start(false);
    const res = await fetch(`http://127.0.0.1:${port}/app-1.js`, {
      headers: { 'accept-encoding': 'br' },
    });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-encoding')).toBe('br');
    expect((await res.text()).length).toBe('export const x = 1;\n'.length * 5000);
  });

  it('does not pass a browser leaving mid-request on as an error', async () => {
    const { errors, served, port } = await start(true);
    const req = request({
      host: '127.0.0.1',
      port,
      path: '/app-1.js',
      headers: { 'accept-encoding': 'br' },
    });
    req.on('error', () => {});
    req.end(() => setTimeout(() => req.destroy(), 20));
    await new Promise((r) => setTimeout(r, 100));
    await Promise.all(served);
    await new Promise((r) => setTimeout(r, 50));
    expect(served.length).toBe(1);
    expect(errors).toEqual([]);
  });
});
