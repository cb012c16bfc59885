/**
 * `npm run admin -- create --email <address> [--name <name>]`: the first administrator of an
 * install without demo accounts (SEED_DEMO=false), or another one. `npm run admin --
 * set-password --email <address>`: a new password for a locked-out administrator (ends
 * that account's sessions). The password is read from standard input — typed at a hidden
 * prompt, or piped (first line) — never from the command line, where other local users
 * could read it in the process list and it would stay in the shell's history.
 *
 * Uses DATABASE_URL, or the private MariaDB that `npm start` runs on DATA_DIR (start the
 * product once first: it creates the tables).
 */
import { resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { createInterface } from 'node:readline';
import { Writable } from 'node:stream';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { createDb } from '@turnstone/db/client';
import { runningLocalUrl } from '@turnstone/db/local-server';
import { assertNotNewer } from '@turnstone/db/migrate';
import { describeConnectionError } from '@turnstone/db/errors';
import { users } from '@turnstone/db/schema';
import { passwordSchema } from '@turnstone/contracts/auth';
import { loadConfig } from './config.ts';
import { createAdministrator } from './features/users/users-service.ts';
import { closePasswordPool } from './lib/passwords.ts';

const USAGE = `Usage:
  npm run admin -- create --email <address> [--name <name>]
  npm run admin -- set-password --email <address>
The password is asked for (hidden), or read from the first line of standard input:
  printf '%s\\n' "$PASSWORD" | npm run admin -- create --email ops@example.com`;

class UsageError extends Error {}

/** The password: a hidden prompt (asked twice) on a terminal, else the first line of stdin. */
async function readPassword(): Promise<string> {
  if (!process.stdin.isTTY) {
    let text = '';
    for await (const chunk of process.stdin) text += String(chunk);
    return text.split(/\r?\n/, 1)[0] ?? '';
  }
  let muted = false;
  const out = new Writable({
    write(chunk, _enc, done) {
      if (!muted) process.stdout.write(chunk);
      done();
    },
  });
  const rl = createInterface({ input: process.stdin, output: out, terminal: true });
  const ask = (q: string) =>
    new Promise<string>((r) => {
      muted = false;
      process.stdout.write(q);
      muted = true;
      rl.question('', (a) => {
        process.stdout.write('\n');
        r(a);
      });
    });
  try {
    const first = await ask('Password: ');
    const again = await ask('Password again: ');
    if (first !== again) throw new UsageError('The two passwords differ.');
    return first;
  } finally {
    rl.close();
  }
}

async function main(): Promise<number> {
  let args;
  try {
    args = parseArgs({
      args: process.argv.slice(2),
      allowPositionals: true,
      options: {
        email: { type: 'string' },
        name: { type: 'string' },
        help: { type: 'boolean', short: 'h' },
      },
    });
  } catch (err) {
    throw new UsageError(`${(err as Error).message}\n\n${USAGE}`);
  }
  const [command, ...rest] = args.positionals;
  if (args.values.help) throw new UsageError(USAGE);
  if ((command !== 'create' && command !== 'set-password') || rest.length > 0)
    throw new UsageError(USAGE);
  const email = z.string().trim().toLowerCase().email().max(254).safeParse(args.values.email);
  if (!email.success) throw new UsageError(`--email needs an e-mail address.\n\n${USAGE}`);
  const name = (args.values.name ?? 'Administrator').trim();
  if (name.length < 1 || name.length > 200) throw new UsageError('--name is 1 to 200 characters.');

  const config = loadConfig();
  const url = config.DATABASE_URL ?? runningLocalUrl(resolve(config.DATA_DIR));
  if (!url)
    throw new Error(
      'No database: set DATABASE_URL, or start the product (npm start) with the same DATA_DIR and run this beside it.',
    );
  const password = passwordSchema.safeParse(await readPassword());
  if (!password.success) throw new UsageError(password.error.issues[0]!.message);

  const handle = createDb(url, { connectionLimit: 1, batchConnectionLimit: 1 });
  try {
    await assertNotNewer(handle.pool).catch((err: unknown) => {
      throw new Error(describeConnectionError(err, url) ?? (err as Error).message);
    });
    const [tables] = await handle.pool.query("SHOW TABLES LIKE 'users'");
    if ((tables as unknown[]).length === 0)
      throw new Error('The database has no tables yet: start the product once (npm start).');
    if (command === 'set-password') {
      const [u] = await handle.db
        .select({ id: users.id })
        .from(users)
        .where(eq(users.email, email.data));
      if (!u) throw new Error(`No user has the e-mail ${email.data}.`);
    }
    const r = await createAdministrator(handle.db, {
      email: email.data,
      name,
      password: password.data,
      resetIfExists: command === 'set-password',
    });
    process.stdout.write(
      r.created
        ? `Administrator ${email.data} created (user ${r.id}); sign in with this password.\n`
        : `New password set for ${email.data}; its earlier sessions have ended.\n`,
    );
    return 0;
  } finally {
    await handle.close();
    await closePasswordPool();
  }
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    process.stderr.write(`${err instanceof Error ? err.message : String(err)}\n`);
    process.exit(err instanceof UsageError ? 2 : 1);
  },
);
