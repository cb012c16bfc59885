import { fileURLToPath } from 'node:url';
import { migrate } from 'drizzle-orm/mysql2/migrator';
import type { Db } from './client.ts';

/** The committed migrations (drizzle-kit generate), applied in order, each once. */
export const migrationsFolder = fileURLToPath(new URL('../migrations', import.meta.url));

export async function runMigrations(db: Db): Promise<void> {
  await migrate(db, { migrationsFolder });
}
