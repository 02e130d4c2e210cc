import type {
  RouteFeasible,
  RouteInfeasible,
  RouteLeg,
  RouteMode,
  RouteRequest,
  RouteResult,
} from '../schemas/route';
import type { StationSettings } from '../schemas/station';
import {
  EDGE_CLOSED,
  EDGE_KEEP_OUT,
  EDGE_RIDE,
  arcSecondsFor,
  edgeKindName,
  type CompiledStation,
} from './compiled-station';
import { clipSearch, hasClipGraph } from './routes-clip';
import { arcSource, dijkstraPath, fastestPath, fitsTether, labelSearch, reachable } from './routes-search';
import { placeSwapsGreedy } from './tether';

export { hasNodeKey } from './compiled-station';

/** Arcs excluded for a request: closed, through keep-out, and arm rides unless allowed. */
export function excludeMaskFor(allowRide: boolean | undefined): number {
  return EDGE_CLOSED | EDGE_KEEP_OUT | (allowRide ? 0 : EDGE_RIDE);
}

interface Query {
  c: CompiledStation;
  settings: StationSettings;
  mode: RouteMode;
  s: number;
  t: number;
  tether: number;
  factor: number;
  mask: number;
  weights: Float64Array;
  landmarkTimesValid: boolean;
  strategy: RouteStrategy;
  clipBuildFreeNodes: number;
}

/**
 * How the engine searches. `clip-graph` answers the exact modes on the per-tether clip graph and
 * the plain fastest path by A*; `label-search` runs the label-setting search over (node, paid out)
 * and plain Dijkstra. Both are exact; each is the other's independent check. `auto` (the default)
 * uses the clip graph where building it is cheap or it is already built, else the label search.
 */
export type RouteStrategy = 'auto' | 'clip-graph' | 'label-search';

export interface FindRouteOptions {
  strategy?: RouteStrategy;
  /** `auto` builds a missing clip graph during the query only up to this many nodes */
  clipBuildFreeNodes?: number;
}

function maxSpeed(settings: StationSettings): number {
  return Math.max(settings.speedsMps.handrail, settings.speedsMps.hop, settings.speedsMps.ride);
}

/**
 * Building a clip graph grows faster than the station: about 0.2 s at 1k nodes, 1.2 s at 5k, 4 s at
 * 10k and about a minute at 100k (bench/routes.bench.ts), while the label search answers a 10k-node
 * query in about 1 ms (p95 15–20 ms). Above this size `auto` uses the label search unless a clip
 * graph for the query's tether is already built, so no query waits seconds for one (the server
 * builds it in a builder thread meanwhile).
 */
export const CLIP_BUILD_FREE_NODES = 2_000;

/** `auto` on a station too large to build a clip graph during a query, none built yet for these terms. */
function clipGraphMissing(
  c: CompiledStation,
  limitNodes: number,
  weights: Float64Array,
  tether: number,
  mask: number,
): boolean {
  return c.nodeCount > limitNodes && !hasClipGraph(weights, tether, mask);
}

function useClipGraph(q: Query): boolean {
  if (q.strategy === 'label-search') return false;
  if (q.strategy === 'clip-graph') return true;
  return !clipGraphMissing(q.c, q.clipBuildFreeNodes, q.weights, q.tether, q.mask);
}

/**
 * Whether `auto` would answer this request with the label search for want of a clip graph: the
 * cue for a caller to build one off the request path (buildClipGraphParts) and adopt it.
 */
export function wantsClipGraph(
  c: CompiledStation,
  settings: StationSettings,
  request: RouteRequest,
  options: FindRouteOptions = {},
) {
  if ((options.strategy ?? 'auto') !== 'auto') return null;
  const { tether, mask, arcSeconds } = searchTerms(c, settings, request);
  const missing = clipGraphMissing(
    c,
    options.clipBuildFreeNodes ?? CLIP_BUILD_FREE_NODES,
    arcSeconds,
    tether,
    mask,
  );
  return missing ? { tetherLengthM: tether, excludeMask: mask, weights: arcSeconds } : null;
}

/** What a request searches with: tether, excluded arcs, arc times and whether the landmark times hold. */
function searchTerms(c: CompiledStation, settings: StationSettings, request: RouteRequest) {
  return {
    tether: request.tetherLengthM ?? settings.tetherLengthM,
    mask: excludeMaskFor(request.allowRide),
    ...arcSecondsFor(c, settings),
  };
}

function search(q: Query, objective: 'sum' | 'lex', swapCost: number) {
  return (useClipGraph(q) ? clipSearch : labelSearch)(q.c, q.s, q.t, {
    objective,
    swapCost,
    weights: q.weights,
    secondsFactor: q.factor,
    tetherLengthM: q.tether,
    excludeMask: q.mask,
    landmarkTimesValid: q.landmarkTimesValid,
    maxSpeedMps: maxSpeed(q.settings),
  });
}

const fmt = (m: number) => `${Math.round(m * 100) / 100} m`;

function buildRoute(q: Query, arcs: number[], extraWarnings: string[]): RouteResult {
  const { c } = q;
  const nodes = [q.s];
  const legs: RouteLeg[] = [];
  const lengths: number[] = [];
  const caution = new Set<string>();
  let pos = 0;
  let travel = 0;
  for (const a of arcs) {
    const from = nodes[nodes.length - 1];
    const to = c.targets[a];
    const e = c.arcEdge[a];
    const lengthM = c.edgeLengthM[e];
    const seconds = q.weights[a] * q.factor;
    legs.push({
      from: c.keys[from],
      to: c.keys[to],
      kind: edgeKindName(c.edgeKind[e]),
      lengthM,
      seconds,
      startM: pos,
    });
    for (const h of c.cautionByEdge.get(e) ?? []) caution.add(h);
    lengths.push(lengthM);
    nodes.push(to);
    pos += lengthM;
    travel += seconds;
  }
  const plan = placeSwapsGreedy(
    lengths,
    nodes.map((v) => c.isAttach[v] === 1),
    q.tether,
  );
  if (!plan.feasible) throw new Error('internal: a searched route does not fit the tether');
  const warnings: string[] = [];
  if (!c.isAttach[q.s]) {
    warnings.push(
      `${c.keys[q.s]} is not a tether attach point: the route assumes the tether is clipped where the crew member starts.`,
    );
  }
  warnings.push(...extraWarnings);
  const cautionHazards = [...caution].sort();
  for (const h of cautionHazards) warnings.push(`The route passes through caution volume ${h}.`);
  const swapSeconds = plan.swaps.length * q.settings.swapSeconds;
  const result: RouteFeasible = {
    feasible: true,
    mode: q.mode,
    nodes: nodes.map((v) => c.keys[v]),
    legs,
    lengthM: pos,
    travelSeconds: travel,
    swapCount: plan.swaps.length,
    swaps: plan.swaps.map((sw) => ({ node: c.keys[nodes[sw.index]], atM: sw.atM, paidOutM: sw.paidOutM })),
    swapSeconds,
    totalSeconds: travel + swapSeconds,
    tetherLengthM: q.tether,
    maxPaidOutM: plan.maxPaidOutM,
    warnings,
    cautionHazards,
  };
  return result;
}

function infeasible(
  q: Query,
  reasonCode: RouteInfeasible['reasonCode'],
  reason: string,
  blockingHazards?: string[],
): RouteInfeasible {
  return {
    feasible: false,
    mode: q.mode,
    reason,
    reasonCode,
    ...(blockingHazards ? { blockingHazards } : {}),
  };
}

/** Smallest tether (to the centimetre) for which some walk exists, by bisection on fitsTether. */
function requiredTether(q: Query): number | null {
  const arcs = dijkstraPath(q.c, q.c.arcLengthM, q.s, q.t, q.mask);
  if (!arcs) return null;
  let lo = q.tether;
  let hi = arcs.reduce((sum, a) => sum + q.c.arcLengthM[a], 0);
  while (hi - lo > 1e-4) {
    const mid = (lo + hi) / 2;
    if (fitsTether(q.c, q.s, q.t, mid, q.mask)) hi = mid;
    else lo = mid;
  }
  return Math.ceil((hi - 1e-4) * 100) / 100;
}

function keepOutHazardsBetween(q: Query): string[] {
  const { c } = q;
  const fromS = reachable(c, q.s, q.mask);
  const fromT = reachable(c, q.t, q.mask);
  const other = q.mask & ~EDGE_KEEP_OUT;
  const direct = new Set<string>();
  const boundary = new Set<string>();
  for (let e = 0; e < c.edgeCount; e++) {
    const f = c.edgeFlags[e];
    if (!(f & EDGE_KEEP_OUT) || f & other) continue;
    const a = c.edgeFrom[e];
    const b = c.edgeTo[e];
    const hazards = c.keepOutByEdge.get(e) ?? [];
    if ((fromS[a] && fromT[b]) || (fromS[b] && fromT[a])) hazards.forEach((h) => direct.add(h));
    else if (fromS[a] !== fromS[b]) hazards.forEach((h) => boundary.add(h));
  }
  return [...(direct.size ? direct : boundary)].sort();
}

function diagnose(q: Query): RouteInfeasible {
  const { c } = q;
  const from = c.keys[q.s];
  const to = c.keys[q.t];
  if (!reachable(c, q.s, 0)[q.t]) {
    return infeasible(q, 'disconnected', `${from} and ${to} are not connected by any handrail, hop or ride.`);
  }
  if (reachable(c, q.s, q.mask)[q.t]) {
    const need = requiredTether(q);
    const needText = need === null ? '' : `; the shortest tether that would do is ${fmt(need)}`;
    return infeasible(
      q,
      'anchor-gap',
      `Every route from ${from} to ${to} has a stretch between attach points longer than the ${fmt(q.tether)} tether${needText}.`,
    );
  }
  if (reachable(c, q.s, q.mask & ~EDGE_KEEP_OUT)[q.t]) {
    const hazards = keepOutHazardsBetween(q);
    return infeasible(
      q,
      'blocked-by-hazard',
      `Every route from ${from} to ${to} passes through keep-out volume${hazards.length > 1 ? 's' : ''} ${hazards.join(', ')}.`,
      hazards,
    );
  }
  const rides = q.mask & EDGE_RIDE ? ' or an arm ride (not allowed on this route)' : '';
  return infeasible(q, 'disconnected', `Every way from ${from} to ${to} uses a closed edge${rides}.`);
}

/**
 * A translation route between two nodes (DESIGN §3). Node keys must exist (check with hasNodeKey
 * first); `from === to` is answered as infeasible `same-node` rather than an empty route, so a
 * caller never mistakes a typo'd duplicate for a real route.
 */
export function findRoute(
  c: CompiledStation,
  settings: StationSettings,
  request: RouteRequest,
  options: FindRouteOptions = {},
): RouteResult {
  const s = c.keyToIndex.get(request.from);
  const t = c.keyToIndex.get(request.to);
  if (s === undefined || t === undefined) {
    throw new RangeError(`unknown node key "${s === undefined ? request.from : request.to}"`);
  }
  const { tether, mask, arcSeconds, landmarkTimesValid } = searchTerms(c, settings, request);
  const q: Query = {
    c,
    settings,
    mode: request.mode,
    s,
    t,
    tether,
    factor: request.carrying ? settings.carryFactor : 1,
    mask,
    weights: arcSeconds,
    landmarkTimesValid,
    strategy: options.strategy ?? 'auto',
    clipBuildFreeNodes: options.clipBuildFreeNodes ?? CLIP_BUILD_FREE_NODES,
  };
  if (s === t) return infeasible(q, 'same-node', `The route starts and ends at ${request.from}.`);

  if (request.mode === 'fastest') {
    // the landmark A* needs no clip graph: every strategy but the reference check uses it
    const plain =
      q.strategy !== 'label-search'
        ? fastestPath(c, arcSeconds, s, t, q.mask, maxSpeed(settings), landmarkTimesValid)
        : dijkstraPath(c, arcSeconds, s, t, q.mask);
    if (!plain) return diagnose(q);
    const lengths = plain.map((a) => c.arcLengthM[a]);
    const walkAttach = [s, ...plain.map((a) => c.targets[a])].map((v) => c.isAttach[v] === 1);
    const plan = placeSwapsGreedy(lengths, walkAttach, q.tether);
    if (plan.feasible) return buildRoute(q, plain, []);
    const fitted = search(q, 'sum', 0);
    if (!fitted) return diagnose(q);
    return buildRoute(q, fitted.arcs, [
      `The quickest way needs a tether of at least ${fmt(plan.requiredTetherM)}; this is the quickest route that fits the ${fmt(q.tether)} tether.`,
    ]);
  }
  const found =
    request.mode === 'fewest-swaps' ? search(q, 'lex', 0) : search(q, 'sum', settings.swapSeconds);
  return found ? buildRoute(q, found.arcs, []) : diagnose(q);
}

/** Walk node indices of a list of arcs starting at s (for callers that work on the index). */
export function walkNodes(c: CompiledStation, s: number, arcs: readonly number[]): number[] {
  const nodes = [s];
  for (const a of arcs) {
    if (arcSource(c, a) !== nodes[nodes.length - 1]) throw new Error('arcs do not form a walk');
    nodes.push(c.targets[a]);
  }
  return nodes;
}
