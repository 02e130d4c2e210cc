import { z } from 'zod';
import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import { CreateSeriesInputSchema, UpdateSeriesInputSchema } from '@shared/schemas/series';
import { VersionTextSchema } from '@shared/schemas/version';
import { createSeries, deleteSeries, getSeries, listSeries, updateSeries } from './series.service';
import { recordRoutes } from '../events/record-routes';

const DeleteQuerySchema = z.strictObject({ version: VersionTextSchema });

/** EVA series: each EVA starts where the one before left its items. Writes are version-checked. */
export function seriesRouter(ctx: AppContext) {
  return mountRoutes('/api/series', [
    defineRoute({ method: 'get', path: '/', access: 'read', handler: () => listSeries(ctx.db) }),
    ...recordRoutes(
      ctx,
      'series',
      { read: 'read', write: 'plans:edit' },
      {
        create: [CreateSeriesInputSchema, createSeries],
        get: (id) => getSeries(ctx, id),
        update: [UpdateSeriesInputSchema, updateSeries],
        remove: [DeleteQuerySchema, deleteSeries],
      },
    ),
  ]);
}
