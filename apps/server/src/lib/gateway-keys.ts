import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';

/**
 * Gateway API keys: `tsg_<prefix>_<secret>`. The prefix finds the row; only a SHA-256 of
 * the whole key is stored (a 192-bit random secret needs no slow hash), compared in
 * constant time.
 */
export function newGatewayKey(): { key: string; prefix: string; hash: string } {
  const prefix = randomBytes(6).toString('hex');
  const key = `tsg_${prefix}_${randomBytes(24).toString('base64url')}`;
  return { key, prefix, hash: hashKey(key) };
}

export function hashKey(key: string): string {
  return createHash('sha256').update(key).digest('hex');
}

export function prefixOf(key: string): string | null {
  const m = /^tsg_([0-9a-f]{12})_[A-Za-z0-9_-]{32}$/.exec(key);
  return m ? m[1]! : null;
}

export function keyMatches(key: string, storedHash: string): boolean {
  const a = Buffer.from(hashKey(key), 'hex');
  const b = Buffer.from(storedHash, 'hex');
  return a.length === b.length && timingSafeEqual(a, b);
}
