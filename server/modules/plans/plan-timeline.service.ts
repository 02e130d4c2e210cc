import type { AppContext } from '../../context';
import { badRequest } from '../../lib/http-error';
import { computeTimeline } from '@shared/compute/day/timeline';
import { dayStationOf } from '@shared/compute/day/station';
import { getCompiledStation } from '../compute/compiled-cache';
import { routeOffPath } from '../compute/clip-builder';
import { PLANNING_CAUTION, getPlan, type PlanView } from './plans.service';

export type { PlanTimeline } from '@shared/schemas/plan-views';
import type { PlanTimeline } from '@shared/schemas/plan-views';

/**
 * The plan's day on its station's current version: one pass over the day's state (routes from each
 * crew member's tether state in the plan's mode, restraints and their reach, equipment, night
 * windows), with routes from the compiled cache.
 */
export function planTimeline(ctx: AppContext, planId: number): { plan: PlanView; timeline: PlanTimeline } {
  const plan = getPlan(ctx.db, planId);
  const { doc, compiled, version } = getCompiledStation(ctx, plan.stationId);
  const station = dayStationOf(doc, compiled);
  if (!station)
    throw badRequest(`The station "${doc.name}" has no airlock, so no EVA day can be laid out on it.`);
  const timeline = computeTimeline(
    { ...plan, manifest: plan.manifest.map((m, i) => ({ ...m, key: m.key ?? `item-${i + 1}` })) },
    station,
    (request) => routeOffPath(compiled, doc, request),
  );
  return {
    plan,
    timeline: {
      ...timeline,
      planId: plan.id,
      planVersion: plan.version,
      stationId: plan.stationId,
      stationVersion: version,
      airlockKey: station.airlockKey,
      caution: PLANNING_CAUTION,
    },
  };
}
