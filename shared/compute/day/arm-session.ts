import type { CrewMember } from '../../schemas/plan';
import type { Vec3 } from '../../schemas/station';
import { armPathKeepOuts, armShellCheck, armTipMoveSeconds } from '../arm';
import { formatElapsed } from '../units';
import type { ItemLedger } from './items';
import type {
  ArmBlock,
  ArmLane,
  ArmSession,
  DayArm,
  DayPlan,
  DayStation,
  DayTask,
  TetherState,
  TimelineBlock,
  TimelineBlockType,
  TimelineWarning,
} from './types';

/**
 * Arm sessions in the day. Consecutive arm tasks of one crew member on one arm form a session: they
 * translate to the first task's `ingress` (by handrail, a route like any other), get onto the foot
 * restraint on the arm's end (tethered to the arm from then on), the arm moves the tip to each task's
 * worksite in a straight line (distance / tip speed + settle), they work there, the arm brings them
 * to the last task's `egress` (default: its ingress), they get off and clip to the station there.
 *
 * An arm carries one rider at a time: a crew member who comes to an arm someone else is riding waits
 * until that session ends (`arm-busy`, a wait block). Between sessions the arm moves its tip empty to
 * the next ingress, timed to be there when the rider arrives, and no earlier than it is free.
 */

/** Who rides the arm in a task: its crew member, or in a task for both `arm.rider` (EV1 by default). */
export function riderOf(task: Pick<DayTask, 'crew' | 'arm'>): CrewMember | undefined {
  if (!task.arm) return undefined;
  return task.crew === 'both' ? (task.arm.rider ?? 'EV1') : task.crew;
}

/**
 * Whether task `i` is an arm task that `m` rides, and whether it opens or closes a session: the
 * tasks `m` does, in plan order, on the same arm one after another form one session.
 */
export function armRole(
  tasks: readonly Pick<DayTask, 'crew' | 'arm'>[],
  m: CrewMember,
  i: number,
): { first: boolean; last: boolean } | null {
  const task = tasks[i];
  if (riderOf(task) !== m) return null;
  const mine = (j: number) => tasks[j].crew === m || tasks[j].crew === 'both';
  const neighbour = (step: 1 | -1) => {
    for (let j = i + step; j >= 0 && j < tasks.length; j += step) if (mine(j)) return j;
    return undefined;
  };
  const sameSession = (j: number | undefined) =>
    j !== undefined && riderOf(tasks[j]) === m && tasks[j].arm!.key === task.arm!.key;
  return { first: !sameSession(neighbour(-1)), last: !sameSession(neighbour(1)) };
}

/** The node a crew member translates to before a task: an arm session's ingress when it opens one. */
export function armIngressOf(
  tasks: readonly Pick<DayTask, 'crew' | 'arm'>[],
  m: CrewMember,
  i: number,
): string | undefined {
  return armRole(tasks, m, i)?.first ? tasks[i].arm!.ingress : undefined;
}

/** What the arm sessions need of a crew lane. */
export interface RiderLane {
  crew: CrewMember;
  t: number;
  at: string;
  tether: TetherState;
  reached: boolean;
  pc: number;
  waitingAt: string | null;
}

export interface ArmDeskContext<L extends RiderLane> {
  plan: DayPlan;
  station: DayStation;
  ledger: ItemLedger;
  warnings: TimelineWarning[];
  restraintSeconds: number;
  lanes: Record<CrewMember, L>;
  push(
    lane: L,
    type: TimelineBlockType,
    seconds: number,
    label: string,
    extra?: Partial<TimelineBlock>,
  ): void;
  /** an attach point now: the station's, or a node with a portable anchor installed */
  isAttachNow(key: string): boolean;
  taskName(i: number): string;
}

interface ArmState {
  arm: DayArm;
  tip: Vec3 | null;
  tipAt: string | null;
  startPoint: Vec3 | null;
  holder: CrewMember | null;
  /** the end of the last session or empty move */
  freeAt: number;
  blocks: ArmBlock[];
  sessions: ArmSession[];
  used: boolean;
}

interface Riding {
  state: ArmState | null;
  session: ArmSession | null;
}

const hm = formatElapsed;
const WAIT_PREFIX = 'arm:';

export class ArmDesk<L extends RiderLane> {
  private readonly arms = new Map<string, ArmState>();
  private readonly riding: Partial<Record<CrewMember, Riding>> = {};
  /** crew members who gave up waiting for an arm (its rider waits for them): their session is off */
  private readonly refused = new Set<CrewMember>();
  /** the task a crew member waiting for an arm will do on it */
  private readonly waitingFor = new Map<CrewMember, number>();

  constructor(private readonly ctx: ArmDeskContext<L>) {
    for (const arm of ctx.station.arms ?? []) {
      this.arms.set(arm.key, {
        arm,
        tip: null,
        tipAt: null,
        startPoint: null,
        holder: null,
        freeAt: 0,
        blocks: [],
        sessions: [],
        used: false,
      });
    }
  }

  has(key: string): boolean {
    return this.arms.has(key);
  }

  /** Gets onto the arm at the session's ingress (the lane has translated there), or waits for it. */
  board(lane: L, i: number): void {
    const { ctx } = this;
    const task = ctx.plan.tasks[i];
    const m = lane.crew;
    const key = task.arm!.key;
    const state = this.arms.get(key);
    const ref = { taskIndex: i, crew: m, arm: key };
    if (!state) {
      ctx.warnings.push({
        code: 'unknown-arm',
        message: `${ctx.taskName(i)}: the station has no arm "${key}"`,
        ...ref,
      });
      this.riding[m] = { state: null, session: null };
      lane.reached = false;
      return;
    }
    if (!lane.reached || this.refused.has(m)) {
      if (this.refused.delete(m)) {
        const holder = state.holder!;
        ctx.warnings.push({
          code: 'arm-busy',
          message: `${ctx.taskName(i)}: ${key} carries one rider at a time, and ${holder} stays on it until after a task that waits for ${m}; ${m} cannot get on`,
          ...ref,
        });
      }
      this.riding[m] = { state: null, session: null };
      lane.reached = false;
      return;
    }
    if (state.holder !== null && state.holder !== m) {
      lane.waitingAt = WAIT_PREFIX + key;
      lane.pc--;
      this.waitingFor.set(m, i);
      return;
    }
    const last = state.sessions[state.sessions.length - 1];
    if (last && state.freeAt > lane.t) {
      // the last rider gets off later than this one arrives (their leaving is laid out in one step)
      this.waitForArm(lane, i, state, last.rider);
    }
    const ingress = task.arm!.ingress;
    const point = ctx.station.node(ingress)!.position;
    this.checkShell(state, point, ingress, i, m);
    if (state.tip === null) {
      state.tip = point;
      state.tipAt = ingress;
      state.startPoint = point;
    } else {
      const seconds = armTipMoveSeconds(state.arm, state.tip, point);
      if (seconds > 0) {
        const start = Math.max(state.freeAt, lane.t - seconds);
        this.move(state, ingress, point, start, undefined, i);
        if (start + seconds > lane.t)
          ctx.push(lane, 'wait', start + seconds - lane.t, `Wait for ${key} to come to ${ingress}`, {
            taskIndex: i,
            arm: key,
          });
      }
    }
    if (ctx.ledger.installedAt(key, 'foot-restraint').length === 0) {
      ctx.warnings.push({
        code: 'restraint-missing',
        message: `${ctx.taskName(i)}: no foot restraint is installed on the end of ${key} when ${m} gets on at ${hm(lane.t)}`,
        ...ref,
      });
    }
    const session: ArmSession = {
      rider: m,
      start: lane.t,
      end: lane.t,
      ingress,
      egress: ingress,
      taskIndexes: [],
    };
    const onArm: TetherState = { anchor: key, paidOutM: 0 };
    ctx.push(
      lane,
      'restraint-in',
      ctx.restraintSeconds,
      `Onto ${key}'s foot restraint at ${ingress}, tether to the arm`,
      {
        taskIndex: i,
        arm: key,
        to: ingress,
        tetherAtStart: lane.tether,
        tetherAtEnd: onArm,
      },
    );
    lane.tether = onArm;
    lane.at = ingress;
    state.holder = m;
    state.used = true;
    this.riding[m] = { state, session };
  }

  /** The arm moves the rider to the task's worksite. */
  ride(lane: L, i: number): void {
    const { ctx } = this;
    const riding = this.riding[lane.crew];
    const task = ctx.plan.tasks[i];
    const site = ctx.station.node(task.worksite);
    if (!riding?.state || !riding.session || !site) {
      lane.reached = false;
      return;
    }
    lane.reached = true;
    riding.session.taskIndexes.push(i);
    this.carry(
      lane,
      riding.state,
      task.worksite,
      site.position,
      i,
      `${riding.state.arm.key} moves ${lane.crew} to ${task.worksite}`,
    );
  }

  /** The arm brings the rider to the session's egress; they get off and clip to the station there. */
  leave(lane: L, i: number): void {
    const { ctx } = this;
    const m = lane.crew;
    const riding = this.riding[m];
    delete this.riding[m];
    if (!riding?.state || !riding.session) return;
    const { state, session } = riding;
    const key = state.arm.key;
    const arm = ctx.plan.tasks[i].arm!;
    const egress = arm.egress ?? arm.ingress;
    const node = ctx.station.node(egress);
    if (node) this.carry(lane, state, egress, node.position, i, `${key} brings ${m} to ${egress}`);
    const clip: TetherState = { anchor: egress, paidOutM: 0 };
    ctx.push(lane, 'restraint-out', ctx.restraintSeconds, `Off ${key} at ${egress}, clip to the station`, {
      taskIndex: i,
      arm: key,
      to: egress,
      tetherAtStart: lane.tether,
      tetherAtEnd: clip,
    });
    if (!ctx.isAttachNow(egress)) {
      ctx.warnings.push({
        code: 'arm-egress-not-attach',
        message: `${ctx.taskName(i)}: ${m} gets off ${key} at ${egress}, which is not an attach point, so there is nothing on the station to clip the tether to`,
        taskIndex: i,
        crew: m,
        arm: key,
      });
    }
    lane.tether = clip;
    lane.at = egress;
    session.egress = egress;
    session.end = lane.t;
    state.sessions.push(session);
    state.holder = null;
    state.freeAt = Math.max(state.freeAt, lane.t);
    for (const other of Object.values(this.ctx.lanes)) {
      if (other.waitingAt !== WAIT_PREFIX + key) continue;
      const j = this.waitingFor.get(other.crew)!;
      this.waitingFor.delete(other.crew);
      if (lane.t > other.t) this.waitForArm(other, j, state, m);
      other.waitingAt = null;
    }
  }

  /** A wait, until the arm is free, of a crew member who came to it while `rider` was on it. */
  private waitForArm(lane: L, i: number, state: ArmState, rider: CrewMember) {
    const key = state.arm.key;
    const until = state.freeAt;
    this.ctx.warnings.push({
      code: 'arm-busy',
      message: `${this.ctx.taskName(i)}: ${lane.crew} waits ${hm(lane.t)}–${hm(until)} for ${key}, which ${rider} rides until then (one rider at a time)`,
      taskIndex: i,
      crew: lane.crew,
      arm: key,
    });
    this.ctx.push(lane, 'wait', until - lane.t, `Wait for ${key}: ${rider} rides it until ${hm(until)}`, {
      taskIndex: i,
      arm: key,
    });
  }

  /**
   * Both lanes are held: one waits for an arm whose rider waits (at a task for both) for them. The
   * one waiting for the arm gives up that session (warned), so the day goes on.
   */
  breakDeadlock(active: readonly L[]): boolean {
    const waiting = active.find((l) => l.waitingAt?.startsWith(WAIT_PREFIX));
    if (!waiting) return false;
    waiting.waitingAt = null;
    this.waitingFor.delete(waiting.crew);
    this.refused.add(waiting.crew);
    return true;
  }

  /** The lanes of the arms the day used. */
  lanesOut(): ArmLane[] {
    return [...this.arms.values()]
      .filter((s) => s.used)
      .map((s) => ({
        key: s.arm.key,
        ...(s.arm.label ? { label: s.arm.label } : {}),
        base: s.arm.base,
        reachM: s.arm.reachM,
        ...(s.arm.minReachM !== undefined ? { minReachM: s.arm.minReachM } : {}),
        startPoint: s.startPoint,
        blocks: s.blocks,
        sessions: s.sessions,
      }));
  }

  private carry(lane: L, state: ArmState, to: string, point: Vec3, i: number, label: string) {
    this.checkShell(state, point, to, i, lane.crew);
    const seconds = armTipMoveSeconds(state.arm, state.tip!, point);
    if (seconds === 0) return;
    this.move(state, to, point, lane.t, lane.crew, i);
    this.ctx.push(lane, 'arm-ride', seconds, label, {
      taskIndex: i,
      arm: state.arm.key,
      from: lane.at,
      to,
      travelEnd: lane.t + seconds - state.arm.settleSeconds,
    });
    lane.at = to;
  }

  private move(
    state: ArmState,
    to: string,
    point: Vec3,
    start: number,
    rider: CrewMember | undefined,
    i: number,
  ) {
    const { arm } = state;
    const from = state.tip!;
    const seconds = armTipMoveSeconds(arm, from, point);
    const blocked = armPathKeepOuts(from, point, this.ctx.station.keepOut ?? []);
    if (blocked.length) {
      this.ctx.warnings.push({
        code: 'arm-path-keep-out',
        message: `${this.ctx.taskName(i)}: ${arm.key}'s tip would pass through keep-out volume${blocked.length > 1 ? 's' : ''} ${blocked.join(', ')} on its straight way from ${state.tipAt} to ${to}`,
        taskIndex: i,
        ...(rider ? { crew: rider } : {}),
        arm: arm.key,
      });
    }
    state.blocks.push({
      type: 'arm-move',
      start,
      end: start + seconds,
      travelEnd: start + seconds - arm.settleSeconds,
      label: rider ? `${arm.key} moves ${rider} to ${to}` : `${arm.key} moves to ${to}`,
      from: state.tipAt!,
      to,
      fromPoint: from,
      toPoint: point,
      ...(rider ? { rider } : {}),
      taskIndex: i,
    });
    state.tip = point;
    state.tipAt = to;
  }

  private checkShell(state: ArmState, point: Vec3, at: string, i: number, m: CrewMember) {
    const { arm } = state;
    const shell = armShellCheck(arm, arm.base, point);
    if (shell.within) return;
    const side =
      shell.side === 'beyond'
        ? `${shell.outsideByM.toFixed(2)} m beyond its ${arm.reachM} m reach`
        : `${shell.outsideByM.toFixed(2)} m inside its ${arm.minReachM} m minimum reach`;
    this.ctx.warnings.push({
      code: 'arm-out-of-reach',
      message: `${this.ctx.taskName(i)}: ${at} is ${shell.distanceM.toFixed(2)} m from ${arm.key}'s base ${arm.baseNode}, ${side}`,
      taskIndex: i,
      crew: m,
      arm: arm.key,
    });
  }
}
