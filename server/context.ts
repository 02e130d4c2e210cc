import type { Db } from './db/client';
import type Database from 'better-sqlite3';
import type { AppConfig } from './lib/env';
import type { Logger } from './lib/logger';
import type { Mailer } from './lib/mail';
import type { RoutePool } from './modules/compute/route-pool';
import type { TaskPool } from './modules/compute/task-pool';
import type { EventHub } from './modules/events/event-hub';

/** What every service needs, made once in createApp() and handed to each module. */
export interface AppContext {
  config: AppConfig;
  db: Db;
  sqlite: Database.Database;
  logger: Logger;
  mailer: Mailer;
  /** route computations off the main thread; null when `routeWorkers` is 0 */
  routePool: RoutePool | null;
  /** imports and socket plans off the main thread; null when `taskWorkers` is 0 */
  taskPool: TaskPool | null;
  /** the live stream's hub: open streams, recent changes, presence */
  events: EventHub;
}
