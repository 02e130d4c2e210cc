import type { CrewMember } from '../../schemas/plan';
import type { RouteResult } from '../../schemas/route';
import { computeTimeline, CREW, membersOf } from './timeline';
import type {
  DayFlown,
  DayPlan,
  DayRouteFn,
  DayStart,
  DayStation,
  FlownWork,
  Timeline,
  TimelineWarning,
} from './types';

export const RUN_EVENT_KINDS = [
  'egress-done',
  'task-start',
  'task-done',
  'ingress-start',
  'ingress-done',
  'note',
] as const;
export type RunEventKind = (typeof RUN_EVENT_KINDS)[number];

/** One thing logged during a run, `at` in seconds of EVA elapsed time. */
export interface FlightEvent {
  crew: CrewMember;
  kind: RunEventKind;
  taskId?: number | null;
  at: number;
}

/** A stretch of the day as it was flown, for one crew member. */
export interface ActualBlock {
  type: 'egress' | 'work' | 'ingress';
  start: number;
  end: number;
  taskId?: number;
  taskIndex?: number;
  /** started and not yet logged done: `end` is now */
  inProgress?: boolean;
}

/** An eclipse-only task still ahead that the re-projected day puts outside a night window. */
export interface MissedNight {
  taskId?: number;
  taskIndex: number;
  title: string;
  start: number;
  end: number;
  message: string;
  /** where it would fit next, when some night window has room */
  nextWindow?: TimelineWarning['nextWindow'];
}

/** Optional tasks not yet started whose dropping brings the margin back to `targetMarginSeconds`. */
export interface DropSuggestion {
  targetMarginSeconds: number;
  taskIds: number[];
  /** the margin of the day re-projected without them */
  marginSeconds: number;
  /** whether that margin reaches the target (else these are the most that dropping can give back) */
  restores: boolean;
}

export interface RunProjection {
  now: number;
  /** the approved day */
  planned: Timeline;
  /** what was flown so far and the rest re-projected from now */
  projected: Timeline;
  actual: Record<CrewMember, ActualBlock[]>;
  missedNight: MissedNight[];
  drop: DropSuggestion | null;
  /** how the projection depends on the clock while nothing is logged */
  clock: ClockHold;
}

/**
 * A projection holds a step at now when a step still ahead has not started by its time (it starts no
 * earlier than now) or one in progress runs past its planned length (it ends no earlier than now):
 * then the rest of the day moves with the clock. Otherwise it stays as it is until `steadyUntil`,
 * the first moment one of those would begin (null: nothing left that the clock can hold).
 */
export interface ClockHold {
  held: boolean;
  steadyUntil: number | null;
}

/** Most optional tasks weighed for dropping: each one weighed costs a day's computation or two. */
export const MAX_DROP_CANDIDATES = 12;

const isOptional = (task: object) => (task as { optional?: boolean }).optional === true;

/**
 * The day as flown, from the run's events (in the order logged; a later log of the same step
 * replaces an earlier one). A crew member has got past every step of theirs before the furthest one
 * they logged, and a task started and not logged done is in progress only when it is that furthest one.
 */
export function flownFrom(plan: DayPlan, events: readonly FlightEvent[], now: number): DayFlown {
  const indexOf = new Map<number, number>();
  plan.tasks.forEach((t, i) => t.id !== undefined && indexOf.set(t.id, i));
  const work: Record<number, Partial<Record<CrewMember, FlownWork>>> = {};
  const egressEnd: DayFlown['egressEnd'] = {};
  const furthest: Record<CrewMember, number> = { EV1: -1, EV2: -1 };
  let ingress: FlownWork | undefined;
  for (const e of events) {
    if (e.kind === 'egress-done') egressEnd[e.crew] = e.at;
    else if (e.kind === 'ingress-start') ingress = { ...ingress, start: e.at };
    else if (e.kind === 'ingress-done') ingress = { ...ingress, end: e.at };
    else if ((e.kind === 'task-start' || e.kind === 'task-done') && e.taskId != null) {
      const i = indexOf.get(e.taskId);
      if (i === undefined) continue;
      const byCrew = (work[e.taskId] ??= {});
      const entry = (byCrew[e.crew] ??= {});
      if (e.kind === 'task-start') entry.start = e.at;
      else entry.end = e.at;
      for (const m of membersOf(plan.tasks[i])) furthest[m] = Math.max(furthest[m], i);
    }
  }
  if (ingress?.start !== undefined && ingress.end === undefined) ingress.inProgress = true;
  for (const m of CREW) {
    const done = ingress !== undefined ? plan.tasks.length : furthest[m];
    if (done >= 0 && egressEnd[m] === undefined) egressEnd[m] = null;
    plan.tasks.forEach((task, i) => {
      if (task.id === undefined || i > done || !membersOf(task).includes(m)) return;
      const byCrew = (work[task.id] ??= {});
      const entry = task.crew === 'both' ? (byCrew[m] ?? byCrew[m === 'EV1' ? 'EV2' : 'EV1']) : byCrew[m];
      const own = (byCrew[m] = { ...entry });
      if (i === done && own.start !== undefined && own.end === undefined) own.inProgress = true;
    });
  }
  return { now, egressEnd, work, ...(ingress ? { ingress } : {}) };
}

/** The stretches flown so far, per crew member, from what the day as flown says. */
export function actualBlocks(plan: DayPlan, flown: DayFlown): Record<CrewMember, ActualBlock[]> {
  const lanes: Record<CrewMember, ActualBlock[]> = { EV1: [], EV2: [] };
  for (const m of CREW) {
    const egress = flown.egressEnd[m];
    if (typeof egress === 'number') lanes[m].push({ type: 'egress', start: 0, end: egress });
    plan.tasks.forEach((task, taskIndex) => {
      const w = task.id === undefined ? undefined : flown.work[task.id]?.[m];
      if (w?.start === undefined) return;
      const end = w.end ?? (w.inProgress ? Math.max(w.start, flown.now) : undefined);
      if (end === undefined) return;
      lanes[m].push({
        type: 'work',
        start: w.start,
        end,
        taskId: task.id,
        taskIndex,
        ...(w.end === undefined ? { inProgress: true } : {}),
      });
    });
    const ing = flown.ingress;
    if (ing?.start !== undefined) {
      const end = ing.end ?? Math.max(ing.start, flown.now);
      lanes[m].push({
        type: 'ingress',
        start: ing.start,
        end,
        ...(ing.end === undefined ? { inProgress: true } : {}),
      });
    }
    lanes[m].sort((a, b) => a.start - b.start);
  }
  return lanes;
}

/** The same route engine, asked each distinct question once (the re-projections repeat most of them). */
function remembered(route: DayRouteFn): DayRouteFn {
  const seen = new Map<string, RouteResult>();
  return (request) => {
    const key = JSON.stringify(request);
    let result = seen.get(key);
    if (!result) {
      result = route(request);
      seen.set(key, result);
    }
    return result;
  };
}

/**
 * A run of an approved plan at `now` (seconds of EVA elapsed time): the planned day, the day as flown
 * with the rest re-projected from now by the same one pass (routes, tether, restraints, equipment,
 * night windows), the eclipse-only tasks still ahead that now miss their night window, and the
 * optional tasks still ahead whose dropping brings the margin back to the planned one (never below 0).
 */
export function projectRun(
  plan: DayPlan,
  station: DayStation,
  engine: DayRouteFn,
  events: readonly FlightEvent[],
  now: number,
  start: DayStart = {},
): RunProjection {
  const route = remembered(engine);
  const lastLogged = events.reduce((t, e) => Math.max(t, e.at), 0);
  const at = Math.max(now, lastLogged);
  const flown = flownFrom(plan, events, at);
  const planned = computeTimeline(plan, station, route, start);
  const dayWith = (tasks: DayPlan['tasks']) =>
    computeTimeline({ ...plan, tasks }, station, route, { ...start, flown });
  const projected = dayWith(plan.tasks);

  const started = (taskId: number | undefined) =>
    taskId !== undefined && CREW.some((m) => flown.work[taskId]?.[m]?.start !== undefined);
  const missedNight: MissedNight[] = [];
  for (const w of projected.warnings) {
    if (w.code !== 'eclipse-only-outside-night' || w.taskIndex === undefined) continue;
    const task = plan.tasks[w.taskIndex];
    if (started(task.id)) continue;
    const block = CREW.flatMap((m) => projected.crew[m].blocks).find(
      (b) => b.type === 'work' && b.taskIndex === w.taskIndex,
    );
    missedNight.push({
      ...(task.id === undefined ? {} : { taskId: task.id }),
      taskIndex: w.taskIndex,
      title: task.title,
      start: block?.start ?? 0,
      end: block?.end ?? 0,
      message: w.message,
      ...(w.nextWindow ? { nextWindow: w.nextWindow } : {}),
    });
  }

  const target = Math.max(0, planned.marginSeconds);
  let drop: DropSuggestion | null = null;
  if (projected.marginSeconds < target) {
    const candidates = plan.tasks
      .filter((t) => isOptional(t) && t.id !== undefined && !started(t.id))
      .sort((a, b) => b.durationSeconds - a.durationSeconds)
      .slice(0, MAX_DROP_CANDIDATES)
      .map((t) => t.id!);
    const marginWithout = (ids: readonly number[]) =>
      dayWith(withoutTasks(plan.tasks, new Set(ids))).marginSeconds;
    // longest first until the margin is back, then give back any that turn out not to be needed
    const chosen: number[] = [];
    let margin = projected.marginSeconds;
    for (const id of candidates) {
      if (margin >= target) break;
      chosen.push(id);
      margin = marginWithout(chosen);
    }
    if (margin >= target) {
      for (const id of [...chosen].reverse()) {
        const rest = chosen.filter((x) => x !== id);
        const m = marginWithout(rest);
        if (m >= target) {
          chosen.splice(chosen.indexOf(id), 1);
          margin = m;
        }
      }
    }
    if (chosen.length > 0) {
      drop = {
        targetMarginSeconds: target,
        taskIds: chosen,
        marginSeconds: margin,
        restores: margin >= target,
      };
    }
  }

  const clock = clockHold(plan, flown, projected);
  return { now: at, planned, projected, actual: actualBlocks(plan, flown), missedNight, drop, clock };
}

/**
 * Where the clock holds the projection (see `ClockHold`): the timeline sets a held start or end to
 * exactly `flown.now`, and otherwise the step's own start or end is when the clock would reach it.
 */
export function clockHold(plan: DayPlan, flown: DayFlown, projected: Timeline): ClockHold {
  const now = flown.now;
  let held = false;
  let next = Infinity;
  const watch = (at: number) => {
    if (at === now) held = true;
    else if (at > now) next = Math.min(next, at);
  };
  for (const m of CREW) {
    for (const b of projected.crew[m].blocks) {
      if (b.type === 'egress' && flown.egressEnd[m] === undefined) watch(b.end);
      else if (b.type === 'ingress' && flown.ingress?.start === undefined) watch(b.start);
      else if (b.type === 'ingress' && flown.ingress?.inProgress) watch(b.end);
      else if (b.type === 'work' && b.taskIndex !== undefined) {
        const task = plan.tasks[b.taskIndex];
        const logged = task.id === undefined ? undefined : flown.work[task.id];
        const w = logged?.[m] ?? (task.crew === 'both' ? logged?.[m === 'EV1' ? 'EV2' : 'EV1'] : undefined);
        if (!w) watch(b.start);
        else if (w.inProgress && w.end === undefined) watch(b.end);
      }
    }
  }
  return { held, steadyUntil: held || next === Infinity ? null : next };
}

/** The plan's tasks without some, and without any wait for them. */
export function withoutTasks(tasks: DayPlan['tasks'], ids: ReadonlySet<number>): DayPlan['tasks'] {
  return tasks
    .filter((t) => t.id === undefined || !ids.has(t.id))
    .map((t) => {
      const after = (t as { after?: readonly number[] }).after;
      return after ? { ...t, after: after.filter((id) => !ids.has(id)) } : t;
    });
}
