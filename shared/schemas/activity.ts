import { z } from 'zod';

/** `GET /api/activity?limit=`: the most recent entries first. */
export const ActivityQuerySchema = z.object({ limit: z.coerce.number().int().min(1).max(100).default(20) });

/** One line of the team's activity feed: what happened, in words, and where to look. */
export interface ActivityEntry {
  id: number;
  kind: string;
  summary: string;
  link: string | null;
  createdAt: string;
}
