import type { CrewMember } from '../../schemas/plan';
import type { RouteResult } from '../../schemas/route';
import {
  computeTimeline,
  CREW,
  membersOf,
  partnerOf,
  ownEndOf,
  placeDay,
  socketFor,
  type LaneProgress,
  type PlacedDay,
} from './timeline';
import type { DayPlan, DayRouteFn, DayStart, DayStation, DayTask, Timeline, TimelineWarning } from './types';

/** Tasks per crew member up to which the order is searched exhaustively (with bounds). */
export const EXACT_TASKS_PER_CREW = 8;
export const DEFAULT_SEQUENCE_BUDGET_MS = 2000;
/** Share of the budget the local search has first, to give the exhaustive search a good order to beat. */
const WARM_SHARE = 0.1;
/** Share of the budget (counted from the start) the exhaustive search may use before the local search takes over. */
const EXACT_SHARE = 0.7;
/** The local search stops after this many distinct days computed, whatever the budget. */
const MAX_LOCAL_EVALUATIONS = 200_000;
/** The local search ends early after this many climbs in a row that computed no day not seen before. */
const STALE_CLIMBS = 50;
/**
 * A climb step tries at most this many moves per task of the plan, the likeliest first (`movesAround`),
 * before the climb counts as stuck and the best order is kicked: the improving move is almost always
 * among the first few hundred of several thousand on 40 tasks.
 */
const CANDIDATES_PER_TASK = 8;
/** The local search's placed days ask the bound every this many tasks placed (and on the last). */
const BOUND_EVERY = 3;
/** Seconds: a day end counts as earlier only by more than this (the same legs summed in another order). */
const END_EPS = 1e-6;

export interface SequenceOptions {
  /** wall-clock budget in milliseconds (default 2 s) */
  budgetMs?: number;
  now?: () => number;
  /**
   * A lower bound on a route's seconds between two nodes for a tether length (`travelLowerBound`);
   * without one the bound counts only work and restraint time, which is still exact, only slower to
   * prove.
   */
  travelSeconds?: (from: string, to: string, tetherLengthM?: number) => number;
  /** most tasks of one crew member for the exhaustive search (default 8) */
  exactUpTo?: number;
  /** seed of the local search's perturbations */
  seed?: number;
  /** most days the local search computes (default 200,000): with it, the same plan and seed give the same order */
  evaluations?: number;
  /** the local search's moves (default all of `MOVE_KINDS`) */
  moves?: readonly MoveKind[];
  /** where the day's items start (an EVA of a series), as for the timeline */
  start?: DayStart;
}

export interface SequenceResult {
  /** the proposed order, as indices into `plan.tasks` */
  order: number[];
  endSeconds: number;
  currentEndSeconds: number;
  /** proved the earliest end among the orders allowed */
  exact: boolean;
  /** days computed */
  explored: number;
  /** partial days the exhaustive search dropped as dominated by one it met before (see `Dominance`) */
  dominated: number;
  proposal: Timeline;
  current: Timeline;
}

interface Scored {
  order: number[];
  timeline: Timeline;
  /** warnings the current order does not have */
  added: number;
}

/** A warning as the same problem whatever the order: its code, the task (by plan index), crew and item. */
const warningKey = (
  w: Pick<TimelineWarning, 'code' | 'taskIndex' | 'crew' | 'item' | 'arm'>,
  order: readonly number[],
) =>
  `${w.code}|${w.taskIndex === undefined ? '' : order[w.taskIndex]}|${w.crew ?? ''}|${w.item ?? ''}|${w.arm ?? ''}`;

function warningCounts(timeline: Timeline, order: readonly number[]): Map<string, number> {
  const counts = new Map<string, number>();
  for (const w of timeline.warnings) {
    const k = warningKey(w, order);
    counts.set(k, (counts.get(k) ?? 0) + 1);
  }
  return counts;
}

/** How many of the day's warnings (per code, task, crew, item) the base day does not have. */
export function addedWarnings(
  base: Map<string, number>,
  timeline: Timeline,
  order: readonly number[],
): number {
  let added = 0;
  for (const [k, n] of warningCounts(timeline, order)) added += Math.max(0, n - (base.get(k) ?? 0));
  return added;
}

/** Each task's `after` ids as plan indices (unknown ids and the task itself left out). */
export function afterIndexes(tasks: readonly DayTask[]): number[][] {
  const idAt = new Map<number, number>();
  tasks.forEach((t, i) => t.id !== undefined && idAt.set(t.id, i));
  return tasks.map((t, i) =>
    (t.after ?? []).flatMap((id) => {
      const j = idAt.get(id);
      return j === undefined || j === i ? [] : [j];
    }),
  );
}

/** Whether every task's `after` tasks come before it in `order`. */
export function keepsAfter(tasks: readonly DayTask[], order: readonly number[]): boolean {
  const afterOf = afterIndexes(tasks);
  const pos = new Map(order.map((t, k) => [t, k]));
  return order.every((t, k) => afterOf[t].every((j) => (pos.get(j) ?? Infinity) < k));
}

/** A crew member's own end of the day: back at the airlock, before waiting for the partner and ingress. */
export function ownEnd(timeline: Timeline, m: CrewMember): number {
  return ownEndOf(timeline.crew[m].blocks);
}

/**
 * The order of a plan's tasks whose day ends earliest, among the orders that keep every `after` (a
 * task comes after the tasks it waits for) and give the day no warning the current order does not
 * have: so both-crew sync, eclipse-only work in night windows, restraints and the equipment rules
 * (an item picked up before it is used) hold wherever the current order keeps them, and the
 * proposal never ends later than the current order. Every candidate is the day the timeline computes
 * on it: placed task by task (`placeDay`), a day shared by every order with the same first tasks,
 * or computed whole when the plan has arm tasks; each distinct route request is asked once.
 *
 * Up to `exactUpTo` tasks per crew member a short local search finds a good order, then a branch and
 * bound over the crew members' sequences runs, and is exact when it finishes within its share of the
 * budget (see `branchAndBound`); beyond, or when that share runs out first, an iterated local search
 * from the best order so far takes the rest of the budget, and `exact` is false.
 */
export function proposeOrder(
  plan: DayPlan,
  station: DayStation,
  route: DayRouteFn,
  options: SequenceOptions = {},
): SequenceResult {
  const now = options.now ?? (() => Date.now());
  const started = now();
  const budget = options.budgetMs ?? DEFAULT_SEQUENCE_BUDGET_MS;
  const n = plan.tasks.length;
  const cachedRoutes = new Map<string, RouteResult>();
  const memoRoute: DayRouteFn = (request) => {
    const key = JSON.stringify(request);
    let hit = cachedRoutes.get(key);
    if (!hit) cachedRoutes.set(key, (hit = route(request)));
    return hit;
  };
  const attach = new Map<string, number | null>();
  const day: DayStation = {
    ...station,
    node: station.node,
    nearestAttachM(node, extra, allowRide) {
      const key = `${node}|${allowRide}|${extra.join(',')}`;
      if (!attach.has(key)) attach.set(key, station.nearestAttachM(node, extra, allowRide));
      return attach.get(key)!;
    },
  };
  let explored = 0;
  const timelineOf = (order: readonly number[]) => {
    explored++;
    return computeTimeline(
      { ...plan, tasks: order.map((i) => plan.tasks[i]) },
      day,
      memoRoute,
      options.start,
    );
  };

  const identity = plan.tasks.map((_, i) => i);
  const current = timelineOf(identity);
  const base = warningCounts(current, identity);
  const clean = cleanDay(plan, current);
  const counted = () => explored++;
  const search = searchFor(plan, clean, base, day, memoRoute, options, timelineOf, counted);
  const scorer = new Scorer(search);
  let best: Scored | null = keepsAfter(plan.tasks, identity)
    ? { order: identity, timeline: current, added: 0 }
    : null;

  // a greedy order as a seed: kept when it is allowed and better
  const greedy = scorer.score(greedyOrder(search), null);
  if (greedy && greedy.added === 0 && keepsAfter(plan.tasks, greedy.order) && better(greedy, best))
    best = greedy;
  // and one built on the day itself
  // (given at most half the budget: a build that runs out of it is dropped)
  const builtFrom = builtOrder(search, () => now() > started + budget / 2);
  const built = builtFrom && scorer.score(builtFrom, null);
  if (built && built.added === 0 && keepsAfter(plan.tasks, built.order) && better(built, best)) best = built;

  const perCrew = Math.max(...CREW.map((m) => search.laneTasks[m].length));
  let exact = n <= 1 && best !== null;
  if (!exact && perCrew <= (options.exactUpTo ?? EXACT_TASKS_PER_CREW)) {
    search.deadline = started + budget * EXACT_SHARE;
    search.now = now;
    const solo =
      clean && aloneIsFloor(plan, search) ? new SoloRest(search, day, memoRoute, options, counted) : null;
    if (solo) {
      // the floor first: it fills the table the search goes on with (no need to know it past the
      // best order so far)
      search.target = best ? best.timeline.endSeconds - END_EPS : Infinity;
      search.floor = solo.floor();
    }

    // a good order first, so the bound cuts more of the tree from the start
    const warmBy = now() + budget * WARM_SHARE;
    const warm = localSearch(search, scorer, best, warmBy, now, options);
    if (warm && warm.added === 0) best = warm;
    // after the warm-up: its days are placed faster without the table (which fills as it is asked)
    search.solo = solo;
    if (best && best.timeline.endSeconds <= search.floor + END_EPS) exact = true;
    else {
      const found = independentLanes(plan) ? laneByLane(search, best) : branchAndBound(search, best);
      best = found.best;
      exact = found.complete;
    }
  }
  if (!exact) {
    best = localSearch(search, scorer, best, started + budget, now, options);
    exact = best !== null && best.added === 0 && best.timeline.endSeconds <= search.floor + END_EPS;
  }
  const chosen = best && best.added === 0 ? best : { order: identity, timeline: current, added: 0 };
  // the day as the timeline lists it (a day placed task by task may list its warnings in another order)
  const proposal = chosen.order === identity ? current : timelineOf(chosen.order);
  return {
    order: chosen.order,
    endSeconds: proposal.endSeconds,
    currentEndSeconds: current.endSeconds,
    exact,
    explored,
    dominated: search.dominated,
    proposal,
    current,
  };
}

/**
 * What the search knows of every order that starts with `prefix` (plan indices keeping `after`) and
 * in which each crew member named in `next` goes on with that task (not in `prefix`): the bound of
 * its placed day (`dayBound`; Infinity when that day already adds a warning) and the floor under
 * every allowed order (`SoloRest.floor`). Both are at most the earliest allowed day end. With a day end
 * to beat (`target`) the bound may stop anywhere at or past it, as in the search.
 */
export function orderBounds(
  plan: DayPlan,
  station: DayStation,
  route: DayRouteFn,
  prefix: readonly number[],
  options: SequenceOptions = {},
  next: Partial<Record<CrewMember, number>> = {},
  target = Infinity,
): { bound: number; floor: number } {
  const identity = plan.tasks.map((_, i) => i);
  const timelineOf = (order: readonly number[]) =>
    computeTimeline({ ...plan, tasks: order.map((i) => plan.tasks[i]) }, station, route, options.start);
  const current = timelineOf(identity);
  const base = warningCounts(current, identity);
  const clean = cleanDay(plan, current);
  const s = searchFor(plan, clean, base, station, route, options, timelineOf, () => {});
  if (!s.root) return { bound: 0, floor: 0 };
  if (clean && aloneIsFloor(plan, s)) s.solo = new SoloRest(s, station, route, options, () => {});
  s.target = target;
  const day = s.extend(s.root, prefix);
  const left = Object.fromEntries(
    CREW.map((m) => [m, s.laneTasks[m].filter((x) => !prefix.includes(x))]),
  ) as Record<CrewMember, number[]>;
  return {
    bound: spoiled(s, day)
      ? Infinity
      : dayBound(s, day, left, { EV1: next.EV1 ?? null, EV2: next.EV2 ?? null }),
    floor: s.solo ? s.solo.floor() : 0,
  };
}

// ── days placed task by task, and what every completion of one must spend ──────────────────────────

interface Search {
  plan: DayPlan;
  tasks: readonly DayTask[];
  afterOf: number[][];
  laneTasks: Record<CrewMember, number[]>;
  /** a task's place among its crew member's tasks */
  laneAt: Record<CrewMember, Map<number, number>>;
  /** `leastPath`'s table */
  paths: Record<CrewMember, Map<number, number>>;
  /** the current order's warnings, counted per code, task, crew member and item */
  base: Map<string, number>;
  /** a day with no task placed; null when the plan has arm tasks (every order is computed whole) */
  root: PlacedDay | null;
  /** a copy of `day` with the tasks placed after it */
  extend: (day: PlacedDay, xs: readonly number[]) => PlacedDay;
  timelineOf: (order: readonly number[]) => Timeline;
  /** least seconds from the end of task a's work to the start of task b's work for m (null: the airlock) */
  between: (m: CrewMember, a: number | null, b: number | null) => number;
  /** an eclipse-only task the current order keeps in night, so every allowed order must */
  mustNight: (x: number) => boolean;
  /** the bound holds: work takes its planned time (not a day as flown) */
  bounded: boolean;
  /** no allowed order ends before this (`SoloRest.floor`; 0 when not known) */
  floor: number;
  /** each crew member's least time left alone (null where it is not a bound: see `SoloRest`) */
  solo: SoloRest | null;
  /** partial days dropped as dominated */
  dominated: number;
  /** the day end to beat, less END_EPS (Infinity: none yet): a bound at or past it need not be closer */
  target: number;
  deadline: number;
  now: () => number;
  /** calls of `timeUp` since it last read the clock, and whether the deadline has passed */
  ticks: number;
  late: boolean;
}

/** Calls of `timeUp` per reading of the clock (a reading costs microseconds, a CPU-time clock more). */
const CLOCK_EVERY = 32;

/** Whether the search's deadline has passed, the clock read once every CLOCK_EVERY calls. */
function timeUp(s: Search): boolean {
  if (s.late) return true;
  if (++s.ticks < CLOCK_EVERY) return false;
  s.ticks = 0;
  return (s.late = s.now() > s.deadline);
}

const UNREACHED_CODES = new Set([
  'route-infeasible',
  'unknown-worksite',
  'unknown-socket',
  'socket-unusable',
  'restraint-missing',
  'restraint-occupied',
]);

function searchFor(
  plan: DayPlan,
  clean: boolean,
  base: Map<string, number>,
  station: DayStation,
  route: DayRouteFn,
  options: SequenceOptions,
  timelineOf: (order: readonly number[]) => Timeline,
  counted: () => void,
): Search {
  const tasks = plan.tasks;
  const root = tasks.some((t) => t.arm) ? null : placeDay(plan, station, route, options.start);
  const laneTasks = Object.fromEntries(
    CREW.map((m) => [m, tasks.flatMap((t, i) => (membersOf(t).includes(m) ? [i] : []))]),
  ) as Record<CrewMember, number[]>;
  return {
    plan,
    tasks,
    afterOf: afterIndexes(tasks),
    laneTasks,
    laneAt: {
      EV1: new Map(laneTasks.EV1.map((x, k) => [x, k])),
      EV2: new Map(laneTasks.EV2.map((x, k) => [x, k])),
    },
    paths: { EV1: new Map(), EV2: new Map() },
    base,
    root,
    extend(day, xs) {
      const next = day.copy();
      for (const x of xs) {
        counted();
        next.place(x);
      }
      return next;
    },
    timelineOf,
    between: betweenFor(plan, clean, station, options.travelSeconds),
    mustNight: (x) =>
      tasks[x].eclipseOnly &&
      !base.has(warningKey({ code: 'eclipse-only-outside-night', taskIndex: 0 }, [x])),
    bounded: options.start?.flown === undefined,
    floor: 0,
    solo: null,
    dominated: 0,
    target: Infinity,
    deadline: Infinity,
    now: () => 0,
    ticks: 0,
    late: false,
  };
}

/**
 * The least time a crew member can spend between two tasks: nothing when they stay in the same
 * restraint, else getting out of one restraint, the least translation time between the worksites
 * and getting into the next restraint. Translation and restraint time count only when the current
 * order reaches every worksite and restraint and no task is done from an arm (an order that fails a
 * route spends no time on it, and an arm session travels differently); the proposal may not add such
 * a warning, so in a clean day no allowed order skips them. Kept as a table per crew member.
 */
function betweenFor(
  plan: DayPlan,
  clean: boolean,
  station: DayStation,
  travelSeconds?: (from: string, to: string, tetherLengthM?: number) => number,
): Search['between'] {
  const tasks = plan.tasks;
  const n = tasks.length;
  const restraintS = clean ? station.settings.restraintSeconds : 0;
  const travel = (a: string, b: string, m: CrewMember) =>
    !clean || a === b || !travelSeconds ? 0 : travelSeconds(a, b, plan.crew[m].tetherLengthM);
  const cost = (m: CrewMember, a: number | null, b: number | null) => {
    const sa = a === null ? undefined : socketFor(tasks[a], m);
    const sb = b === null ? undefined : socketFor(tasks[b], m);
    if (sa !== undefined && sa === sb) return 0;
    const from = a === null ? station.airlockKey : tasks[a].worksite;
    const to = b === null ? station.airlockKey : tasks[b].worksite;
    return (sa !== undefined ? restraintS : 0) + (sb !== undefined ? restraintS : 0) + travel(from, to, m);
  };
  // row and column 0 are the airlock
  const table = Object.fromEntries(
    CREW.map((m) => {
      const t = new Float64Array((n + 1) * (n + 1));
      for (let a = -1; a < n; a++)
        for (let b = -1; b < n; b++)
          t[(a + 1) * (n + 1) + b + 1] = cost(m, a < 0 ? null : a, b < 0 ? null : b);
      return [m, t];
    }),
  ) as Record<CrewMember, Float64Array>;
  return (m, a, b) => table[m][((a ?? -1) + 1) * (n + 1) + (b ?? -1) + 1];
}

/**
 * Whether a day placed so far already has a warning the current order does not (a day placed further
 * only adds warnings), or an eclipse-only task outside night that the current order keeps in night.
 */
function spoiled(s: Search, day: PlacedDay): boolean {
  const order = day.placed();
  const counts = new Map<string, number>();
  for (const w of day.warningsSoFar()) {
    const k = warningKey(w, order);
    const c = (counts.get(k) ?? 0) + 1;
    counts.set(k, c);
    if (c > (s.base.get(k) ?? 0)) return true;
  }
  return day.outsideNight().some((x) => s.mustNight(x));
}

/**
 * A lower bound on the day's end over every completion of a day placed so far. Every step the day
 * has taken is the same in every completion (`placeDay`), so each crew member goes on from their
 * clock. Per crew member, at the least: the tasks placed and not started, in their order, each after
 * the least way in from the one before (`between`; the first one's counts only when all of it is
 * ahead); then the work of each task still to place and the least time between works through all of
 * them and home (`leastPath`). A task's work starts no earlier than
 * where that chain puts it, nor than the end of the work of a task it is `after` that is laid, nor,
 * for a task for both, than the partner's chain puts it (a second pass); an eclipse-only task the
 * current order keeps in night starts no earlier than the first night window from then that holds
 * its work (no allowed order puts it outside night). Waits otherwise and swaps count zero. Where
 * `SoloRest` holds, each crew member's end is also at least what it gives (`SoloRest.laneBound`).
 * A crew member whose next task is decided (`reserved`: one for both, or one waiting for a task of
 * the partner's) starts its work no earlier than the chains put it, than each task it is `after`
 * ends (laid: its work end; else the least start the chains give it plus its work), and, kept in
 * night, than the first night window from then that holds it; their end is at least that start plus
 * its work, the work of their other tasks left and the least way through them home (`leastPath`),
 * and where `SoloRest` holds, that start plus the steps from its work on as alone
 * (`SoloRest.nextBound`). The day ends at the later crew member's end plus ingress.
 */
function dayBound(
  s: Search,
  day: PlacedDay,
  left: Record<CrewMember, readonly number[]>,
  reserved: Readonly<Record<CrewMember, number | null>> = NONE_RESERVED,
): number {
  if (!s.bounded) return 0;
  const progress = CREW.map((m) => day.progress(m));
  const joint =
    CREW.some((m) => left[m].some((x) => s.tasks[x].crew === 'both')) ||
    progress.some((p) => p.notStarted.some((x) => s.tasks[x].crew === 'both'));
  let partner = new Map<number, number>();
  let bound = 0;
  for (let pass = 0; pass < (joint ? 2 : 1); pass++) {
    const starts = new Map<number, number>();
    const startAt = (x: number, earliest: number) => {
      let t = Math.max(earliest, partner.get(x) ?? 0);
      for (const j of s.afterOf[x]) t = Math.max(t, day.workEndOf(j) ?? 0);
      if (s.mustNight(x)) t = day.nightStart(t, s.tasks[x].durationSeconds);
      starts.set(x, Math.max(starts.get(x) ?? 0, t));
      return t;
    };
    bound = Math.max(...CREW.map((m, k) => laneBound(s, m, progress[k], left[m], startAt)));
    partner = starts;
  }
  const placed = day.placed();
  if (s.solo) {
    for (const [k, m] of CREW.entries()) bound = Math.max(bound, s.solo.laneBound(m, progress[k], placed));
  }
  for (const m of CREW) {
    const x = reserved[m];
    if (x === null || progress[CREW.indexOf(m)].back !== null) continue;
    // x is m's next task: its work starts no earlier than the chains put it, nor than the work of
    // each task it is `after` can end
    const dur = (y: number) => s.tasks[y].durationSeconds;
    let start = partner.get(x) ?? 0;
    for (const j of s.afterOf[x]) start = Math.max(start, day.workEndOf(j) ?? (partner.get(j) ?? 0) + dur(j));
    if (s.mustNight(x)) start = day.nightStart(start, dur(x));
    const rest = left[m].filter((y) => y !== x);
    let after = dur(x) + leastPath(s, m, x, rest);
    for (const y of rest) after += dur(y);
    bound = Math.max(bound, start + after);
    if (s.solo) bound = Math.max(bound, s.solo.nextBound(m, placed, x, start));
  }
  return bound + s.plan.ingressSeconds;
}

const NONE_RESERVED: Readonly<Record<CrewMember, number | null>> = { EV1: null, EV2: null };

/** One crew member's part of `dayBound`: the earliest they can be back at the airlock. */
function laneBound(
  s: Search,
  m: CrewMember,
  p: LaneProgress,
  left: readonly number[],
  startAt: (x: number, earliest: number) => number,
): number {
  if (p.back !== null) return p.back;
  const dur = (x: number) => s.tasks[x].durationSeconds;
  let t = p.t;
  let prev = p.lastStarted;
  p.notStarted.forEach((x, k) => {
    if (k > 0 || p.wayInAhead) t += s.between(m, prev, x);
    t = startAt(x, t) + dur(x);
    prev = x;
  });
  let work = 0;
  let latest = 0;
  for (const x of left) {
    let into = s.between(m, prev, x);
    for (const y of left) if (y !== x) into = Math.min(into, s.between(m, y, x));
    work += dur(x);
    latest = Math.max(latest, startAt(x, t + into) + dur(x));
  }
  let home = left.length ? Infinity : s.between(m, prev, null);
  for (const x of left) home = Math.min(home, s.between(m, x, null));
  return Math.max(t + work + leastPath(s, m, prev, left), latest + home);
}

/** Tasks of one crew member up to which `leastPath` tries every order of those left. */
const PATH_TASKS = 12;

/**
 * The least time between works from `prev` through every task of `left` and home, each leg at its
 * least (`between`): the best order, over every order of them (a table over subsets, kept per crew
 * member), when the crew member has up to PATH_TASKS tasks; else each task's least way in from any
 * task that could come before it and the least way home.
 */
function leastPath(s: Search, m: CrewMember, prev: number | null, left: readonly number[]): number {
  const lane = s.laneTasks[m];
  if (lane.length > PATH_TASKS) {
    let sum = 0;
    for (const x of left) {
      let into = s.between(m, prev, x);
      for (const y of left) if (y !== x) into = Math.min(into, s.between(m, y, x));
      sum += into;
    }
    let home = left.length ? Infinity : s.between(m, prev, null);
    for (const x of left) home = Math.min(home, s.between(m, x, null));
    return sum + home;
  }
  const at = s.laneAt[m];
  const memo = s.paths[m];
  const size = 1 << lane.length;
  const walk = (p: number, mask: number): number => {
    if (mask === 0) return s.between(m, p < 0 ? null : lane[p], null);
    const key = (p + 1) * size + mask;
    const known = memo.get(key);
    if (known !== undefined) return known;
    let best = Infinity;
    for (let k = 0; k < lane.length; k++) {
      if (!(mask & (1 << k))) continue;
      best = Math.min(best, s.between(m, p < 0 ? null : lane[p], lane[k]) + walk(k, mask ^ (1 << k)));
    }
    memo.set(key, best);
    return best;
  };
  let mask = 0;
  for (const x of left) mask |= 1 << at.get(x)!;
  return walk(prev === null ? -1 : at.get(prev)!, mask);
}

/** The current order reaches every worksite and restraint, and no task is done from an arm. */
function cleanDay(plan: DayPlan, current: Timeline): boolean {
  return !current.warnings.some((w) => UNREACHED_CODES.has(w.code)) && !plan.tasks.some((t) => t.arm);
}

/** The partner can only hold a crew member up (with a day that reaches everything: see `SoloRest`). */
const aloneIsFloor = (plan: DayPlan, s: Search) =>
  s.bounded &&
  s.root !== null &&
  !plan.manifest.some((i) => i.kind === 'large-item' || i.kind === 'tether-anchor');

/**
 * One crew member's tasks as a plan of their own (a task for both done alone from their socket,
 * `after` kept among their own tasks), as a search: its task k is the crew member's k-th task.
 */
function soloSearch(
  s: Search,
  m: CrewMember,
  station: DayStation,
  route: DayRouteFn,
  options: SequenceOptions,
  counted: () => void,
): Search {
  const plan = s.plan;
  const mine = s.laneTasks[m];
  const ids = new Set(mine.map((x) => plan.tasks[x].id));
  const solo: DayPlan = {
    ...plan,
    tasks: mine.map((x) => {
      const { sockets: _both, socket: _one, ...task } = plan.tasks[x];
      const socket = socketFor(plan.tasks[x], m);
      return {
        ...task,
        crew: m,
        ...(socket === undefined ? {} : { socket }),
        after: (task.after ?? []).filter((id) => ids.has(id)),
      };
    }),
  };
  return searchFor(solo, true, new Map(), station, route, options, s.timelineOf, counted);
}

// ── each crew member alone: the least time left, a table over their tasks left ─────────────────────

/** Thrown out of the table's recursion when the search's time is up (nothing half-made is kept). */
const OUT_OF_TIME = Symbol('out of time');

/**
 * Each crew member's least time alone from the end of the work of their last task placed to their
 * return to the airlock, over every order of their tasks still to place (`after` kept among their
 * own), every leg the real route: a table over (tasks left, the state the crew member is in: place,
 * tether state, restraint, steps ahead), filled from the prefixes the search meets (`soloSearch`'s
 * days). Alone, the same steps take their own time and nothing else (no wait), and in any day of
 * the plan that crew member's steps are the same requests (no portable anchor or large item, the
 * plan's own order reaches everything: as for `soloFloor`) with waits between, so a crew member's
 * own end is at least their clock plus the work still ahead in tasks placed and not started plus
 * this. Left empty (0) for a prefix whose table is not made by the search's deadline. Orders whose
 * routes fail or warn more than the plan's own order (`spoils`) are left out: every day of the plan
 * with that sequence has the same routes, so none of them is allowed.
 *
 * It holds when the partner can only hold a crew member up: no portable anchor or large item in the
 * manifest (an anchor the partner installs, or a large item they take, could shorten the crew
 * member's routes), no arm, the plan's own order reaches every worksite and restraint (then no
 * allowed order fails a route, and the crew member's routes are the same requests alone: their
 * tether and the items' effect on routes do not depend on the partner) and the work takes its
 * planned time. Alone, a crew member's day loses only the waits for the partner (sync and `after`),
 * so it ends no later than in the day of any order with the same sequence.
 */
class SoloRest {
  private readonly alone: Record<CrewMember, Search>;
  /** a crew member's plan indices to the solo plan's */
  private readonly soloIndex: Record<CrewMember, Map<number, number>>;
  private readonly table = new Map<string, number>();
  /** lower bounds where the least time was not needed */
  private readonly least = new Map<string, number>();
  private readonly days = new Map<string, PlacedDay>();

  constructor(
    private readonly s: Search,
    station: DayStation,
    route: DayRouteFn,
    options: SequenceOptions,
    counted: () => void,
  ) {
    this.alone = {
      EV1: soloSearch(s, 'EV1', station, route, options, counted),
      EV2: soloSearch(s, 'EV2', station, route, options, counted),
    };
    this.soloIndex = {
      EV1: new Map(s.laneTasks.EV1.map((x, k) => [x, k])),
      EV2: new Map(s.laneTasks.EV2.map((x, k) => [x, k])),
    };
  }

  size() {
    return this.table.size;
  }

  /**
   * A floor under every allowed order's day end: each crew member's earliest own return with their
   * tasks alone (a task for both done alone from their socket, `after` kept among their own tasks),
   * over every sequence of them whose routes are all feasible, plus ingress; where that is not
   * below the day end to beat, it may stop there. 0 when not known by the search's deadline.
   */
  floor(): number {
    let floor = 0;
    for (const m of CREW) {
      const t = this.alone[m].root!.progress(m).t;
      const rest = this.rest(m, [], this.need(t));
      if (this.s.late || rest === Infinity) return 0;
      floor = Math.max(floor, t + rest);
    }
    return floor + this.s.plan.ingressSeconds;
  }

  /**
   * The least time left alone after `prefix` (plan indices, in order), or a lower bound on it of at
   * least `need` (then it is not asked further), or 0 when not known in time.
   */
  rest(m: CrewMember, prefix: readonly number[], need = Infinity): number {
    const a = this.alone[m];
    const solo = this.soloOf(m, prefix);
    const day = this.dayOf(m, solo);
    if (!day) return 0;
    let mask = (1 << a.laneTasks[m].length) - 1;
    for (const k of solo) mask &= ~(1 << k);
    try {
      return this.restFrom(m, day, mask, need);
    } catch (e) {
      if (e === OUT_OF_TIME) return 0;
      throw e;
    }
  }

  /**
   * The earliest a crew member can be back at the airlock in a day that placed `placed` (plan
   * indices): from their clock, the steps ahead in tasks placed and not started (alone, when all of
   * the way into the first of them is ahead; else their work alone), then `rest`.
   */
  laneBound(m: CrewMember, p: LaneProgress, placed: readonly number[]): number {
    if (p.back !== null) return p.back;
    const prefix = placed.filter((x) => this.soloIndex[m].has(x));
    const started = prefix.slice(0, prefix.length - p.notStarted.length);
    let ahead = 0;
    const to = this.dayOf(m, this.soloOf(m, prefix));
    const from = p.wayInAhead ? this.dayOf(m, this.soloOf(m, started)) : null;
    if (to && from) ahead = to.progress(m).t - from.progress(m).t;
    else for (const x of p.notStarted) ahead += this.s.tasks[x].durationSeconds;
    return p.t + ahead + this.rest(m, prefix, this.need(p.t + ahead));
  }

  /**
   * The earliest a crew member can be back when their next task is `x` and its work starts at
   * `start` at the earliest: then x's work, the steps after it as alone, and `rest`.
   */
  nextBound(m: CrewMember, placed: readonly number[], x: number, start: number): number {
    const prefix = [...placed.filter((y) => this.soloIndex[m].has(y)), x];
    const day = this.dayOf(m, this.soloOf(m, prefix));
    const end = day?.workEndOf(this.soloIndex[m].get(x)!);
    if (!day || end === undefined) return 0;
    const from = start + this.s.tasks[x].durationSeconds + (day.progress(m).t - end);
    return from + this.rest(m, prefix, this.need(from));
  }

  /** The time left after `t` past which a crew member's end cannot beat the day to beat. */
  private need(t: number): number {
    return this.s.target - this.s.plan.ingressSeconds - t;
  }

  /**
   * Whether a day alone (its warnings, its order in solo indices) has a failed route, or a route
   * warning more often than the plan's own order: a crew member's routes are the same requests in
   * every day of the plan with their sequence, so each such day would have it too (not allowed).
   */
  private spoils(m: CrewMember, warnings: readonly TimelineWarning[], order: readonly number[]): boolean {
    const counts = new Map<string, number>();
    for (const w of warnings) {
      if (w.code === 'route-infeasible') return true;
      if (w.code !== 'route-caution' && w.code !== 'route-note') continue;
      const task = w.taskIndex === undefined ? undefined : this.s.laneTasks[m][order[w.taskIndex]];
      const k = warningKey(
        { ...w, taskIndex: task === undefined ? undefined : 0 },
        task === undefined ? [] : [task],
      );
      const c = (counts.get(k) ?? 0) + 1;
      counts.set(k, c);
      if (c > (this.s.base.get(k) ?? 0)) return true;
    }
    return false;
  }

  private soloOf(m: CrewMember, prefix: readonly number[]): number[] {
    return prefix.map((x) => this.soloIndex[m].get(x)!);
  }

  /** The solo day of a prefix (kept for the last prefixes asked), null when a route fails on it. */
  private dayOf(m: CrewMember, solo: readonly number[]): PlacedDay | null {
    const key = `${m}:${solo.join(',')}`;
    const known = this.days.get(key);
    if (known) return known;
    const a = this.alone[m];
    const before = solo.length ? this.dayOf(m, solo.slice(0, -1)) : a.root!;
    if (!before) return null;
    const day = solo.length ? a.extend(before, solo.slice(-1)) : before;
    if (this.days.size >= 4096) this.days.clear();
    const failed = day.warningsSoFar().some((w) => w.code === 'route-infeasible');
    if (!failed) this.days.set(key, day);
    return failed ? null : day;
  }

  /**
   * The least time alone from `day` through the tasks of `mask` home, when it is below `need`;
   * else a lower bound on it of at least `need`, kept apart and bettered when asked with a higher
   * `need`. Tasks are tried in the order of their least way (`between`, work, `leastPath`), and one
   * whose least way cannot beat `need` nor the best found is not placed.
   */
  private restFrom(m: CrewMember, day: PlacedDay, mask: number, need: number): number {
    const t = day.progress(m).t;
    if (mask === 0) {
      // every task placed: the lane's clock may be anywhere past its own end (not kept: a whole
      // lane's state does not say where)
      const timeline = day.copy().finish();
      return this.spoils(m, timeline.warnings, day.placed()) ? Infinity : ownEnd(timeline, m) - t;
    }
    const key = `${m}|${mask}|${day.laneState(m)}`;
    const known = this.table.get(key);
    if (known !== undefined) return known;
    // with a task left the crew member goes on from their clock: never less than 0
    const least = this.least.get(key) ?? 0;
    if (least >= need) return least;
    const s = this.s;
    if (timeUp(s)) throw OUT_OF_TIME;
    const a = this.alone[m];
    const lane = a.laneTasks[m];
    let best = Infinity;
    const placed = day.placed();
    const last = placed.length ? placed[placed.length - 1] : null;
    const left = lane.filter((k) => mask & (1 << k));
    let work = 0;
    for (const k of left) work += a.tasks[k].durationSeconds;
    const firsts = left
      .filter((k) => !a.afterOf[k].some((j) => mask & (1 << j)))
      .map((k) => ({
        k,
        floor:
          a.between(m, last, k) +
          work +
          leastPath(
            a,
            m,
            k,
            left.filter((j) => j !== k),
          ),
      }))
      .sort((x, y) => x.floor - y.floor);
    for (const { k, floor } of firsts) {
      const cap = Math.min(need, best);
      if (floor >= cap) {
        best = Math.min(best, floor);
        break;
      }
      const next = a.extend(day, [k]);
      if (this.spoils(m, next.warningsSoFar(), next.placed())) continue;
      const rest = mask & ~(1 << k);
      let v = Infinity;
      if (rest === 0) {
        // the day alone is whole: its own end (the lane's clock may be past it)
        const timeline = next.finish();
        if (!this.spoils(m, timeline.warnings, next.placed())) v = ownEnd(timeline, m) - t;
      } else {
        const step = next.progress(m).t - t;
        v = step + this.restFrom(m, next, rest, cap - step);
      }
      best = Math.min(best, v);
    }
    if (best < need) this.table.set(key, best);
    else this.least.set(key, best);
    return best;
  }
}

// ── branch and bound over both crew members' sequences ─────────────────────────────────────────────

interface Node {
  /** the plan order so far (a prefix of the final list) */
  list: number[];
  /** each crew member's tasks so far, in order */
  lane: Record<CrewMember, number[]>;
  /** a crew member's next task, decided but waiting for the partner (a task for both, or an `after`) */
  reserved: Record<CrewMember, number | null>;
}

/** Partial days the dominance table keeps at most (each a key and a few clocks). */
const DOMINANCE_ENTRIES = 200_000;

/**
 * Dominance between partial days: two prefixes that placed the same tasks and left the day in the
 * same state (`stateOf`: places, tether states, restraints, steps ahead, items, effects due,
 * warnings) differ only in their clocks, and the one whose clocks (each crew member's, and the work
 * ends the tasks left wait for) are each no later has, for every completion, a day that ends no
 * later and has the same warnings: every completion of the other can go. That holds while the rest
 * of the day is waits and sums only: every step's length follows from the state, a wait is the
 * later of two clocks (a task for both, an `after`), so each clock is a non-decreasing function of
 * the clocks before. It is used only where that holds: no eclipse-only task the plan keeps in night
 * is left (earlier can mean outside night), no task left acts on a portable anchor (an attach point
 * for both), no socket or item is touched by both crew members in the tasks left (with the socket
 * each stands in and the items each holds: which of the two comes first would depend on the clocks),
 * an effect still due later than a crew member's clock touches nothing the tasks left touch and no
 * large item, and the work takes its planned time. Both days are checked, each on its own clocks.
 */
class Dominance {
  private readonly table = new Map<string, Float64Array[]>();
  private entries = 0;
  private readonly touches: Touches[];
  private readonly large: Set<string>;

  constructor(private readonly s: Search) {
    this.touches = touchesOf(s.plan);
    this.large = new Set(s.plan.manifest.filter((i) => i.kind === 'large-item').map((i) => i.key));
  }

  /** Whether a day kept before dominates this one (then it is dropped); else keeps it. */
  dominated(extra: string, day: PlacedDay, unplaced: readonly number[]): boolean {
    const s = this.s;
    if (!s.bounded) return false;
    const left = [...unplaced];
    for (const m of CREW) left.push(...day.progress(m).notStarted);
    if (left.some((x) => s.mustNight(x) || this.touches[x].anchor)) return false;
    const ends = new Set<number>();
    for (const x of left) for (const j of s.afterOf[x]) ends.add(j);
    const state = day.stateOf([...ends].sort((a, b) => a - b));
    const by = new Map<string, CrewMember>();
    const touch = (key: string, m: CrewMember) => {
      const other = by.get(key);
      by.set(key, m);
      return other === undefined || other === m;
    };
    for (const x of new Set(left))
      for (const key of this.touches[x].keys)
        for (const m of this.touches[x].crew) if (!touch(key, m)) return false;
    for (const m of CREW) for (const key of state.touches[m]) if (!touch(key, m)) return false;
    const earliest = Math.min(state.times[0], state.times[1]);
    if (state.pending.some((p) => p.t > earliest && (by.has(p.touches) || this.large.has(p.touches))))
      return false;
    const key = `${extra}\n${state.key}`;
    const times = Float64Array.from(state.times);
    const kept = this.table.get(key);
    if (kept?.some((k) => k.every((v, i) => v <= times[i] + END_EPS))) return true;
    if (this.entries < DOMINANCE_ENTRIES) {
      this.entries++;
      if (kept) kept.push(times);
      else this.table.set(key, [times]);
    }
    return false;
  }
}

/**
 * Exhaustive search over both crew members' sequences. A node fixes a prefix of the plan order that
 * keeps every `after`; its day is the parent's placed further (`placeDay`): every step it has taken
 * is the same in any completion. A node whose day already has a warning the current order does not
 * is dropped (warnings only add up), and so is one whose `dayBound` is not below the best day found.
 * The crew member the day waits for chooses next, among their tasks whose `after` tasks are placed;
 * a task for both, or one waiting for a task of the partner's still to come, is reserved while the
 * partner places tasks up to it. Every pair of sequences that keeps `after` is a leaf, so when the
 * search ends within the budget the best leaf is the earliest day end.
 */
function branchAndBound(s: Search, incumbent: Scored | null): { best: Scored | null; complete: boolean } {
  const root = s.root;
  if (!root) return { best: incumbent, complete: false };
  const tasks = s.tasks;
  const n = tasks.length;
  const { afterOf, laneTasks } = s;

  let best = incumbent;
  s.target = best ? best.timeline.endSeconds - END_EPS : Infinity;
  let complete = true;
  const dominance = new Dominance(s);
  const chosen = new Uint8Array(n);
  const mark = (node: Node, v: 0 | 1) => node.list.forEach((x) => (chosen[x] = v));
  const eligible = (x: number) => afterOf[x].every((j) => chosen[j]);
  const append = (node: Node, x: number): Node => {
    const lane = { ...node.lane };
    for (const m of membersOf(tasks[x])) lane[m] = [...lane[m], x];
    return { list: [...node.list, x], lane, reserved: { ...node.reserved } };
  };
  const reserve = (node: Node, m: CrewMember, x: number): Node => ({
    ...node,
    reserved: { ...node.reserved, [m]: x },
  });

  /** the children of a node (its tasks marked chosen) */
  const children = (node: Node, day: PlacedDay): Node[] => {
    const holder = CREW.find((m) => node.reserved[m] !== null);
    const out: Node[] = [];
    if (holder) {
      const m = partnerOf(holder);
      const x = node.reserved[holder]!;
      for (const y of laneTasks[m]) {
        if (chosen[y] || !eligible(y)) continue;
        if (tasks[y].crew === 'both') {
          if (y !== x) continue;
          const next = append(node, y);
          next.reserved[holder] = null;
          out.push(next);
          continue;
        }
        const next = append(node, y);
        if (tasks[x].crew !== 'both') {
          chosen[y] = 1;
          const ready = eligible(x);
          chosen[y] = 0;
          if (ready) {
            const done = append(next, x);
            done.reserved[holder] = null;
            out.push(done);
            continue;
          }
        }
        out.push(next);
      }
      return out;
    }
    const m = day.waitsFor();
    if (m === null) return out;
    const other = partnerOf(m);
    for (const x of laneTasks[m]) {
      if (chosen[x]) continue;
      if (tasks[x].crew === 'both') {
        out.push(reserve(node, m, x));
      } else if (eligible(x)) {
        out.push(append(node, x));
      } else if (afterOf[x].every((j) => chosen[j] || tasks[j].crew === other)) {
        // waits for tasks of the partner's still to come: the partner places tasks first
        out.push(reserve(node, m, x));
      }
    }
    return out;
  };

  const evaluate = (node: Node, parent?: { node: Node; day: PlacedDay }) => {
    // a reservation leaves the plan order as it was: the same day
    const from = parent ? parent.day : root;
    const placedBefore = parent ? parent.node.list.length : 0;
    const day = placedBefore === node.list.length ? from : s.extend(from, node.list.slice(placedBefore));
    if (day !== from && spoiled(s, day)) return null;
    mark(node, 1);
    const left = Object.fromEntries(CREW.map((m) => [m, laneTasks[m].filter((x) => !chosen[x])])) as Record<
      CrewMember,
      number[]
    >;
    const lb = dayBound(s, day, left, node.reserved);
    mark(node, 0);
    return { node, day, lb };
  };

  const visit = (node: Node, day: PlacedDay, lb: number): void => {
    if (timeUp(s)) {
      complete = false;
      return;
    }
    if (best && Math.max(lb, s.floor) >= best.timeline.endSeconds - END_EPS) return;
    if (node.list.length < n) {
      const unplaced = tasks.flatMap((_, x) => (node.list.includes(x) ? [] : [x]));
      const reserved = CREW.map((m) => node.reserved[m] ?? '').join(',');
      if (dominance.dominated(reserved, day, unplaced)) {
        s.dominated++;
        return;
      }
    }
    if (node.list.length === n) {
      const timeline = day.finish();
      const scored = { order: node.list, timeline, added: addedWarnings(s.base, timeline, node.list) };
      if (scored.added === 0 && (best === null || timeline.endSeconds < best.timeline.endSeconds - END_EPS)) {
        best = scored;
        s.target = timeline.endSeconds - END_EPS;
      }
      return;
    }
    mark(node, 1);
    const kids = children(node, day);
    mark(node, 0);
    const scored = kids
      .map((k) => evaluate(k, { node, day }))
      .filter((k) => k !== null)
      .sort((a, b) => a.lb - b.lb);
    for (const k of scored) {
      visit(k.node, k.day, k.lb);
      if (!complete) return;
    }
  };

  const r = evaluate({ list: [], lane: { EV1: [], EV2: [] }, reserved: { EV1: null, EV2: null } })!;
  visit(r.node, r.day, r.lb);
  return { best, complete };
}

// ── independent crew members: one sequence at a time ───────────────────────────────────────────────

const nameKey = (name: string) => name.trim().replace(/\s+/g, ' ').toLowerCase();

/** What a task touches: `socket:` and each member's socket, the items its tools name and its actions move, and where it sets a foot restraint. */
interface Touches {
  /** the task's members and whoever its actions name */
  crew: CrewMember[];
  keys: string[];
  /** it acts on a portable anchor (an attach point for both crew members' routes) */
  anchor: boolean;
}

function touchesOf(plan: DayPlan): Touches[] {
  const itemOf = new Map<string, string>();
  for (const item of plan.manifest) {
    itemOf.set(item.key, item.key);
    itemOf.set(nameKey(item.name), item.key);
  }
  const kindOf = new Map(plan.manifest.map((item) => [item.key, item.kind]));
  return plan.tasks.map((t) => {
    const crew = new Set(membersOf(t));
    const keys = new Set<string>();
    for (const m of membersOf(t)) {
      const socket = socketFor(t, m);
      if (socket !== undefined) keys.add(`socket:${socket}`);
    }
    for (const tool of t.tools) keys.add(itemOf.get(tool) ?? itemOf.get(nameKey(tool)) ?? `tool:${tool}`);
    let anchor = false;
    for (const a of t.actions) {
      const by = a.by ?? (t.crew === 'both' ? 'EV1' : t.crew);
      crew.add(by);
      keys.add(a.item);
      const kind = kindOf.get(a.item);
      if (kind === 'tether-anchor') anchor = true;
      const at = a.at ?? (kind === 'foot-restraint' ? socketFor(t, by) : undefined);
      if (at !== undefined) keys.add(`socket:${at}`);
    }
    return { crew: [...crew], keys: [...keys], anchor };
  });
}

/**
 * Whether the two crew members' days cannot touch each other whatever the order: no task for both,
 * no `after` across crew members, no arm, no socket both use, no item both handle (acts on, uses as
 * a tool or carries out) and no portable anchor acted on (its attach point serves both).
 */
export function independentLanes(plan: DayPlan): boolean {
  const tasks = plan.tasks;
  if (tasks.some((t) => t.crew === 'both' || t.arm)) return false;
  const afterOf = afterIndexes(tasks);
  if (tasks.some((t, i) => afterOf[i].some((j) => tasks[j].crew !== t.crew))) return false;
  const users = new Map<string, Set<string>>();
  const use = (key: string, who: string) => users.set(key, (users.get(key) ?? new Set()).add(who));
  for (const item of plan.manifest) if (item.carriedBy) use(item.key, item.carriedBy);
  for (const touch of touchesOf(plan)) {
    if (touch.anchor) return false;
    for (const key of touch.keys) for (const m of touch.crew) use(key, m);
  }
  return [...users.values()].every((who) => who.size <= 1);
}

/**
 * When the crew members' days are independent, the day end is the later of their own ends plus
 * ingress, and each own end depends on that crew member's sequence alone: each sequence is searched
 * on its own (the partner's kept as it is and placed first), for the earliest own end, with
 * `laneBound`, and without adding a warning. An order that keeps the current one's own end is kept.
 */
function laneByLane(s: Search, incumbent: Scored | null): { best: Scored | null; complete: boolean } {
  const root = s.root;
  if (!root) return { best: incumbent, complete: false };
  const tasks = s.tasks;
  const { afterOf } = s;
  let order = incumbent?.order ?? topological(tasks);
  let best = incumbent;
  for (const m of CREW) {
    const mine = s.laneTasks[m];
    const others = order.filter((i) => tasks[i].crew !== m);
    // the partner's tasks keep their order among themselves, placed first: the day then waits for m
    const full = (seq: readonly number[]) => [...others, ...seq];
    const start = s.extend(root, others);
    let laneBest: { seq: number[]; end: number; scored: Scored } | null = null;
    const leaf = (seq: readonly number[], day: PlacedDay) => {
      const timeline = day.finish();
      const list = full(seq);
      const added = addedWarnings(s.base, timeline, list);
      const end = ownEnd(timeline, m);
      if (added === 0 && (laneBest === null || end < laneBest.end - END_EPS))
        laneBest = { seq: [...seq], end, scored: { order: list, timeline, added } };
    };
    if (best) {
      const seq = best.order.filter((i) => tasks[i].crew === m);
      if (keepsAfter(tasks, full(seq))) leaf(seq, s.extend(start, seq));
    }
    const chosen = new Uint8Array(tasks.length);
    let complete = true;
    const startAt = (x: number, earliest: number) =>
      s.mustNight(x) && s.bounded ? start.nightStart(earliest, tasks[x].durationSeconds) : earliest;
    const visit = (seq: number[], day: PlacedDay) => {
      if (timeUp(s)) {
        complete = false;
        return;
      }
      if (seq.length === mine.length) return leaf(seq, day);
      const left = mine.filter((x) => !chosen[x]);
      if (laneBest && s.bounded && laneBound(s, m, day.progress(m), left, startAt) >= laneBest.end - END_EPS)
        return;
      for (const x of left) {
        if (!afterOf[x].every((j) => chosen[j])) continue;
        const next = s.extend(day, [x]);
        if (spoiled(s, next)) continue;
        chosen[x] = 1;
        seq.push(x);
        visit(seq, next);
        seq.pop();
        chosen[x] = 0;
        if (!complete) return;
      }
    };
    if (!spoiled(s, start)) visit([], start);
    if (!complete) return { best, complete: false };
    if (laneBest === null) return { best, complete: true };
    const found = laneBest as { seq: number[]; end: number; scored: Scored };
    order = full(found.seq);
    best = found.scored;
  }
  return { best, complete: true };
}

// ── local search ───────────────────────────────────────────────────────────────────────────────────

/** The order as what the day depends on: each crew member's sequence. */
const laneKey = (tasks: readonly DayTask[], order: readonly number[]) =>
  CREW.map((m) => order.filter((i) => membersOf(tasks[i]).includes(m)).join(',')).join('|');

const better = (a: Scored, b: Scored | null) =>
  b === null ||
  a.added < b.added ||
  (a.added === b.added && a.timeline.endSeconds < b.timeline.endSeconds - END_EPS);

/**
 * Scores orders for the local search. Each day is placed from the day of the longest prefix it shares
 * with the reference order (the climb's current one), whose prefixes' days are kept; when only an
 * order that adds no warning and ends before `cutoff` can matter, placing stops at the first added
 * warning or once `dayBound` reaches the cutoff (null). Plans with arm tasks are computed whole.
 */
class Scorer {
  private reference: readonly number[] = [];
  private prefixes: PlacedDay[];

  constructor(private readonly s: Search) {
    this.prefixes = s.root ? [s.root] : [];
  }

  setReference(order: readonly number[]) {
    if (order === this.reference) return;
    this.reference = order;
    this.prefixes = this.s.root ? [this.s.root] : [];
  }

  score(order: number[], cutoff: number | null): Scored | null {
    const s = this.s;
    if (!s.root) {
      const timeline = s.timelineOf(order);
      return { order, timeline, added: addedWarnings(s.base, timeline, order) };
    }
    let k = 0;
    while (k < order.length && order[k] === this.reference[k]) k++;
    while (this.prefixes.length <= k) {
      const at = this.prefixes.length - 1;
      this.prefixes.push(s.extend(this.prefixes[at], [this.reference[at]]));
    }
    let day = this.prefixes[k].copy();
    const left = Object.fromEntries(CREW.map((m) => [m, [] as number[]])) as Record<CrewMember, number[]>;
    for (let j = k; j < order.length; j++)
      for (const m of membersOf(s.tasks[order[j]])) left[m].push(order[j]);
    for (let j = k; j < order.length; j++) {
      const x = order[j];
      day = s.extend(day, [x]);
      for (const m of membersOf(s.tasks[x])) left[m].splice(left[m].indexOf(x), 1);
      if (cutoff === null) continue;
      if (spoiled(s, day)) return null;
      // the bound costs about as much as placing a task: asked every few tasks and on the last
      if ((order.length - 1 - j) % BOUND_EVERY === 0 && dayBound(s, day, left) >= cutoff - END_EPS)
        return null;
    }
    const timeline = day.finish();
    return { order, timeline, added: addedWarnings(s.base, timeline, order) };
  }
}

/** A seeded random integer below k (xorshift32): the same seed gives the same search. */
function randomFrom(seed: number): (k: number) => number {
  let r = seed >>> 0 || 1;
  return (k) => {
    r ^= r << 13;
    r ^= r >>> 17;
    r ^= r << 5;
    return (r >>> 0) % k;
  };
}

/** Each crew member's sequence in an order (plan indices) and the places of the order it holds. */
function lanesOf(tasks: readonly DayTask[], order: readonly number[]) {
  const seq = { EV1: [] as number[], EV2: [] as number[] };
  const slots = { EV1: [] as number[], EV2: [] as number[] };
  order.forEach((x, k) => {
    for (const m of membersOf(tasks[x])) {
      seq[m].push(x);
      slots[m].push(k);
    }
  });
  return { seq, slots };
}

/**
 * The order with crew member m's tasks in the places their tasks held, in the sequence `seq`: the
 * partner's tasks for them alone keep their places, so the day is the same up to the first place
 * that changed (a task for both moves in the partner's sequence too, to the place it lands in).
 */
function withLane(order: readonly number[], slots: readonly number[], seq: readonly number[]): number[] {
  const next = [...order];
  slots.forEach((k, j) => (next[k] = seq[j]));
  return next;
}

/**
 * The local search's moves: a run of one to three of a crew member's tasks moved in their sequence
 * (`or-opt`), a run reversed (`2-opt`), two of their tasks swapped (`swap`), a task for both moved
 * in the plan order (`joint`).
 */
export const MOVE_KINDS = ['or-opt', '2-opt', 'swap', 'joint'] as const;
export type MoveKind = (typeof MOVE_KINDS)[number];

/** A move from an order: `estimate`, its change of the least legs (see `movesAround`); `order`, the order it gives. */
interface Move {
  kind: MoveKind;
  estimate: number;
  order: () => number[];
}

/** Runs of this many tasks at most are moved whole (or-opt). */
const MOST_MOVED = 3;

/** The least legs of a crew member's sequence: `between` from the airlock through it and home. */
function legsOf(s: Search, m: CrewMember, seq: readonly number[]): number {
  let sum = 0;
  let prev: number | null = null;
  for (const x of seq) {
    sum += s.between(m, prev, x);
    prev = x;
  }
  return sum + s.between(m, prev, null);
}

/**
 * The moves around an order. Each crew member's: a run of one to MOST_MOVED of their tasks moved
 * elsewhere in their sequence, as it was or reversed (or-opt), a run reversed in place (2-opt), two
 * tasks swapped; the order keeps the partner's tasks in their places (`withLane`). And a task for
 * both moved elsewhere in the plan order: its place in each crew member's sequence, so where the two
 * meet, changes together. Ranked, the likeliest first, by the change of the least legs of the
 * sequences it changes, plus, for a crew member's own moves, how far their own end is before the
 * day's latest (a crew member who ends earlier helps only by a shorter wait). Moves that give the
 * same sequences are listed once. Listing stops once `out` says the time is up (on 200 tasks a full
 * list takes most of a second).
 */
function movesAround(
  s: Search,
  order: readonly number[],
  ownEnds: Record<CrewMember, number>,
  kinds: readonly MoveKind[] = MOVE_KINDS,
  out: () => boolean = () => false,
): Move[] {
  const tasks = s.tasks;
  const { seq, slots } = lanesOf(tasks, order);
  const latest = Math.max(ownEnds.EV1, ownEnds.EV2);
  const moves: Move[] = [];
  const listed = new Set<string>();
  for (const m of CREW) {
    const lane = seq[m];
    const len = lane.length;
    const base = legsOf(s, m, lane) - (latest - ownEnds[m]);
    const add = (kind: MoveKind, next: number[]) => {
      const key = `${m}:${next.join(',')}`;
      if (!kinds.includes(kind) || listed.has(key)) return;
      listed.add(key);
      moves.push({ kind, estimate: legsOf(s, m, next) - base, order: () => withLane(order, slots[m], next) });
    };
    for (let k = 1; k <= Math.min(MOST_MOVED, len - 1); k++) {
      for (let a = 0; a + k <= len && !out(); a++) {
        const run = lane.slice(a, a + k);
        const rest = [...lane.slice(0, a), ...lane.slice(a + k)];
        for (let t = 0; t <= rest.length; t++) {
          if (t === a) continue;
          add('or-opt', [...rest.slice(0, t), ...run, ...rest.slice(t)]);
          if (k > 1) add('or-opt', [...rest.slice(0, t), ...[...run].reverse(), ...rest.slice(t)]);
        }
      }
    }
    for (let a = 0; a < len && !out(); a++)
      for (let b = a + 1; b < len; b++) {
        if (b > a + 1)
          add('2-opt', [...lane.slice(0, a), ...lane.slice(a, b + 1).reverse(), ...lane.slice(b + 1)]);
        const swapped = [...lane];
        [swapped[a], swapped[b]] = [swapped[b], swapped[a]];
        add('swap', swapped);
      }
  }
  const legs = CREW.map((m) => legsOf(s, m, seq[m]));
  order.forEach((x, i) => {
    if (tasks[x].crew !== 'both' || !kinds.includes('joint') || out()) return;
    const rest = order.filter((_, k) => k !== i);
    for (let j = 0; j <= rest.length; j++) {
      if (j === i) continue;
      const next = [...rest.slice(0, j), x, ...rest.slice(j)];
      const lanes = lanesOf(tasks, next).seq;
      const key = `both:${lanes.EV1.join(',')}|${lanes.EV2.join(',')}`;
      if (listed.has(key)) continue;
      listed.add(key);
      const estimate = CREW.reduce((sum, m, k) => sum + legsOf(s, m, lanes[m]) - legs[k], 0);
      moves.push({ kind: 'joint', estimate, order: () => next });
    }
  });
  return moves.sort((a, b) => a.estimate - b.estimate);
}

/** The orders the local search's moves of one kind give around `order` (plan indices), ranked as it tries them. */
export function neighbourOrders(
  plan: DayPlan,
  station: DayStation,
  route: DayRouteFn,
  order: readonly number[],
  kind: MoveKind,
  options: SequenceOptions = {},
): number[][] {
  const timelineOf = (o: readonly number[]) =>
    computeTimeline({ ...plan, tasks: o.map((i) => plan.tasks[i]) }, station, route, options.start);
  const identity = plan.tasks.map((_, i) => i);
  const current = timelineOf(identity);
  const base = warningCounts(current, identity);
  const s = searchFor(plan, cleanDay(plan, current), base, station, route, options, timelineOf, () => {});
  const day = timelineOf(order);
  const ends = { EV1: ownEnd(day, 'EV1'), EV2: ownEnd(day, 'EV2') };
  return movesAround(s, order, ends, [kind]).map((move) => move.order());
}

/** A few random moves: a run of a crew member's sequence moved, or the sequence cut in four and the middle two parts exchanged. */
function kicked(s: Search, order: readonly number[], random: (k: number) => number): number[] {
  let next = [...order];
  for (let tries = 0, done = 0; tries < 20 && done < 2; tries++) {
    const m = CREW[random(2)];
    const { seq, slots } = lanesOf(s.tasks, next);
    const lane = seq[m];
    const len = lane.length;
    if (len < 3) continue;
    let moved: number[];
    if (len >= 8 && random(2) === 0) {
      // three cuts: a b c d becomes a c b d
      const cuts = [random(len - 1) + 1, random(len - 1) + 1, random(len - 1) + 1].sort((x, y) => x - y);
      if (cuts[0] === cuts[1] || cuts[1] === cuts[2]) continue;
      moved = [
        ...lane.slice(0, cuts[0]),
        ...lane.slice(cuts[1], cuts[2]),
        ...lane.slice(cuts[0], cuts[1]),
        ...lane.slice(cuts[2]),
      ];
    } else {
      const k = 1 + random(Math.min(MOST_MOVED, len - 1));
      const a = random(len - k + 1);
      const run = lane.slice(a, a + k);
      const rest = [...lane.slice(0, a), ...lane.slice(a + k)];
      const t = random(rest.length + 1);
      moved = [...rest.slice(0, t), ...run, ...rest.slice(t)];
    }
    const candidate = withLane(next, slots[m], moved);
    if (!keepsAfterOf(s.afterOf, candidate)) continue;
    next = candidate;
    done++;
  }
  return next;
}

/** `keepsAfter` on the search's own `after` lists. */
function keepsAfterOf(afterOf: readonly number[][], order: readonly number[]): boolean {
  const pos = new Int32Array(afterOf.length).fill(-1);
  order.forEach((x, k) => (pos[x] = k));
  return order.every((x, k) => afterOf[x].every((j) => pos[j] !== -1 && pos[j] < k));
}

/**
 * Iterated local search, from the best order so far. A climb takes the first move that improves the
 * day (fewer added warnings first, then the end) among the likeliest CANDIDATES_PER_TASK per task of
 * `movesAround`, until none does. Orders with the same two crew sequences are computed once (an order cut
 * off against the climb's order is not placed again in that climb: its order to beat only gets
 * earlier). Then the best order gets a few random moves (`kicked`, from a seeded generator, so the
 * same plan and seed visit the same orders) and is climbed again, until the budget,
 * MAX_LOCAL_EVALUATIONS, the floor, or STALE_CLIMBS climbs in a row that met only orders already
 * seen.
 */
function localSearch(
  s: Search,
  scorer: Scorer,
  start: Scored | null,
  deadline: number,
  now: () => number,
  options: Pick<SequenceOptions, 'seed' | 'evaluations' | 'moves'>,
): Scored | null {
  const tasks = s.tasks;
  const most = options.evaluations ?? MAX_LOCAL_EVALUATIONS;
  // the end and added warnings of each order scored whole
  const seen = new Map<string, { end: number; added: number }>();
  let cut = new Set<string>();
  let evaluations = 0;
  let from: Scored | null = null;
  // an order that adds no warning and ends at the floor cannot be beaten
  const atFloor = () => from !== null && from.added === 0 && from.timeline.endSeconds <= s.floor + END_EPS;
  const out = () => now() > deadline || evaluations >= most || atFloor();
  const beats = (a: { end: number; added: number }, b: Scored | null) =>
    b === null || a.added < b.added || (a.added === b.added && a.end < b.timeline.endSeconds - END_EPS);
  /** the order's day, or null when it breaks `after`, or cannot be better than `from` */
  const scoreOf = (order: number[]): Scored | null => {
    if (!keepsAfterOf(s.afterOf, order)) return null;
    const key = laneKey(tasks, order);
    const known = seen.get(key);
    // a known day is placed again only to become the climb's
    if (known && !beats(known, from)) return null;
    if (!known && cut.has(key)) return null;
    evaluations++;
    // once the climb adds no warning, an order matters only if it adds none and ends earlier
    const cutoff = !known && from && from.added === 0 ? from.timeline.endSeconds : null;
    const scored = scorer.score(order, cutoff);
    if (scored) seen.set(key, { end: scored.timeline.endSeconds, added: scored.added });
    else cut.add(key);
    return scored;
  };
  from = start ?? scoreOf(topological(tasks));
  if (!from) return null;
  let best = from;
  const random = randomFrom(options.seed ?? 1);
  if (tasks.length < 2) return best;
  let before = evaluations;
  let stale = 0;
  while (!out()) {
    let improved = true;
    while (improved && !out()) {
      improved = false;
      const climb: Scored = from;
      scorer.setReference(climb.order);
      const ends = { EV1: ownEnd(climb.timeline, 'EV1'), EV2: ownEnd(climb.timeline, 'EV2') };
      for (const move of movesAround(s, climb.order, ends, options.moves, out).slice(
        0,
        CANDIDATES_PER_TASK * tasks.length,
      )) {
        if (out()) break;
        const scored = scoreOf(move.order());
        if (scored && better(scored, from)) {
          from = scored;
          improved = true;
          break;
        }
      }
    }
    if (better(from, best)) best = from;
    // a whole climb that met no order not seen before: every move around here is known
    if (evaluations === before) stale++;
    else stale = 0;
    if (stale >= STALE_CLIMBS) break;
    before = evaluations;
    cut = new Set();
    from = null;
    from = scoreOf(kicked(s, best.order, random)) ?? best;
  }
  return best;
}

/**
 * An order built on the day itself: the crew member the placed day waits for takes next, among their
 * tasks whose `after` tasks are placed, the one whose work starts earliest when placed (its real way
 * in, waits and night windows counted), skipping any that adds a warning the current order lacks; the
 * partner's tasks when none of theirs fits. Candidates are tried by their least way in (`between`),
 * and the trying stops once that cannot start earlier than the best found. Null for plans with arm tasks;
 * when every ready task adds a warning the first in plan order is taken (the order then adds one).
 * Null, too, once `out` says the time is up.
 */
function builtOrder(s: Search, out: () => boolean): number[] | null {
  const root = s.root;
  if (!root) return null;
  const n = s.tasks.length;
  const placed = new Uint8Array(n);
  const order: number[] = [];
  const ready = (x: number) => !placed[x] && s.afterOf[x].every((j) => placed[j]);
  let day = root;
  while (order.length < n) {
    if (out()) return null;
    const first = day.waitsFor() ?? CREW.find((m) => s.laneTasks[m].some((x) => !placed[x])) ?? 'EV1';
    let found: { x: number; day: PlacedDay; start: number } | null = null;
    for (const m of [first, partnerOf(first)]) {
      const p = day.progress(m);
      const last = p.notStarted.length ? p.notStarted[p.notStarted.length - 1] : p.lastStarted;
      const tries = s.laneTasks[m]
        .filter(ready)
        .map((x) => ({ x, least: p.t + s.between(m, last, x) }))
        .sort((a, b) => a.least - b.least);
      for (const { x, least } of tries) {
        if (found && least >= found.start) break;
        const next = s.extend(day, [x]);
        if (spoiled(s, next)) continue;
        const end = next.workEndOf(x);
        const start = end === undefined ? next.progress(m).t : end - s.tasks[x].durationSeconds;
        if (!found || start < found.start) found = { x, day: next, start };
      }
      if (found) break;
    }
    const x = found ? found.x : placedNext(s, placed);
    if (x === null) break;
    day = found ? found.day : s.extend(day, [x]);
    placed[x] = 1;
    order.push(x);
  }
  return [...order, ...s.tasks.flatMap((_, i) => (placed[i] ? [] : [i]))];
}

/** The first task in plan order whose `after` tasks are placed (null: none). */
function placedNext(s: Search, placed: Uint8Array): number | null {
  for (let x = 0; x < s.tasks.length; x++) if (!placed[x] && s.afterOf[x].every((j) => placed[j])) return x;
  return null;
}

/**
 * An order built greedily: the crew member whose estimated clock is earliest takes next, among their
 * tasks whose `after` tasks are placed, the one nearest by `between` (a task for both moves both
 * clocks to the later one). Any task left waiting goes last, in plan order (`keepsAfter` decides).
 */
function greedyOrder(s: Search): number[] {
  const n = s.tasks.length;
  const placed = new Uint8Array(n);
  const order: number[] = [];
  const clock: Record<CrewMember, number> = { EV1: 0, EV2: 0 };
  const last: Record<CrewMember, number | null> = { EV1: null, EV2: null };
  const ready = (x: number) => !placed[x] && s.afterOf[x].every((j) => placed[j]);
  while (order.length < n) {
    let pick: number | null = null;
    for (const m of [...CREW].sort((a, b) => clock[a] - clock[b])) {
      let nearest = Infinity;
      for (const x of s.laneTasks[m]) {
        if (!ready(x)) continue;
        const d = s.between(m, last[m], x);
        if (d < nearest) [nearest, pick] = [d, x];
      }
      if (pick !== null) break;
    }
    if (pick === null) break;
    const members = membersOf(s.tasks[pick]);
    const start = Math.max(...members.map((m) => clock[m] + s.between(m, last[m], pick)));
    for (const m of members) {
      clock[m] = start + s.tasks[pick].durationSeconds;
      last[m] = pick;
    }
    placed[pick] = 1;
    order.push(pick);
  }
  return [...order, ...s.tasks.flatMap((_, i) => (placed[i] ? [] : [i]))];
}

/** The plan order with every task moved after the tasks it waits for (stable otherwise). */
function topological(tasks: readonly DayTask[]): number[] {
  const afterOf = afterIndexes(tasks);
  const done = new Set<number>();
  const out: number[] = [];
  const place = (i: number, path: Set<number>) => {
    if (done.has(i) || path.has(i)) return;
    path.add(i);
    for (const j of afterOf[i]) place(j, path);
    path.delete(i);
    done.add(i);
    out.push(i);
  };
  tasks.forEach((_, i) => place(i, new Set()));
  return out;
}
