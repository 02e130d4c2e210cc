import type { AppContext } from '../../context';
import { JsonText, defineRoute, mountRoutes } from '../../lib/route';
import { IdParamsSchema } from '@shared/schemas/auth';
import { OpenRunInputSchema, RunEventInputSchema, RunQuerySchema } from '@shared/schemas/run';
import { atParam } from '../events/changes';
import type { ChangeEvent } from '@shared/schemas/events';
import {
  appendRunEvent,
  listRuns,
  openRun,
  runAsFlownCsv,
  runAsFlownPdf,
  runViewText,
  stationFlownEstimates,
} from './runs.service';

/** Runs: an approved plan as it is flown, its append-only events, and the day re-projected from now. */
export function runsRouter(ctx: AppContext) {
  return mountRoutes('/api', [
    defineRoute({
      method: 'post',
      path: '/plans/:id/runs',
      access: 'runs:fly',
      status: 201,
      input: { params: IdParamsSchema, body: OpenRunInputSchema },
      handler: (req, _res, { params, body }) => openRun(ctx, params.id, body, req.user!),
      emits: ({ params }, r): ChangeEvent => {
        const run = r as { id: number; version: number };
        return { kind: 'run', id: run.id, version: run.version, planId: params.id };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/plans/:id/runs',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: (_req, _res, { params }) => listRuns(ctx, params.id),
    }),
    defineRoute({
      method: 'get',
      path: '/runs/:id',
      access: 'read',
      input: { params: IdParamsSchema, query: RunQuerySchema },
      handler: async (_req, _res, { params, query }) =>
        new JsonText(await runViewText(ctx, params.id, query.at)),
    }),
    defineRoute({
      method: 'get',
      path: '/runs/:id/export.csv',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: async (_req, res, { params }) => {
        const csv = await runAsFlownCsv(ctx, params.id);
        res.type('text/csv; charset=utf-8').attachment(`run-${params.id}-as-flown.csv`).send(csv);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/runs/:id/export.pdf',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: async (_req, res, { params }) => {
        const pdf = await runAsFlownPdf(ctx, params.id);
        res.type('application/pdf').attachment(`run-${params.id}-as-flown.pdf`).send(pdf);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/stations/:id/flown-estimates',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: (_req, _res, { params }) => stationFlownEstimates(ctx, params.id),
    }),
    defineRoute({
      method: 'post',
      path: '/runs/:id/events',
      access: 'runs:fly',
      status: 201,
      input: { params: IdParamsSchema, body: RunEventInputSchema },
      handler: (req, _res, { params, body }) => appendRunEvent(ctx, params.id, body, req.user!),
      emits: atParam('run'),
    }),
  ]);
}
