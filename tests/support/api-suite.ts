/**
 * A test file's server: started before its tests, stopped after them. The object it returns
 * stands for the running server from `beforeAll` on, so a file keeps it in a module constant
 * and its tests and helpers use it as they would the server itself.
 */
import { afterAll, beforeAll } from 'vitest';
import { startTestServer, type TestServer } from './test-server.ts';

export interface FileServer<Role extends string = never> extends TestServer {
  /** The session cookie of each role named in `signIn`, signed in at start. */
  readonly cookies: Readonly<Record<Role, string>>;
  /** The ingest key of the gateway made at start (with `gateway`). */
  readonly key: string;
}

export interface FileServerOptions<Role extends string> {
  /** Environment for the server (as startTestServer takes it). */
  env?: Record<string, string>;
  /** Roles to sign in at start: their cookies are in `cookies`. */
  signIn?: Role[];
  /** Make a gateway at start, of site 1 (`true`) or of the site with this id: its key is `key`. */
  gateway?: boolean | number;
}

export function testServerForFile<Role extends string = never>(
  o: FileServerOptions<Role> = {},
): FileServer<Role> {
  let running: TestServer | undefined;
  const cookies = {} as Record<Role, string>;
  let key: string | undefined;
  beforeAll(async () => {
    running = await startTestServer(o.env);
    for (const role of o.signIn ?? []) cookies[role] = await running.signIn(role);
    if (o.gateway) key = await running.gatewayKey(o.gateway === true ? 1 : o.gateway);
  });
  afterAll(async () => {
    await running?.stop();
  });
  return new Proxy({} as FileServer<Role>, {
    get(_, prop) {
      if (prop === 'cookies') return cookies;
      // Not a promise, and inspectable before the start.
      if (prop === 'then' || typeof prop === 'symbol') return undefined;
      if (!running) throw new Error('the test server starts in beforeAll: use it in a test');
      if (prop === 'key') {
        if (key === undefined) throw new Error('no gateway was made at start (gateway: true)');
        return key;
      }
      return Reflect.get(running, prop);
    },
  });
}
