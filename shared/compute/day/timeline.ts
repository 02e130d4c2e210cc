import type { CrewMember } from '../../schemas/plan';
import type { RouteFeasible } from '../../schemas/route';
import type { ReachResult } from '../../schemas/sockets';
import type { Vec3 } from '../../schemas/station';
import {
  dayNightWindows,
  isWithinNight,
  nextNightWindowFitting,
  orbitSummary,
  type OrbitSummary,
  type OrbitWindow,
} from '../orbit';
import { reachCheck } from '../reach';
import { formatElapsed, formatMinutes } from '../units';
import { ArmDesk, armIngressOf, armRole } from './arm-session';
import { ItemLedger, describeWhere, placeWhere, sameWhere } from './items';
import type {
  CrewTimeline,
  DayFlown,
  DayPlan,
  DayRouteFn,
  DayStart,
  DayStation,
  DayTask,
  FlownWork,
  ItemWhere,
  TaskReach,
  TetherState,
  Timeline,
  TimelineBlock,
  TimelineBlockType,
  TimelineWarning,
} from './types';
import { tetherAtRouteEnd, tetherAtRouteStart } from './types';

export const CREW: readonly CrewMember[] = ['EV1', 'EV2'];
export const partnerOf = (m: CrewMember): CrewMember => (m === 'EV1' ? 'EV2' : 'EV1');

const hm = (s: number) => formatElapsed(s);
const taskName = (task: DayTask, i: number) => `Task ${i + 1} "${task.title}"`;
const nameKey = (name: string) => name.trim().replace(/\s+/g, ' ').toLowerCase();
const ATTACH_KINDS = new Set(['anchor', 'airlock']);
/** Metres: distances along a route are sums of edge lengths, compared with this slack. */
const ALONG_EPS_M = 1e-6;

/** The members of a task: one, or both for a joint task. */
export const membersOf = (task: Pick<DayTask, 'crew'>): readonly CrewMember[] =>
  task.crew === 'both' ? CREW : [task.crew];

/** The socket a crew member works from in a task, if any. */
export function socketFor(task: Pick<DayTask, 'crew' | 'socket' | 'sockets'>, m: CrewMember) {
  return task.crew === 'both' ? task.sockets?.[m] : task.socket;
}

type Step =
  | { kind: 'travel'; task: number }
  | { kind: 'after'; task: number }
  | { kind: 'restraint-in'; task: number }
  | { kind: 'sync'; task: number }
  | { kind: 'work'; task: number }
  | { kind: 'after-work'; task: number }
  | { kind: 'arm-in'; task: number }
  | { kind: 'arm-ride'; task: number }
  | { kind: 'arm-out'; task: number }
  | { kind: 'home' }
  | { kind: 'sync-home' }
  | { kind: 'ingress' };

interface Lane {
  crew: CrewMember;
  t: number;
  at: string;
  tether: TetherState;
  /** the socket whose restraint the crew member stands in */
  restraint: string | null;
  /** whether the crew member reached the current task's worksite */
  reached: boolean;
  blocks: TimelineBlock[];
  steps: Step[];
  pc: number;
  /** waiting at a sync point for the partner */
  waitingAt: string | null;
  /** the way home is in the steps (always, except in a day placed task by task while tasks are left) */
  closed: boolean;
}

/** An effect due at a time: an item moves, or a crew member leaves a restraint's socket free. */
type Pending =
  | { t: number; seq: number; item: string; where: ItemWhere }
  | { t: number; seq: number; socket: string; crew: CrewMember };

/** What every copy of one day shares: the plan, the station and what follows from them alone. */
interface DayContext {
  plan: DayPlan;
  station: DayStation;
  route: DayRouteFn;
  start: DayStart;
  restraintSeconds: number;
  /** item keys by key and by name */
  byNameOrKey: Map<string, string[]>;
  /** plan indices by task id */
  planIndexById: Map<number, number>;
  /** night windows for the placed-task checks, over at least `duration` */
  nights: { duration: number; windows: OrbitWindow[] } | null;
}

/**
 * The two-person EVA day as one continuous state, simulated in time order.
 *
 * At every moment each crew member has a place, a tether state (the attach point clipped to and the
 * metres out since it), maybe a foot restraint they stand in, and the items in their hands; every
 * manifest item is in exactly one place, starting where `start` puts it (an earlier EVA of a series
 * left it there) or else where the manifest says. Both leave the airlock clipped there with nothing out, then
 * take their tasks in plan order: translate (a route from their tether state on arrival at the last
 * worksite, in the plan's mode, with the portable anchors installed at that moment as attach points,
 * slowed by the carry factor while holding a large item), get into their foot restraint, work (a task
 * for both starts when both are ready), get out. An item action's precondition is checked when the
 * work starts and its effect applies when the work ends. At the end each translates back to the
 * airlock and, as the hatch closes on both, one shared ingress block.
 *
 * The lanes advance in time order (the lane whose clock is earliest goes next, EV1 first on a tie),
 * and an effect due at time t is applied before any step that starts at t or later, so what one crew
 * member does is seen by the other exactly from the moment it is done, whatever the plan order.
 *
 * Problems never stop the day: an unreachable worksite keeps the work block (marked `unreached`),
 * a failed precondition skips that action's effect, and each is a warning.
 */
export function computeTimeline(
  plan: DayPlan,
  station: DayStation,
  route: DayRouteFn,
  start: DayStart = {},
): Timeline {
  return new DaySimulation(plan, station, route, start, true).finish();
}

/**
 * The same day placed task by task: `placeDay` starts it with no task placed, `place` appends the
 * plan's task at the end of the order and runs the day as far as the tasks placed decide it, `copy`
 * keeps a state to extend in several ways, `finish` gives the day of the whole order. The day of an
 * order placed this way is the day `computeTimeline` computes on that order (its warnings may be
 * listed in another order, and one for an `after` task not placed yet does not say where it comes). Not for plans with arm tasks (an arm session depends on the tasks around).
 */
export function placeDay(plan: DayPlan, station: DayStation, route: DayRouteFn, start: DayStart = {}) {
  if (plan.tasks.some((t) => t.arm)) throw new Error('internal: a day with arm tasks is computed whole');
  const day = new DaySimulation(plan, station, route, start, false);
  day.advance();
  return day;
}

export type PlacedDay = DaySimulation;

/** Where a crew member's day stands: their clock, and the tasks placed whose work has not started. */
export interface LaneProgress {
  t: number;
  /** plan indices, in order */
  notStarted: number[];
  /** the plan index of the last task whose work has started (null: none yet) */
  lastStarted: number | null;
  /** the whole way from the last task begun into the first not started is still ahead */
  wayInAhead: boolean;
  /** back at the airlock at this time (before waiting for the partner and ingress); null: not yet */
  back: number | null;
}

/** A crew member's own end of the day: back at the airlock, before waiting for the partner and ingress. */
export function ownEndOf(blocks: readonly TimelineBlock[]): number {
  for (let k = blocks.length - 1; k >= 0; k--) {
    if (blocks[k].type !== 'wait' && blocks[k].type !== 'ingress') return blocks[k].end;
  }
  return 0;
}

class DaySimulation {
  private readonly ctx: DayContext;
  /** the tasks placed, in order; `order[k]` is the plan index of the task at position k */
  private tasks: DayTask[] = [];
  private order: number[] = [];
  private afterOf: number[][] = [];
  private knownSite: boolean[] = [];
  private reachByTask = new Map<string, ReachResult>();
  private warnings: TimelineWarning[] = [];
  private routes: RouteFeasible[] = [];
  private reach: TaskReach[] = [];
  private ledger: ItemLedger;
  private lanes = {} as Record<CrewMember, Lane>;
  private pending: Pending[] = [];
  private seq = 0;
  /** socket → who stands in its restraint */
  private occupant = new Map<string, CrewMember>();
  private actionsDone = new Set<number>();
  private eclipseTasks: { index: number; start: number; end: number }[] = [];
  /** each task's work end, once its work block is laid */
  private workEnd: (number | undefined)[] = [];
  /** tasks of each crew member not placed yet */
  private left: Record<CrewMember, number> = { EV1: 0, EV2: 0 };
  private arms: ArmDesk<Lane>;
  /** the crew member whose next task the day waits for (null: it has run as far as it goes) */
  private stoppedOn: CrewMember | null = null;

  constructor(
    plan: DayPlan,
    station: DayStation,
    route: DayRouteFn,
    start: DayStart,
    whole: boolean,
    from?: DaySimulation,
  ) {
    if (from) {
      this.ctx = from.ctx;
      this.tasks = [...from.tasks];
      this.order = [...from.order];
      this.afterOf = [...from.afterOf];
      this.knownSite = [...from.knownSite];
      this.reachByTask = new Map(from.reachByTask);
      this.warnings = [...from.warnings];
      this.routes = [...from.routes];
      this.reach = [...from.reach];
      this.ledger = from.ledger.copy();
      for (const m of CREW) {
        const l = from.lanes[m];
        this.lanes[m] = { ...l, blocks: [...l.blocks], steps: [...l.steps] };
      }
      this.pending = [...from.pending];
      this.seq = from.seq;
      this.occupant = new Map(from.occupant);
      this.actionsDone = new Set(from.actionsDone);
      this.eclipseTasks = [...from.eclipseTasks];
      this.workEnd = [...from.workEnd];
      this.left = { ...from.left };
      this.stoppedOn = from.stoppedOn;
      this.arms = this.armDesk();
      return;
    }
    const byNameOrKey = new Map<string, string[]>();
    this.ctx = {
      plan,
      station,
      route,
      start,
      restraintSeconds: station.settings.restraintSeconds,
      byNameOrKey,
      planIndexById: new Map(),
      nights: null,
    };
    plan.tasks.forEach((t, i) => t.id !== undefined && this.ctx.planIndexById.set(t.id, i));
    const { airlockKey } = station;
    this.ledger = new ItemLedger(plan.manifest, airlockKey, start.items);

    // ── static checks: places, tools, reach ─────────────────────────────────────────────────────────
    for (const item of plan.manifest) {
      for (const k of new Set([item.key, nameKey(item.name)])) {
        byNameOrKey.set(k, [...(byNameOrKey.get(k) ?? []), item.key]);
      }
      for (const [field, place] of [
        ['starts at', item.installedAt === undefined ? item.startsAt : undefined],
        ['is installed at', item.installedAt],
      ] as const) {
        if (place !== undefined && !this.known(place)) {
          this.warnings.push({
            code: 'unknown-start',
            message: `${item.name} ${field} "${place}", which is not the airlock or a node of the station`,
            item: item.key,
          });
        }
      }
    }
    if (whole) {
      this.tasks = [...plan.tasks];
      this.order = plan.tasks.map((_, i) => i);
      plan.tasks.forEach((task, i) => this.checkTask(task, i));
    }
    const usedItems = new Set<string>();
    for (const task of plan.tasks) {
      for (const tool of task.tools) this.toolItems(tool).forEach((k) => usedItems.add(k));
      for (const a of task.actions) usedItems.add(a.item);
    }
    for (const item of plan.manifest) {
      if (item.kind === 'tool' && !usedItems.has(item.key)) {
        this.warnings.push({
          code: 'unused-tool',
          message: `${item.name} is used by no task`,
          item: item.key,
        });
      }
    }
    if (whole) plan.tasks.forEach((task, i) => this.afterOf.push(this.afterLinks(task, i)));

    // ── the lanes ───────────────────────────────────────────────────────────────────────────────────
    for (const m of CREW) {
      const steps: Step[] = [];
      if (whole) plan.tasks.forEach((task, i) => this.taskSteps(steps, m, i));
      else this.left[m] = plan.tasks.filter((t) => membersOf(t).includes(m)).length;
      this.lanes[m] = {
        crew: m,
        t: 0,
        at: airlockKey,
        tether: { anchor: airlockKey, paidOutM: 0 },
        restraint: null,
        reached: true,
        blocks: [],
        steps,
        pc: 0,
        waitingAt: null,
        closed: false,
      };
      if (this.left[m] === 0) this.close(this.lanes[m]);
      const egressSeconds = flownEgress(plan.egressSeconds, start.flown, m);
      if (egressSeconds > 0) push(this.lanes[m], 'egress', egressSeconds, 'Egress');
    }
    this.arms = this.armDesk();
  }

  /** A copy to extend on its own. */
  copy(): DaySimulation {
    const { plan, station, route, start } = this.ctx;
    return new DaySimulation(plan, station, route, start, false, this);
  }

  /** Appends the plan's task `planIndex` to the order and runs the day as far as the order decides it. */
  place(planIndex: number): this {
    const task = this.ctx.plan.tasks[planIndex];
    const i = this.tasks.length;
    this.tasks.push(task);
    this.order.push(planIndex);
    this.checkTask(task, i);
    this.afterOf.push(this.afterLinks(task, i));
    for (const m of membersOf(task)) {
      const lane = this.lanes[m];
      this.taskSteps(lane.steps, m, i);
      if (--this.left[m] === 0) this.close(lane);
    }
    this.advance();
    return this;
  }

  /** The plan indices placed so far, in order. */
  placed(): readonly number[] {
    return this.order;
  }

  /** Warnings so far: a day placed further only adds to them. */
  warningsSoFar(): readonly TimelineWarning[] {
    return this.warnings;
  }

  /** The crew member whose next task the day needs to go on (null: every task is placed). */
  waitsFor(): CrewMember | null {
    return this.stoppedOn;
  }

  progress(m: CrewMember): LaneProgress {
    const lane = this.lanes[m];
    const notStarted: number[] = [];
    for (let pc = lane.pc; pc < lane.steps.length; pc++) {
      const s = lane.steps[pc];
      if (s.kind === 'work') notStarted.push(this.order[s.task]);
    }
    let lastStarted: number | null = null;
    let lastAt = -1;
    for (let pc = Math.min(lane.pc, lane.steps.length) - 1; pc >= 0; pc--) {
      const s = lane.steps[pc];
      if (s.kind === 'work') {
        lastStarted = this.order[s.task];
        lastAt = pc;
        break;
      }
    }
    // back at the airlock: the end of the way home
    const homeAt = lane.steps.findIndex((s) => s.kind === 'home');
    const back = homeAt !== -1 && lane.pc > homeAt ? ownEndOf(lane.blocks) : null;
    // no step after the last work begun has run: getting out, moving and getting in are all ahead
    return { t: lane.t, notStarted, lastStarted, wayInAhead: lane.pc === lastAt + 1, back };
  }

  /** The end of the work of the placed task `planIndex` (undefined while not laid). */
  workEndOf(planIndex: number): number | undefined {
    const k = this.order.indexOf(planIndex);
    return k === -1 ? undefined : this.workEnd[k];
  }

  /**
   * Plan indices of the eclipse-only tasks laid so far whose work is not inside a night window: the
   * day's `eclipse-only-outside-night` warnings for them are already certain.
   */
  outsideNight(): number[] {
    if (this.eclipseTasks.length === 0) return [];
    const latest = Math.max(...this.eclipseTasks.map((e) => e.end));
    const windows = this.nightWindows(latest);
    return this.eclipseTasks
      .filter((e) => !isWithinNight(windows, e.start, e.end))
      .map((e) => this.order[e.index]);
  }

  /** The earliest start, no earlier than `earliest`, of work of `seconds` wholly inside a night window. */
  nightStart(earliest: number, seconds: number): number {
    const slot = nextNightWindowFitting(this.nightWindows(earliest + seconds), earliest, seconds);
    return slot ? slot.start : Infinity;
  }

  /**
   * What a crew member's own steps from here take depends on (in a day with no portable anchor or
   * large item): their place, tether state, restraint, whether they reached the worksite, and the
   * steps ahead (plan indices).
   */
  laneState(m: CrewMember): string {
    const l = this.lanes[m];
    const steps = l.steps
      .slice(l.pc)
      .map((s) => ('task' in s ? `${s.kind}${this.order[s.task]}` : s.kind))
      .join(' ');
    return `${l.at}|${l.tether.anchor}|${l.tether.paidOutM}|${l.restraint}|${l.reached}|${steps}`;
  }

  /**
   * The day's state apart from its clocks, as text (`key`): the tasks placed, each crew member's
   * place, tether state, restraint and steps still to take, where every item is, the effects still
   * due (without their times), who stands in which restraint, the warnings so far (as problems, by
   * plan index). `times` are the clocks: each crew member's, then the work end of each task of
   * `ends` (plan indices; one not laid yet is in the key instead). `pending` lists the effects still
   * due with their times and what they touch (an item key or `socket:` and a socket key); `touches`,
   * what each crew member has now: the socket they stand in and the items in their hands.
   */
  stateOf(ends: readonly number[]): {
    key: string;
    times: number[];
    pending: { t: number; touches: string }[];
    touches: Record<CrewMember, string[]>;
  } {
    const order = this.order;
    const plan = (i: number | undefined) => (i === undefined ? '' : String(order[i]));
    const parts: string[] = [[...order].sort((a, b) => a - b).join(',')];
    const times: number[] = [];
    for (const m of CREW) {
      const l = this.lanes[m];
      times.push(l.t);
      const waiting = l.waitingAt?.replace(/\d+$/, (k) => plan(Number(k))) ?? '';
      const steps = l.steps
        .slice(l.pc)
        .map((s) => ('task' in s ? `${s.kind}${order[s.task]}` : s.kind))
        .join(' ');
      const { anchor, paidOutM } = l.tether;
      parts.push(`${l.at}|${anchor}|${paidOutM}|${l.restraint}|${l.reached}|${waiting}|${l.closed}|${steps}`);
      for (let pc = l.pc; pc < l.steps.length; pc++) {
        const s = l.steps[pc];
        if (s.kind === 'after') parts.push(`a${order[s.task]}:${this.afterOf[s.task].map(plan).join(',')}`);
      }
    }
    for (const x of ends) {
      const end = this.workEndOf(x);
      if (end === undefined) parts.push(`open${x}`);
      else times.push(end);
    }
    const ledger = this.ledger;
    parts.push(
      ledger
        .keys()
        .map((k) => `${k}:${JSON.stringify(ledger.where(k))}`)
        .join(';'),
    );
    const pending = [...this.pending].sort((a, b) => a.seq - b.seq);
    parts.push(
      pending
        .map((p) => ('item' in p ? `${p.item}>${JSON.stringify(p.where)}` : `${p.socket}<${p.crew}`))
        .join(';'),
    );
    parts.push(
      [...this.occupant]
        .map(([s, m]) => `${s}=${m}`)
        .sort()
        .join(';'),
    );
    parts.push([...this.actionsDone].map(plan).sort().join(','));
    parts.push(
      this.warnings
        .map((w) => `${w.code}|${plan(w.taskIndex)}|${w.crew ?? ''}|${w.item ?? ''}|${w.arm ?? ''}`)
        .sort()
        .join(';'),
    );
    return {
      key: parts.join('\n'),
      times,
      pending: pending.map((p) => ({ t: p.t, touches: 'item' in p ? p.item : `socket:${p.socket}` })),
      touches: Object.fromEntries(
        CREW.map((m) => {
          const r = this.lanes[m].restraint;
          return [m, [...(r === null ? [] : [`socket:${r}`]), ...ledger.heldBy(m).map((i) => i.key)]];
        }),
      ) as Record<CrewMember, string[]>,
    };
  }

  // ── building the day ──────────────────────────────────────────────────────────────────────────────

  private known(key: string): boolean {
    const { station } = this.ctx;
    // an arm's key names the end of the arm: a foot restraint can be installed there
    return (
      key === 'airlock' || station.node(key) !== undefined || (station.arms ?? []).some((a) => a.key === key)
    );
  }

  private toolItems(tool: string): string[] {
    const { byNameOrKey } = this.ctx;
    return byNameOrKey.get(tool) ?? byNameOrKey.get(nameKey(tool)) ?? [];
  }

  private isAttach(key: string): boolean {
    return ATTACH_KINDS.has(this.ctx.station.node(key)?.kind ?? '');
  }

  /** A task's checks that do not depend on the day: its worksite, its tools, its places and reach. */
  private checkTask(task: DayTask, i: number) {
    const { station } = this.ctx;
    const known = station.node(task.worksite) !== undefined;
    this.knownSite[i] = known;
    if (!known) {
      this.warnings.push({
        code: 'unknown-worksite',
        message: `${taskName(task, i)}: the station has no node "${task.worksite}"`,
        taskIndex: i,
      });
    }
    for (const tool of new Set(task.tools)) {
      if (this.toolItems(tool).length === 0) {
        this.warnings.push({
          code: 'tool-not-in-manifest',
          message: `${taskName(task, i)} uses ${tool}, which is not in the manifest`,
          taskIndex: i,
        });
      }
    }
    for (const a of task.actions) {
      if (a.at !== undefined && !this.known(a.at)) {
        this.warnings.push({
          code: 'unknown-place',
          message: `${taskName(task, i)}: ${a.do} of ${this.ledger.item(a.item)?.name ?? a.item} at "${a.at}", which is not a node of the station`,
          taskIndex: i,
          item: a.item,
        });
      }
    }
    for (const m of membersOf(task)) {
      const socket = socketFor(task, m);
      if (socket === undefined) continue;
      const r = checkReach(station, task, i, m, socket, this.warnings);
      this.reach.push({ taskIndex: i, crew: m, socket, worksite: task.worksite, reach: r });
      if (r) this.reachByTask.set(`${i}:${m}`, r);
    }
  }

  /**
   * Precedence: a task's work starts after the work of the tasks it is `after` has ended. Only tasks
   * earlier in the order are waited for: then the first task not yet done in order can always go
   * ahead, so the two lanes never wait for each other in a circle.
   */
  private afterLinks(task: DayTask, i: number): number[] {
    const { plan } = this.ctx;
    return (task.after ?? []).flatMap((id) => {
      const p = this.ctx.planIndexById.get(id);
      if (p === undefined) return [];
      const j = this.order.indexOf(p);
      if (j === i) return [];
      if (j === -1 || j > i) {
        const named = j === -1 ? `"${plan.tasks[p].title}"` : taskName(plan.tasks[p], j);
        this.warnings.push({
          code: 'after-out-of-order',
          message: `${taskName(task, i)} is to start after ${named}, which comes later in the plan: move it above, or the day cannot keep that order`,
          taskIndex: i,
        });
        return [];
      }
      return [j];
    });
  }

  private taskSteps(steps: Step[], m: CrewMember, i: number) {
    const task = this.tasks[i];
    if (!membersOf(task).includes(m)) return;
    const onArm = armRole(this.tasks, m, i);
    const wait: Step[] = this.afterOf[i].length ? [{ kind: 'after', task: i }] : [];
    if (onArm) {
      if (onArm.first) steps.push({ kind: 'travel', task: i }, ...wait, { kind: 'arm-in', task: i });
      else steps.push(...wait);
      steps.push({ kind: 'arm-ride', task: i });
    } else steps.push({ kind: 'travel', task: i }, ...wait, { kind: 'restraint-in', task: i });
    if (task.crew === 'both') steps.push({ kind: 'sync', task: i });
    steps.push({ kind: 'work', task: i });
    if (!onArm) steps.push({ kind: 'after-work', task: i });
    else if (onArm.last) steps.push({ kind: 'arm-out', task: i });
  }

  /** No task left for the lane: the way home goes into its steps. */
  private close(lane: Lane) {
    lane.steps.push({ kind: 'home' }, { kind: 'sync-home' }, { kind: 'ingress' });
    lane.closed = true;
  }

  /** Steps the lane can take on the tasks placed: getting out after the last one waits for the next. */
  private runnable(lane: Lane): number {
    const n = lane.steps.length;
    return !lane.closed && n > 0 && lane.steps[n - 1].kind === 'after-work' ? n - 1 : n;
  }

  private armDesk(): ArmDesk<Lane> {
    const { plan, station, restraintSeconds } = this.ctx;
    return new ArmDesk({
      plan,
      station,
      ledger: this.ledger,
      warnings: this.warnings,
      restraintSeconds,
      lanes: this.lanes,
      push,
      isAttachNow: (key) => this.isAttach(key) || this.ledger.anchorNodes().includes(key),
      taskName: (i) => taskName(this.tasks[i], i),
    });
  }

  private nightWindows(latest: number): OrbitWindow[] {
    const { plan, station } = this.ctx;
    const orbitInput = {
      altitudeKm: station.orbit.altitudeKm,
      betaDeg: plan.betaDegOverride ?? station.orbit.betaDeg,
    };
    const period = orbitSummary(orbitInput).periodSeconds;
    // a window that holds work ending by `latest` is the same over any longer horizon
    const need = Math.max(plan.timeLimitSeconds, latest) + 2 * period;
    const nights = this.ctx.nights;
    if (nights && nights.duration >= need) return nights.windows;
    const duration = Math.max(need, 2 * (nights?.duration ?? 0));
    const windows = dayNightWindows({
      ...orbitInput,
      phaseAtStartDeg: plan.orbitPhaseAtStartDeg,
      durationSeconds: duration,
    });
    this.ctx.nights = { duration, windows };
    return windows;
  }

  // ── the simulation ──────────────────────────────────────────────────────────────────────────────

  private later(
    t: number,
    effect: { item: string; where: ItemWhere } | { socket: string; crew: CrewMember },
  ) {
    this.pending.push({ t, seq: this.seq++, ...effect });
  }

  private applyUpTo(t: number) {
    const pending = this.pending;
    pending.sort((a, b) => a.t - b.t || a.seq - b.seq);
    while (pending.length && pending[0].t <= t) {
      const p = pending.shift()!;
      if ('item' in p) this.ledger.move(p.item, p.t, p.where);
      else if (this.occupant.get(p.socket) === p.crew) this.occupant.delete(p.socket);
    }
  }

  private holdsLarge(m: CrewMember) {
    return this.ledger.heldBy(m).some((item) => item.kind === 'large-item');
  }

  /**
   * How much tether may be out on arrival at a task's worksite so that the crew member can still
   * reach an attach point when they leave (with the portable anchors as they will be after the task):
   * without it, a route that uses the whole tether to get in would leave them unable to get out.
   */
  private endCap(taskIndex: number, tetherLengthM: number): number | undefined {
    const task = this.tasks[taskIndex];
    const after = new Set(this.ledger.anchorNodes());
    for (const a of task.actions) {
      if (this.ledger.item(a.item)?.kind !== 'tether-anchor') continue;
      const at = a.at ?? task.worksite;
      if (a.do === 'install') after.add(at);
      if (a.do === 'remove') after.delete(at);
    }
    const d = this.ctx.station.nearestAttachM(task.worksite, [...after], this.ctx.plan.allowRide);
    // no attach point within the tether: no arrival leaves room, so none is asked for
    return d === null || d <= 0 || d >= tetherLengthM ? undefined : tetherLengthM - d;
  }

  private translate(lane: Lane, to: string, carrying: boolean, taskIndex?: number): boolean {
    if (lane.at === to) return true;
    const { plan, route } = this.ctx;
    const extra = new Set(this.ledger.anchorNodes());
    // still clipped to a portable anchor someone removed meanwhile: the hook is on it until the first swap
    if (!this.isAttach(lane.tether.anchor)) extra.add(lane.tether.anchor);
    const tetherLengthM = plan.crew[lane.crew].tetherLengthM;
    const request = {
      from: lane.at,
      to,
      mode: plan.routeMode,
      tetherLengthM,
      carrying,
      allowRide: plan.allowRide,
      startAnchor: lane.tether.anchor,
      startPaidOutM: Math.min(lane.tether.paidOutM, tetherLengthM * (1 - 1e-12)),
      extraAttach: [...extra].sort(),
    };
    // into a worksite, the best way in that leaves tether enough to get out again (one search: it is
    // the best way in whenever that leaves room); none: the best way in, and the way out will say
    // why it fails
    const toWork = taskIndex !== undefined && this.tasks[taskIndex].worksite === to;
    const cap = toWork ? this.endCap(taskIndex, tetherLengthM) : undefined;
    let result = cap === undefined ? route(request) : route({ ...request, endPaidOutMaxM: cap });
    if (!result.feasible && cap !== undefined) result = route(request);
    const where =
      taskIndex === undefined ? 'the airlock' : `${taskName(this.tasks[taskIndex], taskIndex)} at ${to}`;
    if (!result.feasible) {
      this.warnings.push({
        code: 'route-infeasible',
        message: `${lane.crew} cannot get from ${lane.at} to ${where}: ${result.reason}`,
        taskIndex,
        crew: lane.crew,
      });
      return false;
    }
    for (const w of result.warnings) {
      const caution = result.cautionHazards.some((h) => w.includes(h));
      this.warnings.push({
        code: caution ? 'route-caution' : 'route-note',
        message: `${lane.crew} on the way to ${where}: ${w}`,
        taskIndex,
        crew: lane.crew,
      });
    }
    this.routes.push(result);
    layRoute(lane, result, this.routes.length - 1, taskIndex);
    lane.at = to;
    lane.tether = { ...tetherAtRouteEnd(result) };
    return true;
  }

  private getOut(lane: Lane, taskIndex?: number) {
    const socket = lane.restraint;
    if (socket === null) return;
    push(lane, 'restraint-out', this.ctx.restraintSeconds, `Out of the foot restraint at ${socket}`, {
      socket,
      ...(taskIndex === undefined ? {} : { taskIndex }),
    });
    lane.restraint = null;
    this.later(lane.t, { socket, crew: lane.crew });
  }

  private getIn(lane: Lane, task: DayTask, i: number) {
    const socket = socketFor(task, lane.crew);
    if (socket === undefined || lane.restraint === socket || !lane.reached) return;
    // an unknown socket is warned about once, with the reach checks
    if (this.ctx.station.node(socket) === undefined) return;
    this.getOut(lane, i);
    const ledger = this.ledger;
    const restraints = ledger.installedAt(socket, 'foot-restraint');
    const ref = { taskIndex: i, crew: lane.crew };
    if (restraints.length === 0) {
      const where = ledger
        .keys()
        .map((k) => ledger.item(k)!)
        .filter((item) => item.kind === 'foot-restraint')
        .map((item) => `${item.name} is ${describeWhere(ledger.where(item.key)!)}`);
      this.warnings.push({
        code: 'restraint-missing',
        message: `${taskName(task, i)}: no foot restraint is installed in ${socket} when ${lane.crew} gets in at ${hm(lane.t)}${where.length ? ` (${where.join('; ')})` : ' (the manifest has none)'}`,
        ...ref,
      });
    }
    const other = this.occupant.get(socket);
    if (other !== undefined && other !== lane.crew) {
      this.warnings.push({
        code: 'restraint-occupied',
        message: `${taskName(task, i)}: ${other} is standing in the foot restraint at ${socket} when ${lane.crew} would get in at ${hm(lane.t)}; a restraint holds one person`,
        ...ref,
      });
    }
    const r = this.reachByTask.get(`${i}:${lane.crew}`);
    push(lane, 'restraint-in', this.ctx.restraintSeconds, `Into the foot restraint at ${socket}`, {
      taskIndex: i,
      socket,
      ...(r ? { yawSetDeg: r.yawSetDeg, pitchSetDeg: r.pitchSetDeg } : {}),
    });
    this.occupant.set(socket, lane.crew);
    lane.restraint = socket;
  }

  /** Checks a task's tools and its item actions at the start of its work; schedules the effects. */
  private startWork(
    task: DayTask,
    i: number,
    start: number,
    members: readonly CrewMember[],
    end = start + task.durationSeconds,
  ) {
    const { station } = this.ctx;
    const { airlockKey } = station;
    const ledger = this.ledger;
    const warnings = this.warnings;
    for (const tool of new Set(task.tools)) {
      const items = this.toolItems(tool);
      if (items.length === 0) continue;
      const atHand = items.some((k) => {
        const w = ledger.where(k)!;
        return (
          (w.kind === 'carried' && members.includes(w.crew)) || (w.kind === 'at' && w.node === task.worksite)
        );
      });
      if (!atHand) {
        const where = items.map((k) => `${ledger.item(k)!.name} is ${describeWhere(ledger.where(k)!)}`);
        warnings.push({
          code: 'tool-not-at-hand',
          message: `${taskName(task, i)} needs ${tool} at ${hm(start)}, but ${where.join('; ')}`,
          taskIndex: i,
          ...(task.crew === 'both' ? {} : { crew: task.crew }),
          item: items[0],
        });
      }
    }
    task.actions.forEach((a) => {
      const item = ledger.item(a.item);
      if (!item) return;
      const by: CrewMember = a.by ?? (task.crew === 'both' ? 'EV1' : task.crew);
      const defaultAt =
        item.kind === 'foot-restraint' && (a.do === 'install' || a.do === 'remove')
          ? (socketFor(task, by) ?? task.worksite)
          : task.worksite;
      const at = a.at ?? defaultAt;
      const now = ledger.where(a.item)!;
      const ref = { taskIndex: i, crew: by, item: a.item };
      const said = `${taskName(task, i)}: ${by} cannot ${a.do.replace('-', ' ')} ${item.name} at ${hm(start)}`;
      const held = now.kind === 'carried' && now.crew === by;
      const notHeld = () =>
        warnings.push({
          code: 'item-not-held',
          message: `${said}: ${by} is not holding it (it is ${describeWhere(now)})`,
          ...ref,
        });
      switch (a.do) {
        case 'pick-up': {
          const there = placeWhere(at, airlockKey);
          if (!sameWhere(now, there)) {
            warnings.push({
              code: 'item-not-there',
              message: `${said}: it is ${describeWhere(now)}, not ${describeWhere(there)}`,
              ...ref,
            });
            return;
          }
          this.later(end, { item: a.item, where: { kind: 'carried', crew: by } });
          return;
        }
        case 'set-down':
          if (!held) return void notHeld();
          this.later(end, { item: a.item, where: placeWhere(at, airlockKey) });
          return;
        case 'install': {
          if (!held) return void notHeld();
          if (item.kind === 'foot-restraint') {
            const node = station.node(at);
            if (node && node.kind !== 'socket') {
              warnings.push({
                code: 'socket-unusable',
                message: `${said}: ${at} is a ${node.kind}, not a foot-restraint socket`,
                ...ref,
              });
              return;
            }
            const already = ledger.installedAt(at, 'foot-restraint');
            if (already.length) {
              warnings.push({
                code: 'socket-occupied',
                message: `${said}: ${already[0].name} is already installed in ${at}`,
                ...ref,
              });
              return;
            }
          }
          this.later(end, { item: a.item, where: { kind: 'installed', node: at } });
          return;
        }
        case 'remove':
          if (!(now.kind === 'installed' && now.node === at)) {
            warnings.push({
              code: 'item-not-there',
              message: `${said}: it is ${describeWhere(now)}, not installed at ${at}`,
              ...ref,
            });
            return;
          }
          this.later(end, { item: a.item, where: { kind: 'carried', crew: by } });
          return;
        case 'hand-over': {
          if (!held) return void notHeld();
          this.later(end, { item: a.item, where: { kind: 'carried', crew: partnerOf(by) } });
          return;
        }
      }
    });
  }

  private nextSocketOf(lane: Lane): string | undefined {
    for (let pc = lane.pc; pc < lane.steps.length; pc++) {
      const s = lane.steps[pc];
      if (s.kind === 'travel') return socketFor(this.tasks[s.task], lane.crew);
    }
    return undefined;
  }

  private afterReady(task: number) {
    return this.afterOf[task].every((j) => this.workEnd[j] !== undefined);
  }

  private run(lane: Lane, step: Step) {
    const m = lane.crew;
    const { plan, station, start } = this.ctx;
    const tasks = this.tasks;
    const workEnd = this.workEnd;
    switch (step.kind) {
      case 'travel': {
        const task = tasks[step.task];
        // still in the restraint the task uses: its worksite is in reach from there, nobody moves
        if (lane.restraint !== null && socketFor(task, m) === lane.restraint) {
          lane.reached = this.knownSite[step.task];
          return;
        }
        this.getOut(lane, step.task);
        const ingress = armIngressOf(tasks, m, step.task);
        const to = ingress ?? task.worksite;
        const knownTo =
          ingress === undefined ? this.knownSite[step.task] : station.node(ingress) !== undefined;
        lane.reached = knownTo && this.translate(lane, to, task.carrying || this.holdsLarge(m), step.task);
        return;
      }
      case 'arm-in':
        this.arms.board(lane, step.task);
        return;
      case 'arm-ride':
        this.arms.ride(lane, step.task);
        return;
      case 'arm-out':
        this.arms.leave(lane, step.task);
        return;
      case 'after': {
        if (!this.afterReady(step.task)) {
          // the partner has yet to start one of them: look again once it has
          lane.waitingAt = `after:${step.task}`;
          lane.pc--;
          return;
        }
        const last = this.afterOf[step.task].reduce((a, j) => (workEnd[j]! > workEnd[a]! ? j : a));
        if (workEnd[last]! > lane.t) {
          push(lane, 'wait', workEnd[last]! - lane.t, `Wait for ${taskName(tasks[last], last)} to end`, {
            taskIndex: step.task,
          });
        }
        return;
      }
      case 'restraint-in':
        this.getIn(lane, tasks[step.task], step.task);
        return;
      case 'sync':
        lane.waitingAt = `task:${step.task}`;
        return;
      case 'work': {
        const task = tasks[step.task];
        const members = membersOf(task);
        const span = flownSpan(lane.t, task.durationSeconds, start.flown, flownWork(start.flown, task, m));
        if (span.start > lane.t) {
          push(
            lane,
            'wait',
            span.start - lane.t,
            `Behind the plan: ${task.title} starts at ${hm(span.start)}`,
            {
              taskIndex: step.task,
            },
          );
        }
        if (!this.actionsDone.has(step.task)) {
          this.actionsDone.add(step.task);
          workEnd[step.task] = span.end;
          if (members.every((x) => this.lanes[x].reached))
            this.startWork(task, step.task, lane.t, members, span.end);
          if (task.eclipseOnly) this.eclipseTasks.push({ index: step.task, ...span });
        }
        const socket = lane.restraint ?? undefined;
        push(lane, 'work', span.end - span.start, task.title, {
          taskIndex: step.task,
          ...(task.id === undefined ? {} : { taskId: task.id }),
          ...(socket ? { socket } : {}),
          ...(lane.reached ? {} : { unreached: true }),
        });
        return;
      }
      case 'after-work':
        if (lane.restraint !== null && this.nextSocketOf(lane) !== lane.restraint)
          this.getOut(lane, step.task);
        return;
      case 'home':
        this.getOut(lane);
        this.translate(lane, station.airlockKey, this.holdsLarge(m));
        return;
      case 'sync-home':
        lane.waitingAt = 'home';
        return;
      case 'ingress': {
        for (const item of this.ledger.heldBy(m)) this.ledger.move(item.key, lane.t, { kind: 'airlock' });
        const span = flownSpan(lane.t, plan.ingressSeconds, start.flown, start.flown?.ingress);
        if (span.start > lane.t) push(lane, 'wait', span.start - lane.t, 'Behind the plan: ingress');
        if (span.end > span.start) push(lane, 'ingress', span.end - span.start, 'Ingress');
        return;
      }
    }
  }

  /**
   * Runs the day in time order until it ends, or until the lane to go next has taken every step the
   * tasks placed give it (its next step depends on its next task): every step taken so far is the
   * same whatever tasks come next.
   */
  advance(): void {
    this.stoppedOn = null;
    const lanes = CREW.map((m) => this.lanes[m]);
    for (;;) {
      const active = lanes.filter((l) => l.pc < l.steps.length || !l.closed);
      if (active.length === 0) break;
      for (const l of active) {
        if (l.waitingAt?.startsWith('after:') && this.afterReady(Number(l.waitingAt.slice(6))))
          l.waitingAt = null;
      }
      const ready = active.filter((l) => l.waitingAt === null);
      if (ready.length === 0 && this.arms.breakDeadlock(active)) continue;
      if (ready.length === 0) {
        // both at a sync point: it must be the same one (tasks for both keep plan order in each lane)
        const [a, b] = active;
        if (!b || a.waitingAt !== b.waitingAt) throw new Error('internal: the crew lanes lost step');
        const start = Math.max(a.t, b.t);
        const why = a.waitingAt === 'home' ? 'at the airlock' : undefined;
        for (const l of active) {
          if (start > l.t) {
            const taskIndex = why ? undefined : Number(l.waitingAt!.slice(5));
            const at = why ?? `at ${this.tasks[taskIndex!].worksite}`;
            push(l, 'wait', start - l.t, `Wait for ${partnerOf(l.crew)} ${at}`, {
              ...(taskIndex === undefined ? {} : { taskIndex }),
            });
          }
          l.waitingAt = null;
        }
        continue;
      }
      // the earliest lane goes next (EV1 first on a tie); effects due by then are applied first
      const lane = ready.reduce((best, l) => (l.t < best.t ? l : best));
      if (lane.pc >= this.runnable(lane)) {
        this.stoppedOn = lane.crew;
        return;
      }
      this.applyUpTo(lane.t);
      const step = lane.steps[lane.pc++];
      this.run(lane, step);
    }
    this.applyUpTo(Infinity);
  }

  /** The day of the whole order (every task placed): the end-of-day checks and the timeline. */
  finish(): Timeline {
    const { plan, station } = this.ctx;
    const { lanes, ledger, warnings } = this;
    this.advance();
    if (CREW.some((m) => !lanes[m].closed || lanes[m].pc < lanes[m].steps.length))
      throw new Error('internal: the day is finished before every task is placed');
    // ── the end of the day ──────────────────────────────────────────────────────────────────────────
    const endSeconds = Math.max(lanes.EV1.t, lanes.EV2.t);
    const equipment = ledger.tracks(endSeconds);
    for (const track of equipment) {
      const item = ledger.item(track.item)!;
      const last = track.states[track.states.length - 1].where;
      if (last.kind === 'airlock' || item.leaveOutside) continue;
      warnings.push({
        code: 'left-outside',
        message: `${item.name} is ${describeWhere(last)} at the end of the day: bring it in, or mark it to stay outside for a later EVA`,
        item: item.key,
      });
    }

    const marginSeconds = plan.timeLimitSeconds - endSeconds;
    if (marginSeconds < 0) {
      warnings.push({
        code: 'over-time-limit',
        message: `The day ends at ${hm(endSeconds)} elapsed, ${hm(-marginSeconds)} past the ${hm(plan.timeLimitSeconds)} limit`,
      });
    }

    const orbitInput = {
      altitudeKm: station.orbit.altitudeKm,
      betaDeg: plan.betaDegOverride ?? station.orbit.betaDeg,
    };
    const summary = orbitSummary(orbitInput);
    const horizon = Math.max(plan.timeLimitSeconds, endSeconds);
    // a little past the horizon, so a task near the end can still be offered the next night
    const windows = dayNightWindows({
      ...orbitInput,
      phaseAtStartDeg: plan.orbitPhaseAtStartDeg,
      durationSeconds: horizon + 2 * summary.periodSeconds,
    });
    for (const e of [...this.eclipseTasks].sort((a, b) => a.index - b.index)) {
      if (isWithinNight(windows, e.start, e.end)) continue;
      warnings.push(eclipseWarning(this.tasks[e.index], e, windows, summary, orbitInput.betaDeg));
    }

    const shown = windows
      .filter((w) => w.start < horizon)
      .map((w) => ({ ...w, end: Math.min(w.end, horizon) }));
    return {
      crew: { EV1: summarise(lanes.EV1), EV2: summarise(lanes.EV2) },
      routes: this.routes,
      arms: this.arms.lanesOut(),
      equipment,
      reach: this.reach,
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
}

/** The egress as flown: its logged end, else as planned once passed, else no earlier than now. */
function flownEgress(planned: number, flown: DayFlown | undefined, m: CrewMember): number {
  if (!flown) return planned;
  const end = flown.egressEnd[m];
  if (end === null) return planned;
  return end ?? Math.max(planned, flown.now);
}

/** What a crew member was logged doing in a task; a task for both takes the partner's log when they have none. */
function flownWork(flown: DayFlown | undefined, task: DayTask, m: CrewMember): FlownWork | undefined {
  if (!flown || task.id === undefined) return undefined;
  const logged = flown.work[task.id];
  return logged?.[m] ?? (task.crew === 'both' ? logged?.[partnerOf(m)] : undefined);
}

/**
 * A block as flown, reached at `t`: planned (from `t`) without a flight; a step still ahead starts no
 * earlier than now; a logged start and end replace the planned ones (never before `t`), and a block
 * in progress ends no earlier than now.
 */
function flownSpan(
  t: number,
  seconds: number,
  flown: DayFlown | undefined,
  work: FlownWork | undefined,
): { start: number; end: number } {
  if (!flown) return { start: t, end: t + seconds };
  if (!work) {
    const start = Math.max(t, flown.now);
    return { start, end: start + seconds };
  }
  const start = Math.max(t, work.start ?? t);
  const planned = (work.start ?? start) + seconds;
  const end = work.end ?? (work.inProgress ? Math.max(planned, flown.now) : planned);
  return { start, end: Math.max(start, end) };
}

function push(
  lane: Lane,
  type: TimelineBlockType,
  seconds: number,
  label: string,
  extra: Partial<TimelineBlock> = {},
) {
  lay(lane, { type, start: lane.t, end: lane.t + seconds, label, ...extra });
}

/** Appends a block made by the caller (it starts at the lane's clock) and moves the clock to its end. */
function lay(lane: Lane, block: TimelineBlock) {
  lane.blocks.push(block);
  lane.t = block.end;
}

/**
 * Lays a route into the lane: translate blocks split at the tether swaps, one swap block per swap,
 * each translate with the tether state at its two ends. Their durations add up to the route's total.
 */
function layRoute(lane: Lane, route: RouteFeasible, routeIndex: number, taskIndex: number | undefined) {
  const { legs, swaps } = route;
  const perSwap = route.swapCount > 0 ? route.swapSeconds / route.swapCount : 0;
  const travel = route.totalSeconds - route.swapSeconds;
  const legSum = legs.reduce((s, l) => s + l.seconds, 0);
  const scale = legSum > 0 ? travel / legSum : 0;
  // blocks as literals of one shape each: a day lays thousands, and spreading the optional fields
  // into each was most of the day's time outside its routes
  let tether: TetherState = { ...tetherAtRouteStart(route) };
  let pieceStart = 0;
  let pieceSeconds = 0;
  let pieceM = 0;
  const flush = (legEnd: number) => {
    if (legEnd <= pieceStart) return;
    const from = legs[pieceStart].from;
    const to = legs[legEnd - 1].to;
    const atEnd = { anchor: tether.anchor, paidOutM: tether.paidOutM + pieceM };
    const block: TimelineBlock = {
      type: 'translate',
      start: lane.t,
      end: lane.t + pieceSeconds,
      label: `Translate ${from} → ${to}`,
      taskIndex,
      from,
      to,
      routeIndex,
      legStart: pieceStart,
      legEnd,
      tetherAtStart: tether,
      tetherAtEnd: atEnd,
    };
    if (taskIndex === undefined) delete block.taskIndex;
    lay(lane, block);
    tether = atEnd;
    pieceStart = legEnd;
    pieceSeconds = 0;
    pieceM = 0;
  };
  let s = 0;
  const swapsUpTo = (atM: number, legIndex: number) => {
    while (s < swaps.length && swaps[s].atM <= atM + ALONG_EPS_M) {
      flush(legIndex);
      const sw = swaps[s++];
      const block: TimelineBlock = {
        type: 'swap',
        start: lane.t,
        end: lane.t + perSwap,
        label: `Tether swap at ${sw.node}`,
        taskIndex,
        routeIndex,
        swapNode: sw.node,
        releaseNode: tether.anchor,
        paidOutM: sw.paidOutM,
      };
      if (taskIndex === undefined) delete block.taskIndex;
      lay(lane, block);
      tether = { anchor: sw.node, paidOutM: 0 };
    }
  };
  legs.forEach((leg, i) => {
    swapsUpTo(leg.startM, i);
    pieceSeconds += leg.seconds * scale;
    pieceM += leg.lengthM;
  });
  flush(legs.length);
  swapsUpTo(Infinity, legs.length);
}

function sumOf(blocks: TimelineBlock[], ...types: TimelineBlockType[]): number {
  return blocks.reduce((s, b) => (types.includes(b.type) ? s + (b.end - b.start) : s), 0);
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
    restraintSeconds: sumOf(lane.blocks, 'restraint-in', 'restraint-out'),
  };
}

/** The foot restraint's reach for one member's task; warnings when it is unusable or out of reach. */
function checkReach(
  station: DayStation,
  task: DayTask,
  i: number,
  m: CrewMember,
  socketKey: string,
  warnings: TimelineWarning[],
): ReachResult | null {
  const site = station.node(task.worksite);
  const socket = station.node(socketKey);
  const name = taskName(task, i);
  if (!socket) {
    warnings.push({
      code: 'unknown-socket',
      message: `${name}: the station has no socket "${socketKey}"`,
      taskIndex: i,
      crew: m,
    });
    return null;
  }
  if (!site || socket.kind !== 'socket' || !socket.normal) {
    warnings.push({
      code: 'socket-unusable',
      message: `${name}: ${!site ? `the station has no worksite "${task.worksite}"` : `"${socketKey}" is not a foot-restraint socket of the station`}`,
      taskIndex: i,
      crew: m,
    });
    return null;
  }
  const result = reachFrom(station, socketKey, socket.position, socket.normal, site.position);
  if (result.reachable) return result;
  const reachingSockets = station.sockets
    .map((s) => ({ key: s.key, r: reachFrom(station, s.key, s.position, s.normal, site.position) }))
    .filter((x) => x.r.reachable)
    .sort((a, b) => a.r.distanceM - b.r.distanceM)
    .map((x) => x.key);
  const others = reachingSockets.length
    ? `; ${reachingSockets.slice(0, 3).join(', ')} would reach it`
    : '; no socket of the station reaches it (run the socket planner)';
  warnings.push({
    code: 'socket-out-of-reach',
    message: `${name}: from socket ${socketKey} the worksite ${task.worksite} is ${(result.distanceM - result.radiusM).toFixed(2)} m beyond ${m}'s reach${others}`,
    taskIndex: i,
    crew: m,
    reachingSockets,
  });
  return result;
}

/** Reach from a socket to a target point with the station's reach settings. */
export function reachFrom(
  station: Pick<DayStation, 'settings'>,
  socket: string,
  position: Vec3,
  normal: Vec3,
  target: Vec3,
): ReachResult {
  const { reach } = station.settings;
  const check = reachCheck({
    socketPosition: position,
    socketNormal: normal,
    target,
    standOffM: reach.standOffM,
    radiusM: reach.radiusM,
    yawStepDeg: reach.yawStepDeg,
    pitchStepDeg: reach.pitchStepDeg,
  });
  const len = Math.hypot(...normal);
  const workPoint = position.map((p, k) => p + (normal[k] / len) * reach.standOffM) as Vec3;
  return { ...check, socket, workPoint, standOffM: reach.standOffM, radiusM: reach.radiusM };
}

function eclipseWarning(
  task: DayTask,
  e: { index: number; start: number; end: number },
  windows: OrbitWindow[],
  orbit: OrbitSummary,
  betaDeg: number,
): TimelineWarning {
  const base = `${taskName(task, e.index)} is eclipse-only but runs ${hm(e.start)}–${hm(e.end)} elapsed`;
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
