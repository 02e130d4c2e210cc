import type { AppContext } from '../../context';
import { getCompiledStation } from '../compute/compiled-cache';
import { getPlan, type PlanView } from './plans.service';
import { dayOutputOn, planTimelineOn, type DayOutput, type DayResult } from './plan-day';

export type { PlanTimeline } from '@shared/schemas/plan-views';
import type { PlanTimeline } from '@shared/schemas/plan-views';

/** The plan's day on its station's current version, computed here on the calling thread. */
export function planTimeline(ctx: AppContext, planId: number): { plan: PlanView; timeline: PlanTimeline } {
  const plan = getPlan(ctx.db, planId);
  const station = getCompiledStation(ctx, plan.stationId);
  return { plan, timeline: planTimelineOn(station, plan) };
}

/**
 * The plan's timeline (JSON text) or an export of it, for the HTTP endpoints. A day of many tasks on
 * a large station takes a while, so with a worker pool it is computed there (the worker holds the
 * compiled station as for routes) and this thread only reads the plan and the station version.
 */
export async function planDayOutput(
  ctx: AppContext,
  planId: number,
  output: DayOutput,
): Promise<{ plan: PlanView; result: DayResult }> {
  const plan = getPlan(ctx.db, planId);
  const station = getCompiledStation(ctx, plan.stationId);
  if (!ctx.routePool) return { plan, result: await dayOutputOn(station, plan, output) };
  const result = await ctx.routePool.day({
    station: `${ctx.config.databaseUrl}#${plan.stationId}`,
    version: station.version,
    doc: station.doc,
    plan,
    output,
  });
  return { plan, result };
}
