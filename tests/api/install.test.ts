/**
 * The README's install and operation commands as a new installer runs them: `npm run dev`'s
 * proxy, the demo gateway keys, the first administrator on an empty install, database
 * errors that name their cause, one session key per database, and `npm run sim` and
 * `npm run worker` run as written (real child processes against a started product).
 */
import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { freePort } from '@turnstone/db/local-server';
import { start } from '../../apps/server/src/server.ts';
import { startViteDev } from '../../apps/server/src/dev-vite.ts';
import { freshDatabase, QUIET_SERVER_ENV, startTestServer } from '../support/test-server.ts';
import { testServerForFile } from '../support/api-suite.ts';
import { snapshotBody } from '../support/signals.ts';

const tmp = () => mkdtempSync(join(process.env.TURNSTONE_TEST_TMP ?? tmpdir(), 'install-'));
const quiet = QUIET_SERVER_ENV;

interface Child {
  /** Output so far (stdout and stderr). */
  out(): string;
  exited: Promise<number | null>;
  stop(): void;
}

/** `npm run <script> -- args` as a user types it, in its own process group. */
function npmRun(script: string, args: string[], env: Record<string, string>, stdin = ''): Child {
  const child = spawn('npm', ['run', '--silent', script, '--', ...args], {
    env: { ...process.env, ...env },
    stdio: ['pipe', 'pipe', 'pipe'],
    detached: true, // npm, sh, tsx and node stop together
  });
  let out = '';
  child.stdout.on('data', (d: Buffer) => (out += d.toString()));
  child.stderr.on('data', (d: Buffer) => (out += d.toString()));
  child.stdin.end(stdin);
  const signal = (sig: NodeJS.Signals) => {
    try {
      process.kill(-child.pid!, sig);
    } catch {
      // already gone
    }
  };
  const hardStop = setTimeout(() => signal('SIGKILL'), 110_000);
  const exited = new Promise<number | null>((resolve, reject) => {
    child.on('error', reject);
    child.on('exit', (code) => {
      clearTimeout(hardStop);
      resolve(code);
    });
  });
  return { out: () => out, exited, stop: () => signal('SIGTERM') };
}

async function waitFor(what: string, check: () => Promise<boolean>, ms = 90_000): Promise<void> {
  const until = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > until) throw new Error(`gave up waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

const srv = testServerForFile();

describe('npm run dev', () => {
  it('signs in through the Vite proxy: Host and Origin agree, so no 403 cross_origin', async () => {
    const dev = await startViteDev({ apiUrl: srv.url, port: 0 });
    try {
      const res = await fetch(`${dev.url}/api/v1/auth/sign-in`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', origin: dev.url },
        body: JSON.stringify({ email: 'admin@turnstone.local', password: 'turnstone-demo' }),
      });
      expect(res.status, await res.clone().text()).toBe(200);
      const cookie = (res.headers.get('set-cookie') ?? '').split(';')[0]!;
      const me = await fetch(`${dev.url}/api/v1/me`, { headers: { cookie } });
      expect(me.status).toBe(200);
      expect(((await me.json()) as { email: string }).email).toBe('admin@turnstone.local');
      // And the app itself is served by Vite on the same origin.
      const page = await fetch(`${dev.url}/`);
      expect(page.status).toBe(200);
      expect(await page.text()).toContain('<div id="root">');
    } finally {
      await dev.vite.close();
    }
  });
});

describe('demo gateway keys', () => {
  it('DEMO_HISTORY_WEEKS=0 still writes one key per site, and the keys post', async () => {
    const text = readFileSync(join(srv.ctx.dataDir, 'demo-gateway-keys.txt'), 'utf8');
    const lines = text.trim().split('\n');
    expect(lines.map((l) => l.split(' ')[0])).toEqual(['MFP', 'TRB']);
    const key = lines[0]!.split(' ')[1]!;
    const res = await srv.call('POST', '/api/ingest/v1/snapshots', {
      body: snapshotBody('MFP-P101-MDE-H', 'install-keys-1'),
      headers: { authorization: `Bearer ${key}` },
    });
    expect(res.status).toBe(201);
  });
});

describe('npm run sim and npm run worker, as the README writes them', () => {
  it(
    'sim posts a round of the MFP points to the product on PORT; a worker process drains the queue',
    { timeout: 180_000 },
    async () => {
      const key = readFileSync(join(srv.ctx.dataDir, 'demo-gateway-keys.txt'), 'utf8')
        .split('\n')[0]!
        .split(' ')[1]!;
      const count = async (where: string) => {
        const [rows] = await srv.ctx.dbHandle.pool.query(`SELECT COUNT(*) AS n FROM ${where}`);
        return Number((rows as { n: number }[])[0]!.n);
      };
      // No --url: the default is the product on this machine at PORT.
      const sim = npmRun('sim', ['--key', key, '--count', '1'], { PORT: String(srv.port) });
      expect(await sim.exited, sim.out()).toBe(0);
      expect(sim.out()).toMatch(/rounds 1, sent \d+, accepted \d+, .*failures 0/);
      const sent = Number(/sent (\d+)/.exec(sim.out())![1]);
      expect(sent).toBeGreaterThan(0);
      expect(await count("snapshots WHERE uid LIKE 'MFP-%@%'")).toBe(sent);
      expect(await count("jobs WHERE state = 'queued'")).toBeGreaterThanOrEqual(sent);

      // The web process here runs no worker (RUN_WORKER=false): `npm run worker` drains it.
      const worker = npmRun('worker', [], { DATABASE_URL: srv.databaseUrl, LOG_LEVEL: 'info' });
      try {
        await waitFor('the worker to drain the queue', async () => {
          if ((await Promise.race([worker.exited, Promise.resolve('running')])) !== 'running')
            throw new Error(`the worker exited: ${worker.out()}`);
          return (await count("jobs WHERE state IN ('queued', 'running')")) === 0;
        });
      } finally {
        worker.stop();
      }
      await worker.exited;
      expect(worker.out()).toContain('worker started');
      expect(await count("jobs WHERE state = 'done'")).toBeGreaterThanOrEqual(sent);
      expect(await count('analyses')).toBeGreaterThanOrEqual(sent);
    },
  );
});

describe('the first administrator of an empty install', () => {
  it(
    'npm run admin -- create reads the password from stdin; the account signs in',
    { timeout: 180_000 },
    async () => {
      const empty = await startTestServer({ SEED_DEMO: 'false' });
      try {
        const users = async () => {
          const [rows] = await empty.ctx.dbHandle.pool.query('SELECT COUNT(*) AS n FROM users');
          return Number((rows as { n: number }[])[0]!.n);
        };
        expect(await users()).toBe(0);
        const env = { DATABASE_URL: empty.databaseUrl };
        // A password on the command line is refused (it would show in the process list).
        const argv = npmRun('admin', ['create', '--email', 'a@b.example', '--password', 'x'], env);
        expect(await argv.exited).toBe(2);
        // Too short: the product's password rule, nothing stored.
        const short = npmRun('admin', ['create', '--email', 'ops@plant.example'], env, 'short\n');
        expect(await short.exited).toBe(2);
        expect(short.out()).toContain('at least 8 characters');
        expect(await users()).toBe(0);

        const password = 'a long first password';
        const made = npmRun(
          'admin',
          ['create', '--email', 'Ops@Plant.example', '--name', 'Olu Ops'],
          env,
          `${password}\n`,
        );
        expect(await made.exited, made.out()).toBe(0);
        expect(made.out()).toContain('Administrator ops@plant.example created');
        const res = await empty.call('POST', '/api/v1/auth/sign-in', {
          body: { email: 'ops@plant.example', password },
        });
        expect(res.status).toBe(200);
        expect((await res.json()).user ?? {}).toBeDefined();
        const again = npmRun(
          'admin',
          ['create', '--email', 'ops@plant.example'],
          env,
          `${password}\n`,
        );
        expect(await again.exited).toBe(1);
        expect(again.out()).toContain('exists');

        // set-password: a new password for a locked-out administrator.
        const reset = npmRun(
          'admin',
          ['set-password', '--email', 'ops@plant.example'],
          env,
          'another long password\n',
        );
        expect(await reset.exited, reset.out()).toBe(0);
        const old = await empty.call('POST', '/api/v1/auth/sign-in', {
          body: { email: 'ops@plant.example', password },
        });
        expect(old.status).toBe(401);
        const [audit] = await empty.ctx.dbHandle.pool.query(
          "SELECT action FROM audit_log WHERE entity = 'user' ORDER BY id",
        );
        expect((audit as { action: string }[]).map((a) => a.action)).toEqual([
          'user.create_by_cli',
          'user.password_set_by_cli',
        ]);
      } finally {
        await empty.stop();
      }
    },
  );
});

describe('a database that cannot be used says why', () => {
  const failure = async (env: Record<string, string>) => {
    const err = await start({ ...quiet, DATA_DIR: tmp(), ...env }).then(
      async (s) => {
        await s.stop();
        return new Error('started');
      },
      (e: Error) => e,
    );
    return err.message;
  };

  it('wrong password, unknown database, nothing listening, not a mysql:// URL', async () => {
    const good = new URL(await freshDatabase());
    const wrongPassword = new URL(good);
    wrongPassword.password = 'not-the-password';
    expect(await failure({ DATABASE_URL: wrongPassword.toString() })).toMatch(
      /refused the user "\w+": wrong user name or password in DATABASE_URL/,
    );
    const unknown = new URL(good);
    unknown.pathname = '/no_such_database_here';
    expect(await failure({ DATABASE_URL: unknown.toString() })).toMatch(
      /The database "no_such_database_here" does not exist/,
    );
    const port = await freePort();
    expect(
      await failure({ DATABASE_URL: `mysql://turnstone:x@127.0.0.1:${port}/turnstone` }),
    ).toMatch(new RegExp(`Nothing is listening at 127\\.0\\.0\\.1:${port}`));
    expect(
      await failure({
        DATABASE_URL: 'mysql://turnstone:x@localhost/turnstone?socketPath=/nonexistent/mysqld.sock',
      }),
    ).toMatch(/^Nothing is at the socket file \/nonexistent\/mysqld\.sock: is MariaDB running/);
    const noScheme = await failure({ DATABASE_URL: 'localhost:3306' });
    expect(noScheme).toMatch(/^Invalid configuration:\n {2}DATABASE_URL: must be a mysql:\/\/ URL/);
    for (const m of [wrongPassword, unknown].map(String)) expect(m).not.toContain('Failed query');
  });
});

describe('one session key per database', () => {
  it("a second API process with its own key refuses to start; with the shared JWT_SECRET it accepts the first one's sessions", async () => {
    const cookie = await srv.signIn('admin');
    const env = { ...quiet, DATABASE_URL: srv.databaseUrl, SEED_DEMO: 'false' };
    const own = await start({ ...env, DATA_DIR: tmp() }).then(
      async (s) => {
        await s.stop();
        return 'started';
      },
      (e: Error) => e.message,
    );
    expect(own).toMatch(/^JWT_SECRET: this process signs sessions with another key/);

    const shared = await start({ ...env, DATA_DIR: tmp(), JWT_SECRET: srv.ctx.jwtSecret });
    try {
      const me = await fetch(`${shared.url}/api/v1/me`, { headers: { cookie } });
      expect(me.status).toBe(200);
    } finally {
      await shared.stop();
    }
    // Replaced on purpose: that process starts and the earlier sessions end there.
    const replacing = await start({ ...env, DATA_DIR: tmp(), JWT_SECRET_REPLACE: 'true' });
    try {
      const me = await fetch(`${replacing.url}/api/v1/me`, { headers: { cookie } });
      expect(me.status).toBe(401);
    } finally {
      await replacing.stop();
    }
    // …and now the first process's key is the odd one out.
    const back = await start({ ...env, DATA_DIR: srv.ctx.dataDir }).then(
      async (s) => {
        await s.stop();
        return 'started';
      },
      (e: Error) => e.message,
    );
    expect(back).toMatch(/^JWT_SECRET:/);
  });
});
