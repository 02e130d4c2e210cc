import type { CrewMember } from '../../schemas/plan';
import type { RouteResult } from '../../schemas/route';
import { computeTimeline, CREW, membersOf, partnerOf, socketFor } from './timeline';
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
/** Seconds: a day end counts as earlier only by more than this (the same legs summed in another order). */
const END_EPS = 1e-6;

export interface SequenceOptions {
  /** wall-clock budget in milliseconds (default 2 s) */
  budgetMs?: number;
  now?: () => number;
  /**
   * A lower bound on a route's seconds between two nodes (`travelLowerBound`); without one the bound
   * counts only work and restraint time, which is still exact, only slower to prove.
   */
  travelSeconds?: (from: string, to: string) => number;
  /** most tasks of one crew member for the exhaustive search (default 8) */
  exactUpTo?: number;
  /** seed of the local search's perturbations */
  seed?: number;
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
const warningKey = (w: TimelineWarning, order: readonly number[]) =>
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
  const blocks = timeline.crew[m].blocks;
  for (let k = blocks.length - 1; k >= 0; k--) {
    if (blocks[k].type !== 'wait' && blocks[k].type !== 'ingress') return blocks[k].end;
  }
  return 0;
}

/**
 * The order of a plan's tasks whose day ends earliest, among the orders that keep every `after` (a
 * task comes after the tasks it waits for) and give the day no warning the current order does not
 * have: so both-crew sync, eclipse-only work in night windows, restraints and the equipment rules
 * (an item picked up before it is used) hold wherever the current order keeps them, and the
 * proposal never ends later than the current order. Every candidate is scored by `computeTimeline`
 * itself; each distinct route request is asked once.
 *
 * Up to `exactUpTo` tasks per crew member a short local search finds a good order, then a branch and
 * bound over the crew members' sequences runs, and is exact when it finishes within its share of the
 * budget (see `branchAndBound`); beyond, or
 * when that share runs out first, an iterated local search from the best order so far takes the
 * rest of the budget, and `exact` is false.
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
  const score = (order: number[], timeline = timelineOf(order)): Scored => ({
    order,
    timeline,
    added: addedWarnings(base, timeline, order),
  });
  let best: Scored | null = keepsAfter(plan.tasks, identity)
    ? { order: identity, timeline: current, added: 0 }
    : null;

  const perCrew = Math.max(...CREW.map((m) => plan.tasks.filter((t) => membersOf(t).includes(m)).length));
  let exact = n <= 1 && best !== null;
  if (!exact && perCrew <= (options.exactUpTo ?? EXACT_TASKS_PER_CREW)) {
    // a good order first, so the bound cuts more of the tree from the start
    const warm = localSearch(plan.tasks, best, score, started + budget * WARM_SHARE, now, options.seed ?? 1);
    if (warm && warm.added === 0) best = warm;
    const search: Search = {
      plan,
      timelineOf,
      score,
      deadline: started + budget * EXACT_SHARE,
      now,
      between: betweenFor(plan, current, station, options.travelSeconds),
    };
    const found = independentLanes(plan) ? laneByLane(search, best) : branchAndBound(search, best);
    best = found.best;
    exact = found.complete;
  }
  if (!exact) {
    best = localSearch(plan.tasks, best, score, started + budget, now, options.seed ?? 1);
  }
  const chosen = best && best.added === 0 ? best : { order: identity, timeline: current, added: 0 };
  return {
    order: chosen.order,
    endSeconds: chosen.timeline.endSeconds,
    currentEndSeconds: current.endSeconds,
    exact,
    explored,
    proposal: chosen.timeline,
    current,
  };
}

// ── the bound ──────────────────────────────────────────────────────────────────────────────────────

interface Search {
  plan: DayPlan;
  timelineOf: (order: readonly number[]) => Timeline;
  score: (order: number[], timeline?: Timeline) => Scored;
  deadline: number;
  now: () => number;
  /** least seconds from the end of task a's work to the start of task b's work for m (null: the airlock) */
  between: (m: CrewMember, a: number | null, b: number | null) => number;
}

const UNREACHED_CODES = new Set([
  'route-infeasible',
  'unknown-worksite',
  'unknown-socket',
  'socket-unusable',
  'restraint-missing',
  'restraint-occupied',
]);

/**
 * The least time a crew member can spend between two tasks: nothing when they stay in the same
 * restraint, else getting out of one restraint, the least translation time between the worksites
 * and getting into the next restraint. Translation and restraint time count only when the current
 * order reaches every worksite and restraint and no task is done from an arm (an order that fails a
 * route spends no time on it, and an arm session travels differently); the proposal may not add such
 * a warning, so in a clean day no allowed order skips them.
 */
function betweenFor(
  plan: DayPlan,
  current: Timeline,
  station: DayStation,
  travelSeconds?: (from: string, to: string) => number,
): Search['between'] {
  const tasks = plan.tasks;
  const clean = !current.warnings.some((w) => UNREACHED_CODES.has(w.code)) && !tasks.some((t) => t.arm);
  const restraintS = clean ? station.settings.restraintSeconds : 0;
  const travel = (a: string, b: string) => (!clean || a === b || !travelSeconds ? 0 : travelSeconds(a, b));
  return (m, a, b) => {
    const sa = a === null ? undefined : socketFor(tasks[a], m);
    const sb = b === null ? undefined : socketFor(tasks[b], m);
    if (sa !== undefined && sa === sb) return 0;
    const from = a === null ? station.airlockKey : tasks[a].worksite;
    const to = b === null ? station.airlockKey : tasks[b].worksite;
    return (sa !== undefined ? restraintS : 0) + (sb !== undefined ? restraintS : 0) + travel(from, to);
  };
}

/**
 * A lower bound on crew member `m`'s own end (back at the airlock) over every completion of a partial
 * order, from the day computed on the partial order. `H` is a time before which that day's blocks are
 * the same in every completion (see `branchAndBound`). From the end of the crew member's last block
 * that ends by `H`, and not after the work of their last task placed (`t0`), what is left is at least: the work of each of their tasks whose work had
 * not ended by then, the least time into each (from the task before it when that is fixed, else from
 * any task that could come before it; the way into the first one may be under way and counts zero),
 * and the least way home from a task that could be last. Waits and swaps count zero. The way into a
 * task still to place is never under way by `H`: a crew member with tasks to place ends the work of
 * their last placed task at `H` or later.
 */
function laneBound(
  s: Search,
  m: CrewMember,
  sequence: readonly number[],
  left: readonly number[],
  order: readonly number[],
  timeline: Timeline,
  H: number,
): number {
  const tasks = s.plan.tasks;
  let t0 = 0;
  const done = new Set<number>();
  const lastAt = sequence.length ? order.indexOf(sequence[sequence.length - 1]) : -1;
  for (const b of timeline.crew[m].blocks) {
    if (b.end > H) break;
    t0 = b.end;
    if (b.type === 'work' && b.taskIndex !== undefined) done.add(order[b.taskIndex]);
    // what follows (the way home on the partial order) is counted below
    if (lastAt === -1 ? b.type === 'egress' : b.type === 'work' && b.taskIndex === lastAt) break;
  }
  let rest = 0;
  let prev: number | null = null;
  let first = true;
  for (const x of sequence) {
    if (!done.has(x)) {
      rest += tasks[x].durationSeconds + (first ? 0 : s.between(m, prev, x));
      first = false;
    }
    prev = x;
  }
  for (const x of left) {
    let into = s.between(m, prev, x);
    for (const y of left) if (y !== x) into = Math.min(into, s.between(m, y, x));
    rest += tasks[x].durationSeconds + into;
  }
  const home = left.length ? Math.min(...left.map((x) => s.between(m, x, null))) : s.between(m, prev, null);
  return t0 + rest + home;
}

/** End of `m`'s work on task `x` in a day computed on `order`; `fallback` when not there. */
function workEnd(timeline: Timeline, m: CrewMember, order: readonly number[], x: number, fallback: number) {
  const at = order.indexOf(x);
  const block = timeline.crew[m].blocks.find((b) => b.type === 'work' && b.taskIndex === at);
  return block ? block.end : fallback;
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

/**
 * Exhaustive search over both crew members' sequences. A node fixes a prefix of the plan order that
 * keeps every `after`; its day is computed by `computeTimeline` on that prefix. The day is simulated
 * in time order and a task's effects (items, anchors, the partner's wait) start no earlier than its
 * crew member's end of work on the task before it, so for `H`, the earliest end of work on the last
 * task so far among crew members with tasks still to place, every block that ends by `H` is the same
 * on the prefix and on any completion of it. The bound of a node is the later of the two crew
 * members' `laneBound`s plus ingress; a node whose bound is not below the best day found is dropped.
 * The crew member whose last task ends first chooses next (so `H` grows), among their tasks whose
 * `after` tasks are placed; a task for both, or one waiting for a task of the partner's still to come,
 * is reserved while the partner places tasks up to it. Every pair of sequences that keeps `after` and
 * can be laid out without the two waiting for each other is a leaf, so when the search ends within
 * the budget the best leaf is the earliest day end.
 */
function branchAndBound(s: Search, incumbent: Scored | null): { best: Scored | null; complete: boolean } {
  const tasks = s.plan.tasks;
  const n = tasks.length;
  const afterOf = afterIndexes(tasks);
  const laneTasks = Object.fromEntries(
    CREW.map((m) => [m, tasks.flatMap((t, i) => (membersOf(t).includes(m) ? [i] : []))]),
  ) as Record<CrewMember, number[]>;
  const ingress = s.plan.ingressSeconds;
  const egress = s.plan.egressSeconds;

  let best = incumbent;
  let complete = true;
  const chosen = new Uint8Array(n);
  const mark = (node: Node, v: 0 | 1) => node.list.forEach((x) => (chosen[x] = v));
  const hasLeft = (m: CrewMember) => laneTasks[m].some((x) => !chosen[x]);
  const lastEnd = (node: Node, timeline: Timeline, m: CrewMember) => {
    const last = node.lane[m][node.lane[m].length - 1];
    return last === undefined ? egress : workEnd(timeline, m, node.list, last, egress);
  };

  /** call with the node's tasks marked chosen */
  const lowerBound = (node: Node, timeline: Timeline): number => {
    const open = CREW.filter(hasLeft);
    const H = open.length ? Math.min(...open.map((m) => lastEnd(node, timeline, m))) : Infinity;
    let bound = 0;
    for (const m of CREW) {
      const left = laneTasks[m].filter((x) => !chosen[x]);
      bound = Math.max(bound, laneBound(s, m, node.lane[m], left, node.list, timeline, H));
    }
    return bound + ingress;
  };

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
  const children = (node: Node, timeline: Timeline): Node[] => {
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
    const open = CREW.filter(hasLeft).sort((a, b) => lastEnd(node, timeline, a) - lastEnd(node, timeline, b));
    const m = open[0];
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

  const evaluate = (node: Node, parent?: { node: Node; timeline: Timeline }) => {
    // a reservation leaves the plan order as it was: the same day
    const timeline =
      parent && parent.node.list.length === node.list.length ? parent.timeline : s.timelineOf(node.list);
    mark(node, 1);
    const lb = lowerBound(node, timeline);
    mark(node, 0);
    return { node, timeline, lb };
  };

  const visit = (node: Node, timeline: Timeline, lb: number): void => {
    if (s.now() > s.deadline) {
      complete = false;
      return;
    }
    if (best && lb >= best.timeline.endSeconds - END_EPS) return;
    if (node.list.length === n) {
      const scored = s.score(node.list, timeline);
      if (
        scored.added === 0 &&
        (best === null || scored.timeline.endSeconds < best.timeline.endSeconds - END_EPS)
      )
        best = scored;
      return;
    }
    mark(node, 1);
    const kids = children(node, timeline);
    mark(node, 0);
    const scored = kids.map((k) => evaluate(k, { node, timeline })).sort((a, b) => a.lb - b.lb);
    for (const k of scored) {
      visit(k.node, k.timeline, k.lb);
      if (!complete) return;
    }
  };

  const root: Node = { list: [], lane: { EV1: [], EV2: [] }, reserved: { EV1: null, EV2: null } };
  const r = evaluate(root);
  visit(root, r.timeline, r.lb);
  return { best, complete };
}

// ── independent crew members: one sequence at a time ───────────────────────────────────────────────

const nameKey = (name: string) => name.trim().replace(/\s+/g, ' ').toLowerCase();

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
  const itemOf = new Map<string, string>();
  for (const item of plan.manifest) {
    itemOf.set(item.key, item.key);
    itemOf.set(nameKey(item.name), item.key);
  }
  const kindOf = new Map(plan.manifest.map((item) => [item.key, item.kind]));
  const users = new Map<string, Set<string>>();
  const use = (key: string, who: string) => users.set(key, (users.get(key) ?? new Set()).add(who));
  for (const item of plan.manifest) if (item.carriedBy) use(item.key, item.carriedBy);
  for (const t of tasks) {
    const socket = socketFor(t, t.crew as CrewMember);
    if (socket !== undefined) use(`socket:${socket}`, t.crew);
    for (const tool of t.tools) use(itemOf.get(tool) ?? itemOf.get(nameKey(tool)) ?? `tool:${tool}`, t.crew);
    for (const a of t.actions) {
      if (kindOf.get(a.item) === 'tether-anchor') return false;
      use(a.item, t.crew);
      if (a.at !== undefined) use(`socket:${a.at}`, t.crew);
    }
  }
  return [...users.values()].every((who) => who.size <= 1);
}

/**
 * When the crew members' days are independent, the day end is the later of their own ends plus
 * ingress, and each own end depends on that crew member's sequence alone: each sequence is searched
 * on its own (the partner's kept as it is), for the earliest own end, with `laneBound` (here `H` is
 * the end of work on the last task placed, since nothing else moves) and without adding a warning.
 * An order that keeps the current one's own end is kept as it is.
 */
function laneByLane(s: Search, incumbent: Scored | null): { best: Scored | null; complete: boolean } {
  const tasks = s.plan.tasks;
  const afterOf = afterIndexes(tasks);
  let order = incumbent?.order ?? topological(tasks);
  let best = incumbent;
  for (const m of CREW) {
    const mine = tasks.flatMap((t, i) => (t.crew === m ? [i] : []));
    const others = order.filter((i) => tasks[i].crew !== m);
    // the partner's tasks keep their order among themselves; theirs all come after m's in the list
    const full = (seq: readonly number[]) => [...seq, ...others];
    let laneBest: { seq: number[]; end: number; scored: Scored } | null = null;
    if (best) {
      const seq = best.order.filter((i) => tasks[i].crew === m);
      if (keepsAfter(tasks, full(seq))) {
        const scored = s.score(full(seq));
        if (scored.added === 0) laneBest = { seq, end: ownEnd(scored.timeline, m), scored };
      }
    }
    const chosen = new Uint8Array(tasks.length);
    let complete = true;
    const visit = (seq: number[]) => {
      if (s.now() > s.deadline) {
        complete = false;
        return;
      }
      const list = full(seq);
      const timeline = s.timelineOf(list);
      if (seq.length === mine.length) {
        const scored = s.score(list, timeline);
        const end = ownEnd(timeline, m);
        if (scored.added === 0 && (laneBest === null || end < laneBest.end - END_EPS))
          laneBest = { seq: [...seq], end, scored };
        return;
      }
      const left = mine.filter((x) => !chosen[x]);
      const last = seq[seq.length - 1];
      const H = last === undefined ? s.plan.egressSeconds : workEnd(timeline, m, list, last, 0);
      if (laneBest && laneBound(s, m, seq, left, list, timeline, H) >= laneBest.end - END_EPS) return;
      const next = left.filter((x) => afterOf[x].every((j) => chosen[j]));
      for (const x of next) {
        chosen[x] = 1;
        seq.push(x);
        visit(seq);
        seq.pop();
        chosen[x] = 0;
        if (!complete) return;
      }
    };
    visit([]);
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
 * Iterated local search: from the best order so far, move one task to another place while that
 * improves the day (fewer added warnings first, then the end; orders with the same two crew
 * sequences are computed once), then from the best make a few random moves and climb again, until the
 * budget, MAX_LOCAL_EVALUATIONS, or STALE_CLIMBS climbs in a row that met only orders already seen.
 */
function localSearch(
  tasks: readonly DayTask[],
  start: Scored | null,
  score: (order: number[]) => Scored,
  deadline: number,
  now: () => number,
  seed: number,
): Scored | null {
  const seen = new Map<string, Scored>();
  let evaluations = 0;
  const out = () => now() > deadline || evaluations >= MAX_LOCAL_EVALUATIONS;
  const scoreOf = (order: number[]): Scored | null => {
    if (!keepsAfter(tasks, order)) return null;
    const key = laneKey(tasks, order);
    let s = seen.get(key);
    if (!s) {
      evaluations++;
      seen.set(key, (s = score(order)));
    }
    return s;
  };
  let from = start ?? scoreOf(topological(tasks));
  if (!from) return null;
  let best = from;
  let rand = seed >>> 0 || 1;
  const random = (k: number) => {
    rand ^= rand << 13;
    rand ^= rand >>> 17;
    rand ^= rand << 5;
    return (rand >>> 0) % k;
  };
  const moved = (order: readonly number[], i: number, j: number) => {
    const next = [...order];
    const [x] = next.splice(i, 1);
    next.splice(j, 0, x);
    return next;
  };
  const n = tasks.length;
  if (n < 2) return best;
  let before = evaluations;
  let stale = 0;
  while (!out()) {
    let improved = true;
    while (improved && !out()) {
      improved = false;
      for (let i = 0; i < n && !out(); i++) {
        for (let j = 0; j < n && !out(); j++) {
          if (i === j) continue;
          const s = scoreOf(moved(from.order, i, j));
          if (s && better(s, from)) {
            from = s;
            improved = true;
          }
        }
      }
    }
    if (better(from, best)) best = from;
    // a whole climb that met no order not seen before: every move around here is known
    if (evaluations === before) stale++;
    else stale = 0;
    if (stale >= STALE_CLIMBS) break;
    before = evaluations;
    let order = best.order;
    for (let k = 0; k < 3; k++) {
      const next = moved(order, random(n), random(n));
      if (keepsAfter(tasks, next)) order = next;
    }
    from = scoreOf(order) ?? best;
  }
  return best;
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
