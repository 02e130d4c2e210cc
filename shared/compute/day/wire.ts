import type { CrewMember } from '../../schemas/plan';
import type { RouteFeasible, RouteLeg } from '../../schemas/route';
import type { CrewTimeline, TetherState, Timeline, TimelineBlock } from './types';
import { tetherAtRouteStart } from './types';

/**
 * The timeline as it travels over HTTP. A long day on a large station has hundreds of routes of
 * hundreds of legs each, and thousands of translate and swap blocks along them. On the wire:
 * - node keys are listed once (`keys`, in the order the routes first pass them), and a route's nodes
 *   are the differences between consecutive indices into that list (mostly 1: a route goes on to
 *   nodes not seen before);
 * - a leg is an index into `legTypes`, the day's distinct `[kind, metres, seconds]` (its ends are
 *   the route's consecutive nodes, its start the sum of the legs before it), metres to the millimetre
 *   and seconds to the hundredth;
 * - the translate and swap blocks a route lays in a lane are one `route` block: per swap a 0, per
 *   translate its last leg, its end time and the tether out at its end (the rest of each block is
 *   its route's: ends, labels, the swap's node and length, the tether at each start);
 * - a block leaves out its start when it is the end of the block before it.
 * toWire checks each route block against the blocks it stands for and keeps them as they are when
 * they differ in anything, so everything but the legs comes back exactly as computed: `fromWire`
 * gives back the timeline's shape.
 */
export type WireLeg = [kind: 0 | 1 | 2, lengthM: number, seconds: number];
export type WireRoute = Omit<RouteFeasible, 'legs' | 'nodes'> & { nodes: number[]; legs: number[] };
/** A route's translate and swap blocks in one lane, in order: 0 a swap; legEnd, end, paidOutM a translate. */
export interface WireRouteBlocks {
  type: 'route';
  routeIndex: number;
  taskIndex?: number;
  start?: number;
  pieces: number[];
}
export type WireBlock = (Omit<TimelineBlock, 'start'> & { start?: number }) | WireRouteBlocks;
export type WireCrew = Omit<CrewTimeline, 'blocks'> & { blocks: WireBlock[] };
export type WireTimeline<T extends Timeline = Timeline> = Omit<T, 'routes' | 'crew'> & {
  keys: string[];
  legTypes: WireLeg[];
  routes: WireRoute[];
  crew: Record<CrewMember, WireCrew>;
};

const KINDS: RouteLeg['kind'][] = ['handrail', 'hop', 'ride'];
const round = (v: number, step: number) => Math.round(v / step) * step;

/** Index of a value in a list kept in first-seen order. */
function indexer<T>(list: T[], id: (v: T) => string) {
  const index = new Map<string, number>();
  return (v: T) => {
    const k = id(v);
    let i = index.get(k);
    if (i === undefined) {
      i = list.length;
      index.set(k, i);
      list.push(v);
    }
    return i;
  };
}

export function toWire<T extends Timeline>(timeline: T): WireTimeline<T> {
  const keys: string[] = [];
  const legTypes: WireLeg[] = [];
  const keyIndex = indexer(keys, (k) => k);
  const legIndex = indexer(legTypes, (l) => l.join());
  const routes = timeline.routes.map((r): WireRoute => {
    let prev = 0;
    const nodes = r.nodes.map((key) => {
      const i = keyIndex(key);
      const d = i - prev;
      prev = i;
      return d;
    });
    const legs = r.legs.map((l) =>
      legIndex([
        KINDS.indexOf(l.kind) as 0 | 1 | 2,
        Number(round(l.lengthM, 1e-3).toFixed(3)),
        Number(round(l.seconds, 1e-2).toFixed(2)),
      ]),
    );
    return { ...r, nodes, legs };
  });
  const crew = {} as Record<CrewMember, WireCrew>;
  for (const m of Object.keys(timeline.crew) as CrewMember[]) {
    const lane = timeline.crew[m];
    crew[m] = { ...lane, blocks: blocksToWire(lane.blocks, timeline.routes) };
  }
  return { ...timeline, keys, legTypes, routes, crew };
}

const routeLaid = (b: TimelineBlock) =>
  (b.type === 'translate' || b.type === 'swap') && b.routeIndex !== undefined;

function blocksToWire(blocks: TimelineBlock[], routes: RouteFeasible[]): WireBlock[] {
  const out: WireBlock[] = [];
  let end: number | undefined;
  for (let i = 0; i < blocks.length;) {
    const b = blocks[i];
    const start = end !== undefined && Object.is(b.start, end) ? {} : { start: b.start };
    if (routeLaid(b)) {
      let j = i + 1;
      while (j < blocks.length && routeLaid(blocks[j]) && blocks[j].routeIndex === b.routeIndex) j++;
      const run = blocks.slice(i, j);
      const w: WireRouteBlocks = {
        type: 'route',
        routeIndex: b.routeIndex!,
        ...(b.taskIndex === undefined ? {} : { taskIndex: b.taskIndex }),
        ...start,
        pieces: run.flatMap((x) => (x.type === 'swap' ? [0] : [x.legEnd!, x.end, x.tetherAtEnd!.paidOutM])),
      };
      const back = routeBlocks(w, b.start, routes[w.routeIndex]);
      if (back && sameValue(back, run)) {
        out.push(w);
        end = run[run.length - 1].end;
        i = j;
        continue;
      }
    }
    const { start: _start, ...rest } = b;
    out.push({ ...rest, ...start });
    end = b.end;
    i++;
  }
  return out;
}

/** The translate and swap blocks a route block stands for, as layRoute lays them (null: it cannot). */
function routeBlocks(
  w: WireRouteBlocks,
  start: number,
  route: RouteFeasible | undefined,
): TimelineBlock[] | null {
  if (!route) return null;
  const { routeIndex, taskIndex, pieces } = w;
  const task = taskIndex === undefined ? {} : { taskIndex };
  const perSwap = route.swapCount > 0 ? route.swapSeconds / route.swapCount : 0;
  const blocks: TimelineBlock[] = [];
  let t = start;
  let tether: TetherState = { ...tetherAtRouteStart(route) };
  let legStart = 0;
  let swap = 0;
  for (let i = 0; i < pieces.length;) {
    if (pieces[i] === 0) {
      const sw = route.swaps[swap++];
      if (!sw) return null;
      blocks.push({
        type: 'swap',
        start: t,
        end: t + perSwap,
        label: `Tether swap at ${sw.node}`,
        ...task,
        routeIndex,
        swapNode: sw.node,
        releaseNode: tether.anchor,
        paidOutM: sw.paidOutM,
      });
      tether = { anchor: sw.node, paidOutM: 0 };
      i++;
    } else {
      const [legEnd, end, paidOutM] = pieces.slice(i, i + 3);
      const from = route.nodes[legStart];
      const to = route.nodes[legEnd];
      if (from === undefined || to === undefined) return null;
      const atEnd = { anchor: tether.anchor, paidOutM };
      blocks.push({
        type: 'translate',
        start: t,
        end,
        label: `Translate ${from} → ${to}`,
        ...task,
        from,
        to,
        routeIndex,
        legStart,
        legEnd,
        tetherAtStart: tether,
        tetherAtEnd: atEnd,
      });
      tether = atEnd;
      legStart = legEnd;
      i += 3;
    }
    t = blocks[blocks.length - 1].end;
  }
  return blocks;
}

/** Equal as the JSON they print to, numbers exactly (no key left out or added). */
function sameValue(a: unknown, b: unknown): boolean {
  if (typeof a !== 'object' || a === null || typeof b !== 'object' || b === null) return Object.is(a, b);
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  const ka = Object.keys(a).filter((k) => (a as Record<string, unknown>)[k] !== undefined);
  const kb = Object.keys(b).filter((k) => (b as Record<string, unknown>)[k] !== undefined);
  if (ka.length !== kb.length) return false;
  return ka.every((k) => sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

export function fromWire<T extends Timeline>(wire: WireTimeline<T>): T {
  const { keys, legTypes, ...rest } = wire;
  const routes = wire.routes.map((r): RouteFeasible => {
    let at = 0;
    const nodes = r.nodes.map((d) => keys[(at += d)]);
    let startM = 0;
    const legs = r.legs.map((id, i): RouteLeg => {
      const [kind, lengthM, seconds] = legTypes[id];
      const leg = { from: nodes[i], to: nodes[i + 1], kind: KINDS[kind], lengthM, seconds, startM };
      startM += lengthM;
      return leg;
    });
    return { ...r, nodes, legs };
  });
  const crew = {} as Record<CrewMember, CrewTimeline>;
  for (const m of Object.keys(wire.crew) as CrewMember[]) {
    const lane = wire.crew[m];
    const blocks: TimelineBlock[] = [];
    for (const w of lane.blocks) {
      const start = w.start ?? blocks[blocks.length - 1].end;
      if (w.type === 'route') blocks.push(...routeBlocks(w, start, routes[w.routeIndex])!);
      else blocks.push({ ...w, start });
    }
    crew[m] = { ...lane, blocks };
  }
  return { ...rest, routes, crew } as unknown as T;
}
