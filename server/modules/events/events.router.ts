import { z } from 'zod';
import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import { PresenceInputSchema } from '@shared/schemas/events';

const StreamQuerySchema = z.strictObject({
  /** the last change id seen, for clients that cannot send the `Last-Event-ID` header */
  lastEventId: z.string().max(64).optional(),
});

/**
 * The live stream (Server-Sent Events) of what changed, to signed-in people, and the presence
 * calls that say which plan a stream's screen shows.
 */
export function eventsRouter(ctx: AppContext) {
  return mountRoutes('/api/events', [
    defineRoute({
      method: 'get',
      path: '/',
      access: 'read',
      input: { query: StreamQuerySchema },
      handler: (req, res, { query }) => {
        const u = req.user!;
        ctx.events.open(
          req,
          res,
          { userId: u.id, name: u.name, role: u.role },
          req.get('Last-Event-ID') ?? query.lastEventId,
        );
      },
    }),
    defineRoute({
      method: 'post',
      path: '/presence',
      access: 'read',
      input: { body: PresenceInputSchema },
      handler: (req, _res, { body }) => ({
        presence: ctx.events.setPresence(body.connection, req.user!.id, body.planId),
      }),
    }),
  ]);
}
