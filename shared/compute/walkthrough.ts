import type { RouteFeasible, TetherState } from '../schemas/route';
import type { CrewMember } from '../schemas/plan';
import type { Vec3 } from '../schemas/station';
import { describeAction, describeSwap } from './day/describe';
import {
  tetherAtRouteStart,
  type DayTask,
  type EquipmentTrack,
  type ItemState,
  type Timeline,
  type TimelineBlock,
  type TimelineBlockType,
} from './day/types';
import { formatElapsed } from './units';

/**
 * Training walkthroughs: the step list and the moving crew marker of a route or a whole plan, derived
 * only from the engine's results (a route from `findRoute`, a plan from `computeTimeline`), never
 * recomputed. A track is piecewise linear in time, so playback samples it each frame without
 * allocation-heavy work.
 */

/** A walkthrough step: one of the day's blocks, or the start and arrival of a route on its own. */
export type WalkStepType = TimelineBlockType | 'start' | 'arrive';

export interface WalkStep {
  /** stable within one derivation: `<crew>-<n>` or `r-<n>` */
  id: string;
  crew?: CrewMember;
  type: WalkStepType;
  start: number;
  end: number;
  title: string;
  detail: string;
  /** where the step happens (translate: where it ends) */
  nodeKey: string;
  fromKey?: string;
  /** translate: the nodes passed between `fromKey` and `nodeKey`, in walk order */
  via?: string[];
  lengthM?: number;
  /** swap: the new hook is clipped here … */
  clipKey?: string;
  /** … and the old one released here */
  releaseKey?: string;
  /** tether paid out at the end of the step (swap: just before it) */
  paidOutM: number;
  /** the attach point the crew member is clipped to during the step (swap: before it) */
  anchorKey: string;
  taskIndex?: number;
  socketKey?: string;
  /** what the crew member does with the manifest's items in this step, in cue-card words */
  equipment?: string[];
}

export interface TrackPiece {
  t0: number;
  t1: number;
  from: Vec3;
  to: Vec3;
  anchorKey: string;
  paid0: number;
  paid1: number;
}

export interface CrewTrack {
  crew?: CrewMember;
  steps: WalkStep[];
  pieces: TrackPiece[];
  endSeconds: number;
}

export interface TrackSample {
  position: Vec3;
  anchorKey: string;
  paidOutM: number;
  /** index into `steps` of the step under way at that time */
  stepIndex: number;
}

export type PositionOf = (key: string) => Vec3;

interface Builder {
  crew?: CrewMember;
  prefix: string;
  steps: WalkStep[];
  pieces: TrackPiece[];
  at: string;
  anchorKey: string;
  paid: number;
  position: PositionOf;
}

function addStep(b: Builder, step: Omit<WalkStep, 'id' | 'crew'>) {
  b.steps.push({ id: `${b.prefix}-${b.steps.length + 1}`, ...(b.crew ? { crew: b.crew } : {}), ...step });
}

function hold(b: Builder, t0: number, t1: number) {
  if (t1 <= t0) return;
  const p = b.position(b.at);
  b.pieces.push({ t0, t1, from: p, to: p, anchorKey: b.anchorKey, paid0: b.paid, paid1: b.paid });
}

const legWord = (kind: string) =>
  kind === 'ride' ? 'ride the arm' : kind === 'hop' ? 'hop' : 'along the handrail';

/**
 * Lays the legs `[legStart, legEnd)` of `route` over `[t0, t1]`, time shared by each leg's seconds,
 * starting from the tether state `tether` (where the engine says the crew member is clipped).
 */
function translate(
  b: Builder,
  route: RouteFeasible,
  legStart: number,
  legEnd: number,
  t0: number,
  t1: number,
  tether: TetherState,
  taskIndex?: number,
) {
  const legs = route.legs.slice(legStart, legEnd);
  if (legs.length === 0) return;
  b.anchorKey = tether.anchor;
  b.paid = tether.paidOutM;
  const total = legs.reduce((s, l) => s + l.seconds, 0);
  let t = t0;
  for (const leg of legs) {
    const dt = total > 0 ? ((t1 - t0) * leg.seconds) / total : (t1 - t0) / legs.length;
    const paid0 = b.paid;
    const paid1 = paid0 + leg.lengthM;
    b.pieces.push({
      t0: t,
      t1: t + dt,
      from: b.position(leg.from),
      to: b.position(leg.to),
      anchorKey: b.anchorKey,
      paid0,
      paid1,
    });
    t += dt;
    b.paid = paid1;
  }
  const first = legs[0];
  const last = legs[legs.length - 1];
  const lengthM = legs.reduce((s, l) => s + l.lengthM, 0);
  const kinds = [...new Set(legs.map((l) => legWord(l.kind)))].join(', then ');
  b.at = last.to;
  addStep(b, {
    type: 'translate',
    start: t0,
    end: t1,
    title: `Translate ${lengthM.toFixed(1)} m to ${last.to}`,
    detail: `From ${first.from} ${kinds} to ${last.to}, ${legs.length} leg${legs.length === 1 ? '' : 's'}; clipped at ${b.anchorKey}, ${b.paid.toFixed(1)} m of tether out on arrival.`,
    nodeKey: last.to,
    fromKey: first.from,
    ...(legs.length > 1 ? { via: legs.slice(0, -1).map((l) => l.to) } : {}),
    lengthM,
    paidOutM: b.paid,
    anchorKey: b.anchorKey,
    ...(taskIndex === undefined ? {} : { taskIndex }),
  });
}

function swap(b: Builder, node: string, paidBefore: number, t0: number, t1: number, taskIndex?: number) {
  const released = b.anchorKey;
  const words = describeSwap(node, released);
  hold(b, t0, t1);
  addStep(b, {
    type: 'swap',
    start: t0,
    end: t1,
    title: words.title,
    detail: `${words.instruction[0].toUpperCase()}${words.instruction.slice(1)} (${paidBefore.toFixed(1)} m paid out since ${released}; nothing out after).`,
    nodeKey: node,
    clipKey: node,
    releaseKey: released,
    paidOutM: paidBefore,
    anchorKey: released,
    ...(taskIndex === undefined ? {} : { taskIndex }),
  });
  b.anchorKey = node;
  b.paid = 0;
}

function newBuilder(
  start: string,
  tether: TetherState,
  position: PositionOf,
  prefix: string,
  crew?: CrewMember,
): Builder {
  return {
    crew,
    prefix,
    steps: [],
    pieces: [],
    at: start,
    anchorKey: tether.anchor,
    paid: tether.paidOutM,
    position,
  };
}

/** The route's steps in the order the crew member meets them, swaps placed where the engine put them. */
function routeBlocks(route: RouteFeasible) {
  const out: { type: 'translate' | 'swap'; legStart: number; legEnd: number; swap?: number }[] = [];
  let pieceStart = 0;
  let s = 0;
  const swapsUpTo = (atM: number, legIndex: number) => {
    while (s < route.swaps.length && route.swaps[s].atM <= atM + 1e-6) {
      if (legIndex > pieceStart) out.push({ type: 'translate', legStart: pieceStart, legEnd: legIndex });
      pieceStart = legIndex;
      out.push({ type: 'swap', legStart: legIndex, legEnd: legIndex, swap: s++ });
    }
  };
  route.legs.forEach((leg, i) => swapsUpTo(leg.startM, i));
  if (route.legs.length > pieceStart)
    out.push({ type: 'translate', legStart: pieceStart, legEnd: route.legs.length });
  swapsUpTo(Infinity, route.legs.length);
  return out;
}

/** A single route rehearsed on its own: start clipped, translate, swap, …, arrive. */
export function routeWalkthrough(route: RouteFeasible, position: PositionOf): CrewTrack {
  const start = route.nodes[0];
  const tether = tetherAtRouteStart(route);
  const b = newBuilder(start, tether, position, 'r');
  addStep(b, {
    type: 'start',
    start: 0,
    end: 0,
    title: `Start at ${start}`,
    detail: `Clipped at ${tether.anchor}${tether.paidOutM > 0 ? ` with ${tether.paidOutM.toFixed(1)} m out` : ''}; tether ${route.tetherLengthM.toFixed(1)} m.`,
    nodeKey: start,
    paidOutM: tether.paidOutM,
    anchorKey: tether.anchor,
  });
  const perSwap = route.swapCount > 0 ? route.swapSeconds / route.swapCount : 0;
  const travel = route.totalSeconds - route.swapSeconds;
  const legSum = route.legs.reduce((s, l) => s + l.seconds, 0);
  const scale = legSum > 0 ? travel / legSum : 0;
  let t = 0;
  for (const block of routeBlocks(route)) {
    if (block.type === 'translate') {
      const seconds =
        route.legs.slice(block.legStart, block.legEnd).reduce((s, l) => s + l.seconds, 0) * scale;
      translate(b, route, block.legStart, block.legEnd, t, t + seconds, {
        anchor: b.anchorKey,
        paidOutM: b.paid,
      });
      t += seconds;
    } else {
      const sw = route.swaps[block.swap!];
      swap(b, sw.node, sw.paidOutM, t, t + perSwap);
      t += perSwap;
    }
  }
  const end = route.nodes[route.nodes.length - 1];
  addStep(b, {
    type: 'arrive',
    start: t,
    end: t,
    title: `Arrive at ${end}`,
    detail: `${route.lengthM.toFixed(1)} m, ${route.swapCount} tether swap${route.swapCount === 1 ? '' : 's'}, ${formatElapsed(route.totalSeconds)} in all.`,
    nodeKey: end,
    paidOutM: b.paid,
    anchorKey: b.anchorKey,
  });
  return { steps: b.steps, pieces: b.pieces, endSeconds: t };
}

/** What the walkthrough reads of a plan's task: where it is, and what it does with items. */
export type WalkthroughTask = Pick<DayTask, 'title' | 'worksite'> &
  Partial<Pick<DayTask, 'crew' | 'socket' | 'sockets' | 'actions' | 'tools'>>;

type DayOfWalk = Pick<Timeline, 'crew' | 'routes' | 'endSeconds'> & Partial<Pick<Timeline, 'equipment'>>;

/**
 * Both crew members' tracks for a whole plan, on the shared EVA elapsed-time clock of the timeline:
 * every position, tether state, restraint and item comes from the timeline's blocks and equipment
 * tracks, nothing is recomputed.
 */
export function planWalkthrough(
  timeline: DayOfWalk,
  tasks: readonly WalkthroughTask[],
  airlockKey: string,
  position: PositionOf,
): { crews: Record<CrewMember, CrewTrack>; endSeconds: number } {
  const equipment = timeline.equipment ?? [];
  const build = (crew: CrewMember): CrewTrack => {
    const b = newBuilder(airlockKey, { anchor: airlockKey, paidOutM: 0 }, position, crew, crew);
    for (const block of timeline.crew[crew].blocks) addBlock(b, block, timeline.routes, tasks, equipment);
    return { crew, steps: b.steps, pieces: b.pieces, endSeconds: timeline.crew[crew].totalSeconds };
  };
  return { crews: { EV1: build('EV1'), EV2: build('EV2') }, endSeconds: timeline.endSeconds };
}

const other = (m: CrewMember): CrewMember => (m === 'EV1' ? 'EV2' : 'EV1');
const names = (list: readonly string[]) => list.join(', ');

/** The task's item actions that concern `crew` (theirs, and a hand-over to them), in cue-card words. */
function taskEquipment(
  task: WalkthroughTask | undefined,
  crew: CrewMember,
  equipment: readonly EquipmentTrack[],
): string[] {
  if (!task?.crew) return [];
  const items = equipment.map((e) => ({ key: e.item, name: e.name, kind: e.kind }));
  const lines: string[] = [];
  for (const a of task.actions ?? []) {
    const by = a.by ?? (task.crew === 'both' ? 'EV1' : task.crew);
    if (by !== crew && !(a.do === 'hand-over' && other(by) === crew)) continue;
    lines.push(describeAction({ ...task, crew: task.crew }, a, items));
  }
  const tools = (task.tools ?? []).map((t) => items.find((m) => m.key === t)?.name ?? t);
  if (tools.length) lines.unshift(`Needs at hand: ${names(tools)}`);
  return lines;
}

/** The items `crew` holds just before `t` (or at the day's start, for t = 0). */
function heldBefore(equipment: readonly EquipmentTrack[], crew: CrewMember, t: number): string[] {
  const out: string[] = [];
  for (const e of equipment) {
    const s = e.states[t <= 0 ? 0 : stateIndexAt(e, t - 1e-6)];
    if (s?.where.kind === 'carried' && s.where.crew === crew) out.push(e.name);
  }
  return out;
}

function addBlock(
  b: Builder,
  block: TimelineBlock,
  routes: readonly RouteFeasible[],
  tasks: readonly WalkthroughTask[],
  equipment: readonly EquipmentTrack[],
) {
  const tag = block.taskIndex === undefined ? {} : { taskIndex: block.taskIndex };
  const route = block.routeIndex === undefined ? undefined : routes[block.routeIndex];
  switch (block.type) {
    case 'translate':
      if (route && block.legStart !== undefined && block.legEnd !== undefined && block.tetherAtStart) {
        translate(
          b,
          route,
          block.legStart,
          block.legEnd,
          block.start,
          block.end,
          block.tetherAtStart,
          block.taskIndex,
        );
      } else hold(b, block.start, block.end);
      return;
    case 'swap':
      if (block.swapNode) {
        swap(b, block.swapNode, block.paidOutM ?? b.paid, block.start, block.end, block.taskIndex);
      } else hold(b, block.start, block.end);
      return;
    case 'arm-ride': {
      // the arm carries the rider in a straight line, then settles
      const from = b.at;
      const to = block.to ?? b.at;
      const arrive = Math.min(block.end, Math.max(block.start, block.travelEnd ?? block.end));
      if (arrive > block.start)
        b.pieces.push({
          t0: block.start,
          t1: arrive,
          from: b.position(from),
          to: b.position(to),
          anchorKey: b.anchorKey,
          paid0: b.paid,
          paid1: b.paid,
        });
      b.at = to;
      hold(b, arrive, block.end);
      addStep(b, {
        type: 'arm-ride',
        start: block.start,
        end: block.end,
        title: block.label,
        detail: `${block.label}: ${from} to ${to}, ${formatElapsed(block.end - block.start)}; tethered to the arm.`,
        nodeKey: to,
        fromKey: from,
        paidOutM: b.paid,
        anchorKey: b.anchorKey,
        ...tag,
      });
      return;
    }
    case 'restraint-in':
    case 'restraint-out': {
      const socket = block.socket ?? '';
      const into = block.type === 'restraint-in';
      const angles =
        into && block.yawSetDeg !== undefined
          ? ` Set yaw ${block.yawSetDeg}°, pitch ${block.pitchSetDeg}°.`
          : '';
      hold(b, block.start, block.end);
      // getting on an arm tethers to it; getting off clips back to the station where they are
      if (block.arm && block.tetherAtEnd) {
        if (block.to) b.at = block.to;
        b.anchorKey = block.tetherAtEnd.anchor;
        b.paid = block.tetherAtEnd.paidOutM;
      }
      addStep(b, {
        type: block.type,
        start: block.start,
        end: block.end,
        title: block.label,
        detail: block.arm
          ? `${block.label}.`
          : into
            ? `Get into the foot restraint on socket ${socket}.${angles}`
            : `Get out of the foot restraint on socket ${socket}.`,
        nodeKey: b.at,
        socketKey: socket,
        paidOutM: b.paid,
        anchorKey: b.anchorKey,
        ...tag,
      });
      return;
    }
    case 'work': {
      const task = block.taskIndex === undefined ? undefined : tasks[block.taskIndex];
      const lines = b.crew ? taskEquipment(task, b.crew, equipment) : [];
      hold(b, block.start, block.end);
      addStep(b, {
        type: 'work',
        start: block.start,
        end: block.end,
        title: block.label,
        detail: `${block.unreached ? 'Not reachable as planned (see the plan warnings). ' : ''}Work at ${task?.worksite ?? b.at}${block.socket ? ` from the restraint on ${block.socket}` : ''} for ${formatElapsed(block.end - block.start)}; clipped at ${b.anchorKey}, ${b.paid.toFixed(1)} m out.`,
        nodeKey: task?.worksite ?? b.at,
        paidOutM: b.paid,
        anchorKey: b.anchorKey,
        ...(block.socket ? { socketKey: block.socket } : {}),
        ...(lines.length ? { equipment: lines } : {}),
        ...tag,
      });
      return;
    }
    default: {
      // egress: what the crew member carries out; ingress: what they bring back in
      const held =
        !b.crew || (block.type !== 'egress' && block.type !== 'ingress')
          ? []
          : heldBefore(equipment, b.crew, block.type === 'egress' ? 0 : block.start);
      const lines = held.length
        ? [`${b.crew} ${block.type === 'egress' ? 'carries out' : 'brings in'} ${names(held)}`]
        : [];
      hold(b, block.start, block.end);
      addStep(b, {
        type: block.type,
        start: block.start,
        end: block.end,
        title: block.label,
        detail: `${block.label} at ${b.at}, ${formatElapsed(block.end - block.start)}.`,
        nodeKey: b.at,
        paidOutM: b.paid,
        anchorKey: b.anchorKey,
        ...(lines.length ? { equipment: lines } : {}),
        ...tag,
      });
    }
  }
}

/** The tether during a step, in cue-card words (a swap: before and after it). */
export function tetherLine(step: WalkStep): string {
  if (step.type === 'swap' && step.clipKey) {
    return step.clipKey === step.releaseKey
      ? `Tether: ${step.paidOutM.toFixed(1)} m out from ${step.anchorKey}; re-clipped there, nothing out after`
      : `Tether: ${step.paidOutM.toFixed(1)} m out from ${step.anchorKey}; clipped at ${step.clipKey} after, nothing out`;
  }
  return `Tether: clipped at ${step.anchorKey}, ${step.paidOutM.toFixed(1)} m out`;
}

/** Index of the item's state at `t` (the later one at a boundary); its states tile the day. */
export function stateIndexAt(track: Pick<EquipmentTrack, 'states'>, t: number): number {
  const states = track.states;
  let lo = 0;
  let hi = states.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (states[mid].start <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Where the item is at `t`. */
export function itemStateAt(track: Pick<EquipmentTrack, 'states'>, t: number): ItemState {
  return track.states[stateIndexAt(track, t)];
}

/** Where the crew member is at time `t`, which attach point holds them and how much tether is out. */
export function sampleTrack(track: CrewTrack, t: number): TrackSample {
  const pieces = track.pieces;
  const stepIndex = stepAt(track.steps, t);
  if (pieces.length === 0) {
    const s = track.steps[Math.max(0, stepIndex)];
    return { position: [0, 0, 0], anchorKey: s?.anchorKey ?? '', paidOutM: 0, stepIndex };
  }
  let lo = 0;
  let hi = pieces.length - 1;
  if (t <= pieces[0].t0) hi = 0;
  else if (t >= pieces[hi].t1) lo = hi;
  else {
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (pieces[mid].t0 <= t) lo = mid;
      else hi = mid - 1;
    }
  }
  const p = pieces[lo];
  const f = p.t1 > p.t0 ? Math.min(1, Math.max(0, (t - p.t0) / (p.t1 - p.t0))) : 1;
  return {
    position: [
      p.from[0] + (p.to[0] - p.from[0]) * f,
      p.from[1] + (p.to[1] - p.from[1]) * f,
      p.from[2] + (p.to[2] - p.from[2]) * f,
    ],
    anchorKey: p.anchorKey,
    paidOutM: p.paid0 + (p.paid1 - p.paid0) * f,
    stepIndex,
  };
}

/** The step under way at `t`: the last one that has started (instant steps count at their time). */
export function stepAt(steps: readonly WalkStep[], t: number): number {
  let found = steps.length ? 0 : -1;
  for (let i = 0; i < steps.length; i++) if (steps[i].start <= t + 1e-9) found = i;
  return found;
}
