import { DEFAULT_SEQUENCE_BUDGET_MS, proposeOrder } from '@shared/compute/day/sequence';
import type { DayStart, Timeline } from '@shared/compute/day/types';
import { travelLowerBound } from '@shared/compute/travel-bound';
import type { PlanView } from '@shared/schemas/plan-views';
import type { OrderSummary, PlanSequence } from '@shared/schemas/sequence';
import { dayOf, type DayStationVersion } from './day-of';

/** What a proposal job carries beside the plan: the search's time budget. */
export interface SequenceWork {
  budgetMs?: number;
}

function summary(t: Timeline): OrderSummary {
  const warnings: Record<string, number> = {};
  for (const w of t.warnings) warnings[w.code] = (warnings[w.code] ?? 0) + 1;
  return {
    endSeconds: t.endSeconds,
    marginSeconds: t.marginSeconds,
    swapCount: t.crew.EV1.swapCount + t.crew.EV2.swapCount,
    waitSeconds: t.crew.EV1.idleSeconds + t.crew.EV2.idleSeconds,
    warningCount: t.warnings.length,
    warnings,
  };
}

/**
 * The proposed order of a plan's tasks on a station version (see `proposeOrder`), scored by the same
 * day the timeline shows, with the least translation times between worksites as the search's bound.
 * Runs in a route worker (or on the main thread without a pool): it touches no database.
 */
export function planSequenceOn(
  station: DayStationVersion,
  plan: PlanView,
  start: DayStart = {},
  work: SequenceWork = {},
): PlanSequence {
  const started = performance.now();
  const { day, dayPlan, route } = dayOf(station, plan);
  const travelSeconds = travelLowerBound(station.compiled, station.doc.settings, plan.allowRide);
  const r = proposeOrder(dayPlan, day, route, {
    budgetMs: work.budgetMs ?? DEFAULT_SEQUENCE_BUDGET_MS,
    travelSeconds,
    start,
  });
  return {
    tasks: r.order.map((i) => plan.tasks[i].id!),
    endSeconds: r.endSeconds,
    currentEndSeconds: r.currentEndSeconds,
    exact: r.exact,
    explored: r.explored,
    seconds: (performance.now() - started) / 1000,
    current: summary(r.current),
    proposal: summary(r.proposal),
  };
}
