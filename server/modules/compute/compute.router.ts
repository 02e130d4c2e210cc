import type { z } from 'zod';
import type { AppContext } from '../../context';
import { defineRoute, mountRoutes } from '../../lib/route';
import { IdParamsSchema } from '@shared/schemas/auth';
import { RouteMatrixRequestSchema, RouteRequestSchema } from '@shared/schemas/route';
import { ReachRequestSchema, SocketPlanRequestSchema } from '@shared/schemas/sockets';
import { AcceptSocketPlanInputSchema } from '@shared/schemas/sockets';
import { OrbitQuerySchema } from './compute.schemas';
import {
  acceptSocketPlan,
  computeReach,
  computeRoute,
  computeRouteMatrix,
  orbitFor,
} from './compute.service';
import { clipMemory } from '@shared/compute/routes-clip';
import { runTask } from './tasks';
import { clipBuildCounts } from './clip-builder';
import { dayCacheStats } from './day-cache';
import { DryRunQuerySchema, withAffectedPlans, withDryRun } from '../stations/stations.router';

/** A computation on one station, open to every signed-in role: the body is parsed with `body`. */
function onStation<S extends z.ZodType>(
  path: string,
  body: S,
  compute: (stationId: number, body: z.infer<S>) => unknown,
) {
  return defineRoute({
    method: 'post',
    path: `/stations/:id/${path}`,
    access: 'read',
    input: { params: IdParamsSchema, body },
    handler: (_req, _res, input) => compute(input.params.id, input.body as z.infer<S>),
  });
}

/** The computations on a station (routes, reach, socket plan) and the orbit calculator. */
export function computeRouter(ctx: AppContext) {
  return mountRoutes('/api', [
    onStation('routes', RouteRequestSchema, (id, body) => computeRoute(ctx, id, body)),
    onStation('route-matrix', RouteMatrixRequestSchema, (id, body) => computeRouteMatrix(ctx, id, body)),
    onStation('reach', ReachRequestSchema, (id, body) => computeReach(ctx, id, body)),
    onStation('socket-plan', SocketPlanRequestSchema, (id, body) =>
      runTask(ctx, 'socket-plan', { stationId: id, request: body }),
    ),
    defineRoute({
      method: 'post',
      path: '/stations/:id/socket-plan/accept',
      access: 'sockets:save',
      status: 201,
      input: { params: IdParamsSchema, query: DryRunQuerySchema, body: AcceptSocketPlanInputSchema },
      handler: async (req, res, { params, query, body }) => {
        const answer = await withAffectedPlans(
          ctx,
          req,
          params.id,
          acceptSocketPlan(withDryRun(ctx, query.dryRun), params.id, body, req.user!),
        );
        if (!query.dryRun) return answer;
        // a dry run wrote nothing: 200 with what it would add and the reviewed plans it would touch
        res.status(200).json(answer);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/compute/stats',
      access: 'server:stats',
      handler: () => ({
        routeWorkers: ctx.routePool?.stats() ?? [],
        taskWorkers: ctx.taskPool?.stats() ?? [],
        // clip graphs kept on the main thread (routes computed there when there is no pool)
        mainThreadClip: clipMemory(),
        // clip graphs the main thread's builder threads are building, have built and failed to build
        mainThreadClipBuilds: clipBuildCounts(),
        // the day routes and timelines kept on the main thread (days computed there when there is no pool)
        mainThreadDayCache: dayCacheStats(),
        // the live streams open and what the server holds for them
        events: ctx.events.stats(),
        // the whole process (every thread's resident memory) and the main thread's heap, in bytes
        memory: process.memoryUsage(),
      }),
    }),
    defineRoute({
      method: 'get',
      path: '/orbit',
      access: 'read',
      input: { query: OrbitQuerySchema },
      handler: (_req, _res, { query }) => orbitFor(query),
    }),
  ]);
}
