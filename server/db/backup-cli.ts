// `npm run backup [-- <target file>]`: online backup of DATABASE_URL (default data/backups/<time>.db).
// `npm run backup -- --restore <backup file>`: restore it over DATABASE_URL (stop the server first).
import path from 'node:path';
import { backupDatabase, restoreDatabase } from './backup';

const databaseUrl = path.resolve(process.env.DATABASE_URL ?? path.join('data', 'tetherwise.db'));
const args = process.argv.slice(2);
if (args[0] === '--restore') {
  if (!args[1]) throw new Error('usage: npm run backup -- --restore <backup file>');
  restoreDatabase(path.resolve(args[1]), databaseUrl);
  console.log(`restored ${args[1]} over ${databaseUrl}`);
} else {
  const stamp = new Date().toISOString().replace(/[:.]/g, '-');
  const target = path.resolve(
    args[0] ?? path.join(path.dirname(databaseUrl), 'backups', `tetherwise-${stamp}.db`),
  );
  const { pages, bytes } = await backupDatabase(databaseUrl, target);
  console.log(`backed up ${databaseUrl} → ${target} (${pages} pages, ${(bytes / 1024).toFixed(0)} KiB)`);
}
