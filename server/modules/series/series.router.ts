import { z } from 'zod';
import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import { IdParamsSchema } from '@shared/schemas/auth';
import { CreateSeriesInputSchema, UpdateSeriesInputSchema } from '@shared/schemas/series';
import { VersionTextSchema } from '@shared/schemas/version';
import { createSeries, deleteSeries, getSeries, listSeries, updateSeries } from './series.service';
import { answered, atParam } from '../events/changes';

const DeleteQuerySchema = z.strictObject({ version: VersionTextSchema });

/** EVA series: each EVA starts where the one before left its items. Writes are version-checked. */
export function seriesRouter(ctx: AppContext) {
  return mountRoutes('/api/series', [
    defineRoute({ method: 'get', path: '/', access: 'read', handler: () => listSeries(ctx.db) }),
    defineRoute({
      method: 'post',
      path: '/',
      access: 'plans:edit',
      status: 201,
      input: { body: CreateSeriesInputSchema },
      handler: (req, _res, { body }) => createSeries(ctx, body, req.user!),
      emits: answered('series'),
    }),
    defineRoute({
      method: 'get',
      path: '/:id',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: (_req, _res, { params }) => getSeries(ctx, params.id),
    }),
    defineRoute({
      method: 'patch',
      path: '/:id',
      access: 'plans:edit',
      input: { params: IdParamsSchema, body: UpdateSeriesInputSchema },
      handler: (req, _res, { params, body }) => updateSeries(ctx, params.id, body, req.user!),
      emits: answered('series'),
    }),
    defineRoute({
      method: 'delete',
      path: '/:id',
      access: 'plans:edit',
      input: { params: IdParamsSchema, query: DeleteQuerySchema },
      handler: (req, _res, { params, query }) => {
        deleteSeries(ctx, params.id, query.version, req.user!);
      },
      emits: atParam('series', { deleted: true }),
    }),
  ]);
}
