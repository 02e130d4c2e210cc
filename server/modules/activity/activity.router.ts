import { ActivityQuerySchema } from '@shared/schemas/activity';
import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import { recentActivity } from './activity.service';

export function activityRouter(ctx: AppContext) {
  return mountRoutes('/api/activity', [
    defineRoute({
      method: 'get',
      path: '/',
      access: 'read',
      input: { query: ActivityQuerySchema },
      handler: (_req, _res, { query }) => recentActivity(ctx.db, query.limit),
    }),
  ]);
}
