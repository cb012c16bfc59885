import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

interface Secrets {
  jwtSecret: string;
}

/** Secrets generated once into the data folder (mode 0600) when not configured. */
export function loadOrCreateSecrets(dataDir: string): Secrets {
  mkdirSync(dataDir, { recursive: true });
  const file = join(dataDir, 'secrets.json');
  if (existsSync(file)) {
    const parsed = JSON.parse(readFileSync(file, 'utf8')) as Partial<Secrets>;
    if (typeof parsed.jwtSecret === 'string' && parsed.jwtSecret.length >= 32)
      return parsed as Secrets;
  }
  const secrets: Secrets = { jwtSecret: randomBytes(48).toString('base64url') };
  writeFileSync(file, JSON.stringify(secrets, null, 2) + '\n', { mode: 0o600 });
  return secrets;
}
