import type { Db } from './db/client';
import type Database from 'better-sqlite3';
import type { AppConfig } from './lib/env';
import type { Logger } from './lib/logger';
import type { Mailer } from './lib/mail';

/** What every service needs, made once in createApp() and handed to each module. */
export interface AppContext {
  config: AppConfig;
  db: Db;
  sqlite: Database.Database;
  logger: Logger;
  mailer: Mailer;
}
