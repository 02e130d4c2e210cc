import type { AppContext } from '../../context';
import type { DayStart } from '@shared/compute/day/types';
import type { DaySummary } from '@shared/compute/day/summary';
import { getCompiledStationAt, stationVersion } from '../compute/compiled-cache';
import type { PreviewPlanInput } from '@shared/schemas/sequence';
import { assertKeys, getPlan, stationDocFor, type PlanView } from './plans.service';
import type { RunWork } from '../runs/run-day';
import type { SequenceWork } from './plan-sequence';
import { dayOutputOn, planTimelineOn, type DayExtra, type DayOutput, type DayResult } from './plan-day';

export type { PlanTimeline } from '@shared/schemas/plan-views';
import type { PlanTimeline } from '@shared/schemas/plan-views';

/**
 * The station version a plan is computed against: an approved plan the one it was approved on (so
 * an approval stays true when the station moves on), any other plan the current one.
 */
export function planStationVersion(ctx: AppContext, plan: PlanView): number {
  if (plan.status === 'approved' && plan.approvedStationVersion != null) return plan.approvedStationVersion;
  return stationVersion(ctx.db, plan.stationId) ?? 0;
}

/** The plan's station at the version it is computed on, compiled (the live entry, or a kept version rebuilt). */
export function planStation(ctx: AppContext, plan: PlanView) {
  return getCompiledStationAt(ctx, plan.stationId, planStationVersion(ctx, plan));
}

/** The plan's day on the station version it is computed on, here on the calling thread. */
export function planTimeline(
  ctx: AppContext,
  planId: number,
  start: DayStart = {},
): { plan: PlanView; timeline: PlanTimeline } {
  const plan = getPlan(ctx.db, planId);
  return { plan, timeline: planTimelineOn(planStation(ctx, plan), plan, start) };
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
  more: {
    start?: DayStart;
    extra?: DayExtra;
    plan?: PlanView;
    run?: RunWork;
    sequence?: SequenceWork;
    /** the station version to compute on, when not the plan's own (a revision compared on today's) */
    station?: ReturnType<typeof planStation>;
  } = {},
): Promise<{ plan: PlanView; result: DayResult }> {
  const plan = more.plan ?? getPlan(ctx.db, planId);
  const station = more.station ?? planStation(ctx, plan);
  const { start = {}, extra = {}, run, sequence } = more;
  if (!ctx.routePool)
    return { plan, result: await dayOutputOn(station, plan, output, start, extra, { run, sequence }) };
  const live = station.version === stationVersion(ctx.db, plan.stationId);
  const result = await ctx.routePool.day({
    // a kept version is held by the worker beside the live one, not in its place
    station: `${ctx.config.databaseUrl}#${plan.stationId}${live ? '' : `@${station.version}`}`,
    version: station.version,
    doc: station.doc,
    plan,
    output,
    start,
    extra,
    ...(run ? { run } : {}),
    ...(sequence ? { sequence } : {}),
  });
  return { plan, result };
}

/**
 * A plan's day reduced to what a series or a comparison reads, computed where its timeline would be
 * (a route worker when there is a pool): this thread only reads the answer's few figures.
 */
export async function planDaySummary(
  ctx: AppContext,
  plan: PlanView,
  more: { start?: DayStart; station?: ReturnType<typeof planStation> } = {},
): Promise<DaySummary> {
  const { result } = await planDayOutput(ctx, plan.id, 'summary', { plan, ...more });
  return JSON.parse('text' in result ? result.text : 'null') as DaySummary;
}

/**
 * The timeline the saved plan would have with `input`'s fields laid over it, as JSON text; the
 * fields are checked as an edit's would be (station keys, references, order), and nothing is saved.
 */
export async function previewTimeline(
  ctx: AppContext,
  planId: number,
  input: PreviewPlanInput,
): Promise<string> {
  const saved = getPlan(ctx.db, planId);
  const { betaDegOverride, ...fields } = input;
  const plan: PlanView = { ...saved, ...fields };
  if (betaDegOverride !== undefined) {
    if (betaDegOverride === null) delete plan.betaDegOverride;
    else plan.betaDegOverride = betaDegOverride;
  }
  if (input.stationId !== undefined) stationDocFor(ctx, input.stationId);
  if (input.stationId !== undefined || input.tasks !== undefined || input.manifest !== undefined)
    assertKeys(planStation(ctx, plan).doc, plan.tasks, plan.manifest);
  const { result } = await planDayOutput(ctx, planId, 'timeline', { plan });
  return 'text' in result ? result.text : '';
}
