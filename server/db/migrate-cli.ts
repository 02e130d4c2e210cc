// `npm run db:migrate`: apply pending migrations to DATABASE_URL (the server also does this at start).
import { loadConfig } from '../lib/env';
import { openDatabase } from './client';

const config = loadConfig();
const handle = openDatabase(config.databaseUrl);
const rows = handle.sqlite.prepare('select count(*) as n from __drizzle_migrations').get() as { n: number };
console.log(`${config.databaseUrl}: ${rows.n} migrations applied`);
handle.close();
