/**
 * Runs the real server in-process on port 0 against a database of its own on the run's
 * MariaDB (TEST_DATABASE_URL, set by tests/run-tests.ts). Without it — vitest started by
 * hand — a private MariaDB is started for this file.
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { randomBytes } from 'node:crypto';
import mysql from 'mysql2/promise';
import { startLocalMariadb, type LocalMariadb } from '@turnstone/db/local-server';
import { start, type RunningServer } from '../../apps/server/src/server.ts';

export const DEMO_PASSWORD = 'turnstone-demo';
export const demoEmail = (role: string) => `${role}@turnstone.local`;

/** A fetch Response whose JSON is loosely typed: tests assert on its shape. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type TestResponse = Omit<Response, 'json'> & { json(): Promise<any> };

export interface TestServer extends RunningServer {
  databaseUrl: string;
  /** fetch against the server; JSON bodies are encoded; `cookie` signs the call in. */
  call(
    method: string,
    path: string,
    init?: {
      body?: unknown;
      cookie?: string;
      headers?: Record<string, string>;
      raw?: string | Uint8Array | FormData;
    },
  ): Promise<TestResponse>;
  signIn(role: string, password?: string): Promise<string>;
  /** A new gateway of the site (created by the demo administrator); its ingest key. */
  gatewayKey(siteId?: number, name?: string): Promise<string>;
  /** POST /api/ingest/v1/snapshots with a gateway's key (and any further headers). */
  ingest(key: string, body: unknown, headers?: Record<string, string>): Promise<TestResponse>;
  /** A plain SQL query on the server's own pool (placeholders only); rows as objects. */
  q<T = Record<string, unknown>>(sqlText: string, params?: unknown[]): Promise<T[]>;
}

let ownDb: LocalMariadb | null = null;

async function baseUrl(): Promise<string> {
  if (process.env.TEST_DATABASE_URL) return process.env.TEST_DATABASE_URL;
  ownDb ??= await startLocalMariadb({
    dataDir: mkdtempSync(join(tmpdir(), 'turnstone-db-')),
    database: 'turnstone_test',
  });
  return ownDb.url;
}

/** A new, empty database on the test server; returns its URL. */
export async function freshDatabase(): Promise<string> {
  const url = new URL(await baseUrl());
  const name = `t_${randomBytes(6).toString('hex')}`;
  // Host, port or socket file as the URL says (the private server has no TCP listener).
  const conn = await mysql.createConnection({ uri: url.toString() });
  await conn.query(`CREATE DATABASE \`${name}\``);
  await conn.end();
  url.pathname = `/${name}`;
  return url.toString();
}

/**
 * How tests run the server: on port 0 of the loopback, no web build, silent, no worker, and
 * (where it seeds the demo) the demo plant without generated history.
 */
export const QUIET_SERVER_ENV: Readonly<Record<string, string>> = {
  PORT: '0',
  HOST: '127.0.0.1',
  BUILD_WEB: 'false',
  LOG_LEVEL: 'silent',
  RUN_WORKER: 'false',
  DEMO_HISTORY_WEEKS: '0',
};

/** The real server in-process over `databaseUrl`, its data in `dataDir`, quiet, `env` over that. */
export function startQuietServer(
  databaseUrl: string,
  dataDir: string,
  env: Record<string, string> = {},
): Promise<RunningServer> {
  return start({ DATABASE_URL: databaseUrl, DATA_DIR: dataDir, ...QUIET_SERVER_ENV, ...env });
}

export async function startTestServer(env: Record<string, string> = {}): Promise<TestServer> {
  const databaseUrl = await freshDatabase();
  const dataDir = mkdtempSync(join(process.env.TURNSTONE_TEST_TMP ?? tmpdir(), 'data-'));
  const server = await startQuietServer(databaseUrl, dataDir, { SEED_DEMO: 'true', ...env });
  const call: TestServer['call'] = (method, path, init = {}) => {
    const headers: Record<string, string> = { ...(init.headers ?? {}) };
    if (init.cookie) headers.cookie = init.cookie;
    let body: string | Uint8Array | FormData | undefined = init.raw;
    if (init.body !== undefined) {
      body = JSON.stringify(init.body);
      headers['content-type'] ??= 'application/json';
    }
    return fetch(server.url + path, {
      method,
      headers,
      body,
      redirect: 'manual',
    }) as Promise<TestResponse>;
  };
  const signIn: TestServer['signIn'] = async (role, password = DEMO_PASSWORD) => {
    const res = await call('POST', '/api/v1/auth/sign-in', {
      body: { email: demoEmail(role), password },
    });
    if (res.status !== 200)
      throw new Error(`sign-in as ${role} answered ${res.status}: ${await res.text()}`);
    const setCookie = res.headers.get('set-cookie') ?? '';
    return setCookie.split(';')[0]!;
  };
  const stop = async () => {
    await server.stop();
  };
  const q: TestServer['q'] = async <T>(sqlText: string, params: unknown[] = []) => {
    const [rows] = await server.ctx.dbHandle.pool.query(sqlText, params);
    return rows as T[];
  };
  const gatewayKey: TestServer['gatewayKey'] = async (siteId = 1, name = 'gw') => {
    const res = await call('POST', '/api/v1/gateways', {
      cookie: await signIn('admin'),
      body: { siteId, name },
    });
    if (res.status !== 201)
      throw new Error(`creating a gateway answered ${res.status}: ${await res.text()}`);
    return (await res.json()).apiKey as string;
  };
  const ingest: TestServer['ingest'] = (key, body, headers = {}) =>
    call('POST', '/api/ingest/v1/snapshots', {
      body,
      headers: { authorization: `Bearer ${key}`, ...headers },
    });
  return { ...server, stop, databaseUrl, call, signIn, q, gatewayKey, ingest };
}
