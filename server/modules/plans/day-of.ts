import { dayStationOf } from '@shared/compute/day/station';
import type { DayRouteFn } from '@shared/compute/day/types';
import type { CompiledStation } from '@shared/compute/compiled-station';
import type { PlanView } from '@shared/schemas/plan-views';
import type { StationDocument } from '@shared/schemas/station';
import { badRequest } from '../../lib/http-error';
import { routeOffPath } from '../compute/clip-builder';
import { rememberedRoute } from '../compute/day-cache';

/** A station version as the day is computed on it: the document and its compiled index. */
export interface DayStationVersion {
  doc: StationDocument;
  compiled: CompiledStation;
  version: number;
}

/** The day's inputs for a plan on a station version: the station's view, the plan's, the route engine. */
export function dayOf(station: DayStationVersion, plan: PlanView) {
  const { doc, compiled } = station;
  const day = dayStationOf(doc, compiled);
  if (!day)
    throw badRequest(`The station "${doc.name}" has no airlock, so no EVA day can be laid out on it.`);
  const dayPlan = {
    ...plan,
    manifest: plan.manifest.map((m, i) => ({ ...m, key: m.key ?? `item-${i + 1}` })),
  };
  // each distinct leg once per station version on this thread, across days and their outputs
  const engine: DayRouteFn = (request) => routeOffPath(compiled, doc, request);
  const route: DayRouteFn = (request) => rememberedRoute(compiled, request, engine);
  return { day, dayPlan, route };
}
