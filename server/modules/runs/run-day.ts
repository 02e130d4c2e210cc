import { projectRun } from '@shared/compute/day/run';
import { toWire } from '@shared/compute/day/wire';
import { PLANNING_CAUTION } from '@shared/caution';
import type { PlanView } from '@shared/schemas/plan-views';
import type { RunEvent, RunSummary, RunView } from '@shared/schemas/run';
import { dayOf, type DayStationVersion } from '../plans/day-of';

/** A run as a day job takes it: the run, its events and the moment to project from. */
export interface RunWork {
  run: RunSummary;
  events: RunEvent[];
  /** seconds of EVA elapsed time */
  now: number;
}

/** The run's answer: the day as flown and the rest re-projected, on one station version. */
export function runViewOn(station: DayStationVersion, plan: PlanView, work: RunWork): RunView {
  const { day, dayPlan, route } = dayOf(station, plan);
  const events = work.events.map((e) => ({ crew: e.crew, kind: e.kind, taskId: e.taskId, at: e.at }));
  const { planned, projected, ...rest } = projectRun(dayPlan, day, route, events, work.now);
  return {
    ...rest,
    run: work.run,
    plan: {
      id: plan.id,
      title: plan.title,
      stationId: plan.stationId,
      crew: plan.crew,
      tasks: plan.tasks,
      startGmt: plan.startGmt ?? null,
    },
    airlockKey: day.airlockKey,
    events: work.events,
    planned: toWire(planned),
    projected: toWire(projected),
    plannedEndSeconds: planned.endSeconds,
    plannedMarginSeconds: planned.marginSeconds,
    projectedEndSeconds: projected.endSeconds,
    marginSeconds: projected.marginSeconds,
    tasks: plan.tasks.map((t) => ({
      id: t.id ?? null,
      title: t.title,
      crew: t.crew,
      worksite: t.worksite,
      optional: (t as { optional?: boolean }).optional === true,
    })),
    caution: PLANNING_CAUTION,
  };
}
