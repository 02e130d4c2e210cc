import { z } from 'zod';
import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import {
  CreateWalkthroughInputSchema,
  DeleteWalkthroughQuerySchema,
  UpdateWalkthroughInputSchema,
} from '@shared/schemas/walkthrough';
import {
  createWalkthrough,
  deleteWalkthrough,
  listWalkthroughs,
  updateWalkthrough,
  walkthroughDetail,
} from './walkthroughs.service';
import { recordRoutes } from '../events/record-routes';

const ListQuerySchema = z.strictObject({
  planId: z.coerce.number().int().positive().optional(),
  stationId: z.coerce.number().int().positive().optional(),
});

/** Saved training walkthroughs; the playback is derived on every read from the current plan or station. */
export function walkthroughsRouter(ctx: AppContext) {
  return mountRoutes('/api/walkthroughs', [
    defineRoute({
      method: 'get',
      path: '/',
      access: 'read',
      input: { query: ListQuerySchema },
      handler: (_req, _res, { query }) => listWalkthroughs(ctx.db, query),
    }),
    ...recordRoutes(
      ctx,
      'walkthrough',
      { read: 'read', write: 'walkthroughs:edit' },
      {
        create: [CreateWalkthroughInputSchema, createWalkthrough],
        get: (id) => walkthroughDetail(ctx, id),
        update: [UpdateWalkthroughInputSchema, updateWalkthrough],
        remove: [DeleteWalkthroughQuerySchema, deleteWalkthrough],
      },
    ),
  ]);
}
