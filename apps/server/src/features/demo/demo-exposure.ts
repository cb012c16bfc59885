/**
 * Demo accounts on a network: the demo password is printed in the README, so demo accounts
 * that still accept it are an open door on anything but loopback. Checked once at start.
 */
import type { AppContext } from '../../lib/context.ts';
import { isLoopback } from '../../lib/allowed-hosts.ts';
import { verifyPassword } from '../../lib/passwords.ts';
import { findUserByEmail } from '../auth/auth-repository.ts';
import { DEMO_ACCOUNTS } from './demo-seed.ts';

export const DEFAULT_DEMO_PASSWORD = 'turnstone-demo';
const EVERY_INTERFACE = new Set(['0.0.0.0', '::', '']);

/** The enabled demo accounts that still accept DEMO_PASSWORD. */
export async function openDemoAccounts(ctx: AppContext): Promise<string[]> {
  const open: string[] = [];
  for (const { email } of DEMO_ACCOUNTS) {
    const u = await findUserByEmail(ctx.db, email);
    if (u?.passwordHash && !u.disabledAt)
      if (await verifyPassword(ctx.config.DEMO_PASSWORD, u.passwordHash)) open.push(email);
  }
  return open;
}

/**
 * On a non-loopback listen address with demo accounts open: a warning; on every interface
 * with the default demo password: refuses to start unless ALLOW_DEMO_PASSWORD_ON_NETWORK.
 */
export async function checkDemoExposure(ctx: AppContext): Promise<void> {
  const { HOST, DEMO_PASSWORD, ALLOW_DEMO_PASSWORD_ON_NETWORK } = ctx.config;
  if (isLoopback(HOST)) return;
  const open = await openDemoAccounts(ctx);
  if (open.length === 0) return;
  if (
    EVERY_INTERFACE.has(HOST) &&
    DEMO_PASSWORD === DEFAULT_DEMO_PASSWORD &&
    !ALLOW_DEMO_PASSWORD_ON_NETWORK
  )
    throw new Error(
      `HOST=${HOST} would let anyone on the network sign in as ${open.join(', ')} with the ` +
        'published demo password. Change those passwords, set DEMO_PASSWORD before the first ' +
        'start or SEED_DEMO=false, or set ALLOW_DEMO_PASSWORD_ON_NETWORK=true to accept it.',
    );
  ctx.log.warn(
    `Demo accounts accept the demo password on a network address (HOST=${HOST}): ` +
      `${open.join(', ')}. Change their passwords before anyone else can reach this server.`,
  );
}
