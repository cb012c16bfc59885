/**
 * The web app's Vite dev server in front of a running API, for `npm run dev`. Its proxy
 * passes `/api` on with the browser's own Host header (no `changeOrigin`): the API then
 * sees the same host in Host and Origin, so its same-origin check on writes and its host
 * allow-list (127.0.0.1, localhost, ALLOWED_HOSTS) accept sign-in through the proxy as they
 * do on the API's own port. Rewriting Host to the API's address made every sign-in a 403
 * `cross_origin`.
 */
import { fileURLToPath } from 'node:url';
import type { AddressInfo } from 'node:net';
import { createServer, type ViteDevServer } from 'vite';

const repoRoot = fileURLToPath(new URL('../../../', import.meta.url));

/** The proxy rule; vite.config.ts uses the same one for `npx vite` started by hand. */
export const apiProxy = (apiUrl: string) => ({
  '/api': { target: apiUrl, changeOrigin: false, xfwd: false },
});

export async function startViteDev(options: {
  apiUrl: string;
  host?: string;
  port?: number;
}): Promise<{ url: string; vite: ViteDevServer }> {
  const vite = await createServer({
    configFile: `${repoRoot}vite.config.ts`,
    server: {
      host: options.host ?? '127.0.0.1',
      port: options.port ?? 5173,
      strictPort: options.port !== undefined && options.port !== 0,
      proxy: apiProxy(options.apiUrl),
    },
    clearScreen: false,
  });
  await vite.listen();
  const addr = vite.httpServer!.address() as AddressInfo;
  const host = addr.family === 'IPv6' ? `[${addr.address}]` : addr.address;
  return { url: `http://${host}:${addr.port}`, vite };
}
