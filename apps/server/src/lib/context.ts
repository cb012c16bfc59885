import type { Db, DbHandle } from '@turnstone/db/client';
import type { Config } from '../config.ts';
import type { Logger } from './logger.ts';

/** What every feature gets: configuration, the database, the logger and the secrets. */
export interface AppContext {
  config: Config;
  db: Db;
  dbHandle: DbHandle;
  log: Logger;
  jwtSecret: string;
  dataDir: string;
}
