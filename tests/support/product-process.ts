/** The product (or a worker) as a separate process, for fault tests that kill things. */
import { spawn, type ChildProcess } from 'node:child_process';
import { join } from 'node:path';

/**
 * One process, not tsx's command-line wrapper: the wrapper runs the script in a child of its
 * own, so a SIGKILL sent to it would leave the real product running, unkilled and orphaned.
 * With tsx's loader imported into node itself, the pid is the product's.
 */
export function spawnNode(script: string, env: Record<string, string>): ChildProcess {
  return spawn(process.execPath, ['--import', 'tsx', join(process.cwd(), script)], {
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
}
export function waitForOutput(
  child: ChildProcess,
  pattern: RegExp,
  ms = 60_000,
): Promise<RegExpMatchArray> {
  return new Promise((resolve, reject) => {
    let buf = '';
    const timer = setTimeout(
      () => reject(new Error(`no ${pattern} within ${ms} ms; got: ${buf.slice(-1000)}`)),
      ms,
    );
    const on = (d: Buffer) => {
      buf += d.toString();
      const m = buf.match(pattern);
      if (m) {
        clearTimeout(timer);
        resolve(m);
      }
    };
    child.stdout!.on('data', on);
    child.stderr!.on('data', on);
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`exited (${code}) before ${pattern}: ${buf.slice(-1000)}`));
    });
  });
}
export const exited = (child: ChildProcess) =>
  new Promise<void>((r) =>
    child.exitCode !== null || child.signalCode !== null ? r() : child.once('exit', () => r()),
  );

/** Signs in as the demo admin at `url` (a running product) and creates a gateway; its key. */
export async function newGatewayKeyAt(url: string, name: string): Promise<string> {
  const signIn = await fetch(`${url}/api/v1/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'admin@turnstone.local', password: 'turnstone-demo' }),
  });
  const cookie = (signIn.headers.get('set-cookie') ?? '').split(';')[0]!;
  const { apiKey } = (await (
    await fetch(`${url}/api/v1/gateways`, {
      method: 'POST',
      headers: { cookie, 'content-type': 'application/json' },
      body: JSON.stringify({ siteId: 1, name }),
    })
  ).json()) as { apiKey: string };
  return apiKey;
}
