import { sql } from 'drizzle-orm';
import type { Db } from '@turnstone/db/client';

/** The cheapest statement the database must answer. */
export async function pingDb(db: Db): Promise<void> {
  await db.execute(sql`SELECT 1`);
}
