import { computeTimeline } from '@shared/compute/day/timeline';
import type { DayStart } from '@shared/compute/day/types';
import { dayStationOf } from '@shared/compute/day/station';
import { toWire } from '@shared/compute/day/wire';
import type { CompiledStation } from '@shared/compute/compiled-station';
import type { PlanTimeline, PlanView } from '@shared/schemas/plan-views';
import type { StationDocument } from '@shared/schemas/station';
import { PLANNING_CAUTION } from '@shared/caution';
import { badRequest } from '../../lib/http-error';
import { routeOffPath } from '../compute/clip-builder';
import { timelineCsv, timelinePdf } from './plan-export.service';

/** A station version as the day is computed on it: the document and its compiled index. */
export interface DayStationVersion {
  doc: StationDocument;
  compiled: CompiledStation;
  version: number;
}

/**
 * The plan's day on one station version: one pass over the day's state (routes from each crew
 * member's tether state in the plan's mode, restraints and their reach, equipment, night windows).
 * Runs on the main thread or in a route worker: it touches no database.
 */
export function planTimelineOn(
  station: DayStationVersion,
  plan: PlanView,
  start: DayStart = {},
  extra: DayExtra = {},
): PlanTimeline {
  const { doc, compiled, version } = station;
  const day = dayStationOf(doc, compiled);
  if (!day)
    throw badRequest(`The station "${doc.name}" has no airlock, so no EVA day can be laid out on it.`);
  const timeline = computeTimeline(
    { ...plan, manifest: plan.manifest.map((m, i) => ({ ...m, key: m.key ?? `item-${i + 1}` })) },
    day,
    (request) => routeOffPath(compiled, doc, request),
    start,
  );
  return {
    ...timeline,
    ...extra,
    planId: plan.id,
    planVersion: plan.version,
    stationId: plan.stationId,
    stationVersion: version,
    airlockKey: day.airlockKey,
    caution: PLANNING_CAUTION,
  };
}

export type DayOutput = 'timeline' | 'csv' | 'pdf';

/** What the server adds to a day it computes: whether the plan's station moved on since approval. */
export type DayExtra = Partial<Pick<PlanTimeline, 'stationChangedSinceApproval' | 'stationChanges'>>;

/** What a day job answers: JSON or CSV text, or the bytes of a PDF. */
export type DayResult = { text: string } | { bytes: Uint8Array };

/** The timeline as JSON text, or one of its exports, for a plan on a station version. */
export async function dayOutputOn(
  station: DayStationVersion,
  plan: PlanView,
  output: DayOutput,
  start: DayStart = {},
  extra: DayExtra = {},
): Promise<DayResult> {
  const timeline = planTimelineOn(station, plan, start, extra);
  if (output === 'timeline') return { text: JSON.stringify(toWire(timeline)) };
  if (output === 'csv') return { text: timelineCsv(plan, timeline) };
  return { bytes: new Uint8Array(await timelinePdf(plan, timeline)) };
}
