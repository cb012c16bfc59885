/**
 * Every API process on one database must sign sessions with the same key: a process with
 * its own key rejects the sessions the others issued, and people are signed out at random
 * behind a load balancer. The first process to start records a fingerprint of its key in
 * `settings` (an HMAC of a fixed text, which reveals nothing of the key); a later process
 * whose key gives another fingerprint refuses to start and says why.
 */
import { createHmac } from 'node:crypto';
import type { Db } from '@turnstone/db/client';
import { addSettingIfAbsent, putSetting, readSetting } from './settings-repository.ts';

const KEY = 'session.key_fingerprint';

export function sessionKeyFingerprint(secret: string): string {
  return createHmac('sha256', secret).update('turnstone session key fingerprint v1').digest('hex');
}

/**
 * Records this process's key fingerprint, or throws when the database already holds another
 * one. `replace` records it over the old one (on purpose: every session issued so far ends).
 */
export async function checkSessionKey(
  db: Db,
  secret: string,
  options: { replace: boolean },
): Promise<'recorded' | 'matches' | 'replaced'> {
  const mine = sessionKeyFingerprint(secret);
  if (options.replace) {
    await putSetting(db, KEY, { fingerprint: mine });
    return 'replaced';
  }
  // Two processes starting at once: one insert wins, the other reads the winner's.
  if (await addSettingIfAbsent(db, KEY, { fingerprint: mine })) return 'recorded';
  const value = await readSetting(db, KEY);
  if ((value as { fingerprint?: string } | undefined)?.fingerprint === mine) return 'matches';
  throw new Error(
    'JWT_SECRET: this process signs sessions with another key than the Turnstone processes ' +
      'already using this database, so each would reject the sessions of the others. Set ' +
      'JWT_SECRET to the same value in every API process (the first one generated it into ' +
      'its DATA_DIR/secrets.json unless JWT_SECRET was set). To replace the key on purpose ' +
      '(every session ends), start one process once with JWT_SECRET_REPLACE=true.',
  );
}
