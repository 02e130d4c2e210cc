import { desc } from 'drizzle-orm';
import type { ActivityEntry } from '@shared/schemas/activity';
import type { Db } from '../../db/client';
import { activity } from '../../db/schema';

export interface ActivityInput {
  userId: number | null;
  kind: string;
  summary: string;
  link?: string;
}

export function recordActivity(db: Db, entry: ActivityInput) {
  db.insert(activity)
    .values({ ...entry, link: entry.link ?? null })
    .run();
}

export function recentActivity(db: Db, limit = 20): ActivityEntry[] {
  return db
    .select({
      id: activity.id,
      kind: activity.kind,
      summary: activity.summary,
      link: activity.link,
      createdAt: activity.createdAt,
    })
    .from(activity)
    .orderBy(desc(activity.id))
    .limit(limit)
    .all();
}
