import fs from 'node:fs';
import { fileURLToPath } from 'node:url';
import { count, eq } from 'drizzle-orm';
import type { AppContext } from '../../context';
import { stations, users } from '../schema';
import { importStation, parseStationDocumentText } from '../../modules/stations/stations.service';

export const KESTREL_STATION_FILE = fileURLToPath(new URL('./kestrel-station.json', import.meta.url));

/**
 * Imports the invented demo station through the same service as the import endpoint, as the demo
 * admin, when the database has no station yet (so it runs at every start without duplicating).
 */
export function seedDemoStation(ctx: AppContext) {
  const existing = ctx.db.select({ n: count() }).from(stations).get()?.n ?? 0;
  if (existing > 0) return;
  const admin =
    ctx.db
      .select({ id: users.id, name: users.name })
      .from(users)
      .where(eq(users.email, 'admin@example.org'))
      .get() ?? null;
  const doc = parseStationDocumentText(fs.readFileSync(KESTREL_STATION_FILE, 'utf8'));
  const { counts } = importStation(ctx, doc, admin);
  ctx.logger.info({ counts }, `seeded the demo station ${doc.name}`);
}
