import { computeTimeline } from '@shared/compute/day/timeline';
import type { DayStart } from '@shared/compute/day/types';
import { toWire } from '@shared/compute/day/wire';
import { notesOnDay, type NodeNote } from '@shared/compute/station-notes';
import { summaryOf } from '@shared/compute/day/summary';
import type { PlanTimeline, PlanView } from '@shared/schemas/plan-views';
import { PLANNING_CAUTION } from '@shared/caution';
import { timelineCsv, timelinePdf } from './plan-export.service';
import { runViewOn, type RunWork } from '../runs/run-day';
import { dayOf, type DayStationVersion } from './day-of';
import { rememberedTimeline } from '../compute/day-cache';
import { planSequenceOn, type SequenceWork } from './plan-sequence';

export type { DayStationVersion } from './day-of';

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
  const { day, dayPlan, route } = dayOf(station, plan);
  // the exports and a series ask for the day the timeline just computed: what the server adds differs
  const timeline = rememberedTimeline(station.compiled, [plan, start], () =>
    computeTimeline(dayPlan, day, route, start),
  );
  const { notes, ...told } = extra;
  return {
    ...timeline,
    ...told,
    ...(notes ? { stationNotes: notesOnDay(notes, timeline, plan.tasks, day.airlockKey) } : {}),
    planId: plan.id,
    planVersion: plan.version,
    stationId: plan.stationId,
    stationVersion: station.version,
    airlockKey: day.airlockKey,
    caution: PLANNING_CAUTION,
  };
}

/** `summary`: only the figures a series or a comparison reads (`DaySummary`), as JSON text. */
export type DayOutput = 'timeline' | 'csv' | 'pdf' | 'run' | 'sequence' | 'summary';

/**
 * What the server adds to a day it computes: whether the plan's station moved on since approval,
 * and the station's notes, of which the day lists those on its way (`stationNotes`).
 */
export type DayExtra = Partial<Pick<PlanTimeline, 'stationChangedSinceApproval' | 'stationChanges'>> & {
  notes?: readonly NodeNote[];
};

/** What a day job answers: JSON or CSV text, or the bytes of a PDF. */
export type DayResult = { text: string } | { bytes: Uint8Array };

/** The timeline as JSON text, or one of its exports, for a plan on a station version. */
export async function dayOutputOn(
  station: DayStationVersion,
  plan: PlanView,
  output: DayOutput,
  start: DayStart = {},
  extra: DayExtra = {},
  job: { run?: RunWork; sequence?: SequenceWork } = {},
): Promise<DayResult> {
  const { run } = job;
  if (output === 'sequence')
    return { text: JSON.stringify(planSequenceOn(station, plan, start, job.sequence)) };
  if (output === 'run') {
    if (!run) throw new Error('internal: a run job without its run');
    return { text: JSON.stringify(runViewOn(station, plan, run)) };
  }
  const timeline = planTimelineOn(station, plan, start, extra);
  if (output === 'timeline') return { text: JSON.stringify(toWire(timeline)) };
  if (output === 'summary') return { text: JSON.stringify(summaryOf(timeline)) };
  if (output === 'csv') return { text: timelineCsv(plan, timeline) };
  return { bytes: new Uint8Array(await timelinePdf(plan, timeline)) };
}
