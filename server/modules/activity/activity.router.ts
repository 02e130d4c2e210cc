import { z } from 'zod';
import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import { recentActivity } from './activity.service';

export function activityRouter(ctx: AppContext) {
  return mountRoutes('/api/activity', [
    defineRoute({
      method: 'get',
      path: '/',
      access: 'read',
      input: { query: z.object({ limit: z.coerce.number().int().min(1).max(100).default(20) }) },
      handler: (_req, _res, { query }) => recentActivity(ctx.db, query.limit),
    }),
  ]);
}
