import { z } from 'zod';
import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import { IdParamsSchema } from '@shared/schemas/auth';
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
import { answered, atParam } from '../events/changes';

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
    defineRoute({
      method: 'post',
      path: '/',
      access: 'walkthroughs:edit',
      status: 201,
      input: { body: CreateWalkthroughInputSchema },
      handler: (req, _res, { body }) => createWalkthrough(ctx, body, req.user!),
      emits: answered('walkthrough'),
    }),
    defineRoute({
      method: 'get',
      path: '/:id',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: (_req, _res, { params }) => walkthroughDetail(ctx, params.id),
    }),
    defineRoute({
      method: 'patch',
      path: '/:id',
      access: 'walkthroughs:edit',
      input: { params: IdParamsSchema, body: UpdateWalkthroughInputSchema },
      handler: (req, _res, { params, body }) => updateWalkthrough(ctx, params.id, body, req.user!),
      emits: answered('walkthrough'),
    }),
    defineRoute({
      method: 'delete',
      path: '/:id',
      access: 'walkthroughs:edit',
      input: { params: IdParamsSchema, query: DeleteWalkthroughQuerySchema },
      handler: (_req, _res, { params, query }) => {
        deleteWalkthrough(ctx, params.id, query.version);
      },
      emits: atParam('walkthrough', { deleted: true }),
    }),
  ]);
}
