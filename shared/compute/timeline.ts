import type { RouteFeasible, RouteMode, RouteResult } from '../schemas/route';
import type { CrewMember, Plan, Task } from '../schemas/plan';
import {
  dayNightWindows,
  isWithinNight,
  nextNightWindowFitting,
  orbitSummary,
  type OrbitInput,
  type OrbitSummary,
  type OrbitWindow,
} from './orbit';
import { formatElapsed, formatMinutes } from './units';

export interface RouteOptions {
  mode: RouteMode;
  tetherLengthM: number;
  carrying: boolean;
  allowRide: boolean;
}

/** The route engine, injected so the timeline can be computed against any station index. */
export type RouteFn = (from: string, to: string, options: RouteOptions) => RouteResult;

export type TimelineTask = Pick<
  Task,
  'id' | 'title' | 'worksite' | 'crew' | 'durationSeconds' | 'eclipseOnly' | 'carrying' | 'socket'
>;

export type TimelinePlan = Pick<
  Plan,
  | 'crew'
  | 'routeMode'
  | 'allowRide'
  | 'orbitPhaseAtStartDeg'
  | 'timeLimitSeconds'
  | 'egressSeconds'
  | 'ingressSeconds'
> & { betaDegOverride?: number | null; tasks: readonly TimelineTask[] };

export interface TimelineInput {
  plan: TimelinePlan;
  /** node key of the airlock the EVA starts and ends at */
  airlockKey: string;
  /** the station's orbit; the plan's beta override, when set, replaces `betaDeg` */
  orbit: OrbitInput;
  /**
   * When given, worksites and sockets it does not know are warned about and never routed to. Pass it
   * whenever the route function throws on an unknown key (the station route engine does).
   */
  hasNode?: (key: string) => boolean;
}

export type TimelineBlockType = 'egress' | 'translate' | 'swap' | 'work' | 'wait' | 'ingress';

export interface TimelineBlock {
  type: TimelineBlockType;
  /** seconds of EVA elapsed time */
  start: number;
  end: number;
  label: string;
  taskIndex?: number;
  taskId?: number;
  /** translate: the stretch of the route this block covers */
  from?: string;
  to?: string;
  /** translate: the whole route; the block covers `route.legs[legStart, legEnd)` */
  route?: RouteFeasible;
  legStart?: number;
  legEnd?: number;
  swapNode?: string;
  /** work: the crew member could not get to the worksite (see the warnings) */
  unreached?: boolean;
}

export interface CrewTimeline {
  crew: CrewMember;
  blocks: TimelineBlock[];
  totalSeconds: number;
  idleSeconds: number;
  workSeconds: number;
  translateSeconds: number;
  swapSeconds: number;
  swapCount: number;
}

export type TimelineWarningCode =
  | 'over-time-limit'
  | 'route-infeasible'
  | 'route-caution'
  | 'route-note'
  | 'eclipse-only-outside-night'
  | 'unknown-worksite'
  | 'unknown-socket';

export interface TimelineWarning {
  code: TimelineWarningCode;
  message: string;
  taskIndex?: number;
  crew?: CrewMember;
  /** eclipse-only-outside-night: where the task would fit, when some night window has room */
  nextWindow?: { start: number; end: number; nightStart: number; nightEnd: number };
}

export interface Timeline {
  crew: Record<CrewMember, CrewTimeline>;
  endSeconds: number;
  timeLimitSeconds: number;
  /** time limit − end; negative when the day runs over */
  marginSeconds: number;
  fitsTimeLimit: boolean;
  orbit: OrbitSummary & { betaDeg: number; altitudeKm: number };
  /** across [0, max(time limit, end)] */
  dayWindows: OrbitWindow[];
  nightWindows: OrbitWindow[];
  warnings: TimelineWarning[];
}

const CREW: readonly CrewMember[] = ['EV1', 'EV2'];
const partnerOf = (m: CrewMember): CrewMember => (m === 'EV1' ? 'EV2' : 'EV1');

interface Lane {
  crew: CrewMember;
  at: string;
  t: number;
  blocks: TimelineBlock[];
}

function push(
  lane: Lane,
  type: TimelineBlockType,
  seconds: number,
  label: string,
  extra: Partial<TimelineBlock> = {},
) {
  const block: TimelineBlock = { type, start: lane.t, end: lane.t + seconds, label, ...extra };
  lane.blocks.push(block);
  lane.t = block.end;
}

/**
 * Lays the route into the lane: translate blocks split at the tether swaps, one swap block per
 * swap. Their durations add up to the route's total.
 */
function pushRoute(lane: Lane, route: RouteFeasible, taskIndex: number | undefined) {
  const legs = route.legs;
  const perSwap = route.swapCount > 0 ? route.swapSeconds / route.swapCount : 0;
  const travel = route.totalSeconds - route.swapSeconds;
  const legSum = legs.reduce((s, l) => s + l.seconds, 0);
  const scale = legSum > 0 ? travel / legSum : 0;
  const tag = taskIndex === undefined ? {} : { taskIndex };
  let pieceStart = 0;
  let pieceSeconds = 0;
  const flush = (legEnd: number) => {
    if (legEnd <= pieceStart) return;
    const from = legs[pieceStart].from;
    const to = legs[legEnd - 1].to;
    push(lane, 'translate', pieceSeconds, `Translate ${from} → ${to}`, {
      ...tag,
      from,
      to,
      route,
      legStart: pieceStart,
      legEnd,
    });
    pieceStart = legEnd;
    pieceSeconds = 0;
  };
  const swapBlock = (node: string) =>
    push(lane, 'swap', perSwap, `Tether swap at ${node}`, { ...tag, swapNode: node });

  let s = 0;
  legs.forEach((leg, i) => {
    pieceSeconds += leg.seconds * scale;
    const endM = leg.startM + leg.lengthM;
    while (s < route.swaps.length && route.swaps[s].atM <= endM + 1e-9) {
      flush(i + 1);
      swapBlock(route.swaps[s].node);
      s++;
    }
  });
  flush(legs.length);
  if (legs.length === 0 && travel > 0) {
    push(lane, 'translate', travel, `Translate ${lane.at} → ${route.nodes[route.nodes.length - 1] ?? ''}`, {
      ...tag,
      route,
    });
  }
  for (; s < route.swaps.length; s++) swapBlock(route.swaps[s].node);
}

function sumOf(blocks: TimelineBlock[], type: TimelineBlockType): number {
  return blocks.reduce((s, b) => (b.type === type ? s + (b.end - b.start) : s), 0);
}

function summarise(lane: Lane): CrewTimeline {
  return {
    crew: lane.crew,
    blocks: lane.blocks,
    totalSeconds: lane.t,
    idleSeconds: sumOf(lane.blocks, 'wait'),
    workSeconds: sumOf(lane.blocks, 'work'),
    translateSeconds: sumOf(lane.blocks, 'translate'),
    swapSeconds: sumOf(lane.blocks, 'swap'),
    swapCount: lane.blocks.filter((b) => b.type === 'swap').length,
  };
}

const hm = (s: number) => formatElapsed(s);
const taskName = (task: TimelineTask, i: number) => `Task ${i + 1} "${task.title}"`;

/**
 * The two-person EVA day (DESIGN §3). Both crew members leave the airlock after the egress
 * block; each then takes their tasks in plan order: translate (in the plan's route mode, with their
 * own tether and the task's carrying flag), swap tethers where the route says, work. A `both` task
 * starts in both lanes at once: the one who arrives first waits. The day ends with each translating
 * back to the airlock and, as the hatch closes on both, one shared ingress block (the first one in
 * waits for the partner).
 *
 * Problems do not stop the timeline: an unreachable worksite (unknown key, or no feasible route)
 * leaves the crew member where they were, keeps the work block (marked `unreached`) so the day's
 * length still counts it, and is a warning. Eclipse-only tasks are checked against the night
 * windows, not moved.
 */
export function computeTimeline(input: TimelineInput, route: RouteFn): Timeline {
  const { plan, airlockKey, hasNode } = input;
  const warnings: TimelineWarning[] = [];
  /** route starts that are not attach points (typically worksites) */
  const startsInPlace = new Set<string>();
  const lanes: Record<CrewMember, Lane> = {
    EV1: { crew: 'EV1', at: airlockKey, t: 0, blocks: [] },
    EV2: { crew: 'EV2', at: airlockKey, t: 0, blocks: [] },
  };
  for (const m of CREW) if (plan.egressSeconds > 0) push(lanes[m], 'egress', plan.egressSeconds, 'Egress');

  /** moves the lane to `to`; false (and a warning) when no route gets there */
  const translate = (lane: Lane, to: string, carrying: boolean, taskIndex?: number): boolean => {
    if (lane.at === to) return true;
    const result = route(lane.at, to, {
      mode: plan.routeMode,
      tetherLengthM: plan.crew[lane.crew].tetherLengthM,
      carrying,
      allowRide: plan.allowRide,
    });
    const where =
      taskIndex === undefined ? 'the airlock' : `${taskName(plan.tasks[taskIndex], taskIndex)} at ${to}`;
    if (!result.feasible) {
      warnings.push({
        code: 'route-infeasible',
        message: `${lane.crew} cannot get from ${lane.at} to ${where}: ${result.reason}`,
        taskIndex,
        crew: lane.crew,
      });
      return false;
    }
    if (result.startNotAttachable) startsInPlace.add(lane.at);
    for (const w of result.warnings) {
      // said once for the whole plan below, not on every route that leaves a worksite
      if (result.startNotAttachable && w.startsWith(`${lane.at} is not a tether attach point`)) continue;
      // caution volumes are a safety matter; the route's other remarks are notes
      const caution = result.cautionHazards.some((h) => w.includes(h));
      warnings.push({
        code: caution ? 'route-caution' : 'route-note',
        message: `${lane.crew} on the way to ${where}: ${w}`,
        taskIndex,
        crew: lane.crew,
      });
    }
    pushRoute(lane, result, taskIndex);
    lane.at = to;
    return true;
  };

  /** brings `members` to a common start time; the earlier ones wait */
  const meet = (members: readonly CrewMember[], why: string, taskIndex?: number): number => {
    const start = Math.max(...members.map((m) => lanes[m].t));
    for (const m of members) {
      const idle = start - lanes[m].t;
      if (idle > 0)
        push(
          lanes[m],
          'wait',
          idle,
          `Wait for ${partnerOf(m)} ${why}`,
          taskIndex === undefined ? {} : { taskIndex },
        );
    }
    return start;
  };

  const eclipseTasks: { index: number; start: number; end: number }[] = [];
  plan.tasks.forEach((task, i) => {
    const members = task.crew === 'both' ? CREW : [task.crew];
    const known = !hasNode || hasNode(task.worksite);
    if (!known) {
      warnings.push({
        code: 'unknown-worksite',
        message: `${taskName(task, i)}: the station has no node "${task.worksite}"`,
        taskIndex: i,
      });
    }
    if (task.socket && hasNode && !hasNode(task.socket)) {
      warnings.push({
        code: 'unknown-socket',
        message: `${taskName(task, i)}: the station has no socket "${task.socket}"`,
        taskIndex: i,
      });
    }
    const reached = new Map(
      members.map((m) => [m, known && translate(lanes[m], task.worksite, task.carrying, i)]),
    );
    const start = meet(members, `at ${task.worksite}`, i);
    for (const m of members) {
      push(lanes[m], 'work', task.durationSeconds, task.title, {
        taskIndex: i,
        ...(task.id === undefined ? {} : { taskId: task.id }),
        ...(reached.get(m) ? {} : { unreached: true }),
      });
    }
    if (task.eclipseOnly) eclipseTasks.push({ index: i, start, end: start + task.durationSeconds });
  });

  for (const m of CREW) translate(lanes[m], airlockKey, false);
  meet(CREW, 'at the airlock');
  for (const m of CREW)
    if (plan.ingressSeconds > 0) push(lanes[m], 'ingress', plan.ingressSeconds, 'Ingress');

  if (startsInPlace.size) {
    const keys = [...startsInPlace].sort();
    warnings.push({
      code: 'route-note',
      message: `Routes leaving ${keys.join(', ')} assume the crew member clips to a tether point where they stand (${keys.length === 1 ? 'it is' : 'they are'} not attach points in the model). Check the local tether points there, or add an anchor.`,
    });
  }

  const endSeconds = Math.max(lanes.EV1.t, lanes.EV2.t);
  const marginSeconds = plan.timeLimitSeconds - endSeconds;
  if (marginSeconds < 0) {
    warnings.push({
      code: 'over-time-limit',
      message: `The day ends at ${hm(endSeconds)} elapsed, ${hm(-marginSeconds)} past the ${hm(plan.timeLimitSeconds)} limit`,
    });
  }

  const orbitInput = {
    altitudeKm: input.orbit.altitudeKm,
    betaDeg: plan.betaDegOverride ?? input.orbit.betaDeg,
  };
  const summary = orbitSummary(orbitInput);
  const horizon = Math.max(plan.timeLimitSeconds, endSeconds);
  // a little past the horizon, so a task near the end can still be offered the next night
  const windows = dayNightWindows({
    ...orbitInput,
    phaseAtStartDeg: plan.orbitPhaseAtStartDeg,
    durationSeconds: horizon + 2 * summary.periodSeconds,
  });
  for (const e of eclipseTasks) {
    if (isWithinNight(windows, e.start, e.end)) continue;
    warnings.push(eclipseWarning(plan.tasks[e.index], e, windows, summary, orbitInput.betaDeg));
  }

  const shown = windows
    .filter((w) => w.start < horizon)
    .map((w) => ({ ...w, end: Math.min(w.end, horizon) }));
  return {
    crew: { EV1: summarise(lanes.EV1), EV2: summarise(lanes.EV2) },
    endSeconds,
    timeLimitSeconds: plan.timeLimitSeconds,
    marginSeconds,
    fitsTimeLimit: marginSeconds >= 0,
    orbit: { ...summary, ...orbitInput },
    dayWindows: shown.filter((w) => w.kind === 'day'),
    nightWindows: shown.filter((w) => w.kind === 'night'),
    warnings,
  };
}

function eclipseWarning(
  task: TimelineTask,
  e: { index: number; start: number; end: number },
  windows: OrbitWindow[],
  orbit: OrbitSummary,
  betaDeg: number,
): TimelineWarning {
  const base = `${taskName(task, e.index)} must be done in orbital night but runs ${hm(e.start)}–${hm(e.end)} elapsed`;
  if (orbit.eclipseSeconds <= 0) {
    return {
      code: 'eclipse-only-outside-night',
      message: `${base}; at beta ${betaDeg}° this orbit has no night (beyond ${orbit.criticalBetaDeg.toFixed(1)}°)`,
      taskIndex: e.index,
    };
  }
  const slot = nextNightWindowFitting(windows, e.start, task.durationSeconds);
  if (!slot) {
    return {
      code: 'eclipse-only-outside-night',
      message: `${base}; no night window is long enough (night lasts ${formatMinutes(orbit.eclipseSeconds)}, the task ${formatMinutes(task.durationSeconds)})`,
      taskIndex: e.index,
    };
  }
  return {
    code: 'eclipse-only-outside-night',
    message: `${base}; the next night window it fits is ${hm(slot.window.start)}–${hm(slot.window.end)} (work ${hm(slot.start)}–${hm(slot.end)})`,
    taskIndex: e.index,
    nextWindow: {
      start: slot.start,
      end: slot.end,
      nightStart: slot.window.start,
      nightEnd: slot.window.end,
    },
  };
}
