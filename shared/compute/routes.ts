import type {
  RouteFeasible,
  RouteInfeasible,
  RouteLeg,
  RouteMode,
  RouteRequest,
  RouteResult,
  TetherState,
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
import {
  arcSource,
  dijkstraPath,
  fewestSwapsWithin,
  fitsTether,
  labelSearch,
  quickestWalk,
  reachable,
  type LabelSearchParams,
} from './routes-search';
import { TETHER_EPS_M, placeSwapsGreedy, type WalkStart } from './tether';

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
  /** the station's attach points, plus the request's extra ones */
  isAttach: Uint8Array;
  /** the request's extra attach points that are not the station's */
  extraAttach: number[];
  /** the node the tether is clipped to at the start, and the metres out since it */
  startAnchor: number;
  startPaidOutM: number;
  /** the request gave a start state */
  startGiven: boolean;
  /** at most this many metres out on arrival (Infinity: no limit) */
  endCap: number;
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

/** Whether the clip graph this request's exact search would use is already built in this thread. */
export function clipGraphHeld(c: CompiledStation, settings: StationSettings, request: RouteRequest): boolean {
  const { tether, mask, arcSeconds } = searchTerms(c, settings, request);
  return hasClipGraph(arcSeconds, tether, mask);
}

/** What a request searches with: tether, excluded arcs, arc times and whether the landmark times hold. */
function searchTerms(c: CompiledStation, settings: StationSettings, request: RouteRequest) {
  return {
    tether: request.tetherLengthM ?? settings.tetherLengthM,
    mask: excludeMaskFor(request.allowRide),
    ...arcSecondsFor(c, settings),
  };
}

/**
 * The exact search: over the clip graph (which takes the start state, the extra attach points and
 * the limit on arrival per query), else the label search.
 */
function search(q: Query, objective: 'sum' | 'lex', swapCost: number) {
  const search = useClipGraph(q) ? clipSearch : labelSearch;
  return search(q.c, q.s, q.t, searchParams(q, objective, swapCost));
}

function searchParams(q: Query, objective: 'sum' | 'lex', swapCost: number): LabelSearchParams {
  return {
    objective,
    swapCost,
    weights: q.weights,
    secondsFactor: q.factor,
    tetherLengthM: q.tether,
    excludeMask: q.mask,
    landmarkTimesValid: q.landmarkTimesValid,
    maxSpeedMps: maxSpeed(q.settings),
    isAttach: q.isAttach,
    extraAttach: q.extraAttach,
    startPaidOutM: q.startPaidOutM,
    endPaidOutMaxM: q.endCap,
  };
}

/**
 * Greedy swaps on a fixed walk (fewest swaps). With a limit on the tether out on arrival, the walk
 * is extended by a virtual stretch of `tether − limit` with no attach point: it fits exactly when
 * the arrival leaves that much of the tether, and the greedy rule stays optimal on it.
 */
function placeSwaps(q: Query, lengths: number[], nodes: readonly number[]) {
  if (!Number.isFinite(q.endCap))
    return placeSwapsGreedy(lengths, walkAttach(q, nodes), q.tether, walkStart(q));
  const slack = Math.max(0, q.tether - q.endCap);
  return placeSwapsGreedy([...lengths, slack], [...walkAttach(q, nodes), false], q.tether, walkStart(q));
}

/** The start state as the greedy swap placement takes it. */
function walkStart(q: Query): WalkStart {
  return { startPaidOutM: q.startPaidOutM, startSwap: q.isAttach[q.s] === 1 };
}

function walkAttach(q: Query, nodes: readonly number[]): boolean[] {
  return nodes.map((v) => q.isAttach[v] === 1);
}

/** Travel times this close are equal: the same legs summed in another order differ by far less. */
export const TRAVEL_TIME_TIE_S = 1e-6;

/** The greedy swaps of a walk from the query's start state (and within its limit on arrival). */
function swapsOf(q: Query, arcs: readonly number[]) {
  const nodes = [q.s, ...arcs.map((a) => q.c.targets[a])];
  return placeSwaps(
    q,
    arcs.map((a) => q.c.arcLengthM[a]),
    nodes,
  );
}

/**
 * Among routes of the same travel time as `arcs` (to within TRAVEL_TIME_TIE_S), the one with the
 * fewest swaps: `arcs` is the quickest route that fits the tether when the quickest walks do not.
 */
function fewestSwapsAtLeastTime(q: Query, arcs: number[]): number[] {
  const plan = swapsOf(q, arcs);
  const swaps = plan.feasible ? plan.swaps.length : Infinity;
  if (swaps === 0) return arcs;
  let seconds = 0;
  for (const a of arcs) seconds += q.weights[a] * q.factor;
  const limit = seconds + TRAVEL_TIME_TIE_S;
  const found = fewestSwapsWithin(q.c, q.s, q.t, searchParams(q, 'lex', 0), limit, swaps);
  return found ? found.arcs : arcs;
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
  const plan = placeSwaps(q, lengths, nodes);
  if (!plan.feasible) throw new Error('internal: a searched route does not fit the tether');
  const warnings: string[] = [];
  const startNotAttachable = !q.startGiven && !q.isAttach[q.s];
  if (startNotAttachable) {
    warnings.push(
      `${c.keys[q.s]} is not a tether attach point: the route assumes the tether is clipped where the crew member starts.`,
    );
  }
  warnings.push(...extraWarnings);
  const cautionHazards = [...caution].sort();
  for (const h of cautionHazards) warnings.push(`The route passes through caution volume ${h}.`);
  const swapSeconds = plan.swaps.length * q.settings.swapSeconds;
  const lastSwap = plan.swaps[plan.swaps.length - 1];
  const tetherAtStart: TetherState = { anchor: c.keys[q.startAnchor], paidOutM: q.startPaidOutM };
  const tetherAtEnd: TetherState = lastSwap
    ? { anchor: c.keys[nodes[lastSwap.index]], paidOutM: pos - lastSwap.atM }
    : { anchor: c.keys[q.startAnchor], paidOutM: q.startPaidOutM + pos };
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
    ...(startNotAttachable ? { startNotAttachable } : {}),
    tetherAtStart,
    tetherAtEnd,
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

/**
 * Smallest tether (to the centimetre) for which some walk exists from the query's start state, by
 * bisection on fitsTether.
 */
function requiredTether(q: Query): number | null {
  const arcs = dijkstraPath(q.c, q.c.arcLengthM, q.s, q.t, q.mask);
  if (!arcs) return null;
  const fits = (tether: number) => fitsTether(q.c, q.s, q.t, tether, q.mask, q.isAttach, q.startPaidOutM);
  let lo = q.tether;
  let hi = q.startPaidOutM + arcs.reduce((sum, a) => sum + q.c.arcLengthM[a], 0);
  while (hi - lo > 1e-4) {
    const mid = (lo + hi) / 2;
    if (fits(mid)) hi = mid;
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
    const startText =
      q.startPaidOutM > 0 && !q.isAttach[q.s]
        ? ` (counting the ${fmt(q.startPaidOutM)} already paid out from ${c.keys[q.startAnchor]})`
        : '';
    return infeasible(
      q,
      'anchor-gap',
      `Every route from ${from} to ${to} has a stretch between attach points longer than the ${fmt(q.tether)} tether${startText}${needText}.`,
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

/** What is wrong with a request on this station: `unknown-key` is a missing node, `invalid` a bad value. */
export interface RouteRequestProblem {
  kind: 'unknown-key' | 'invalid';
  /** the request field, as a JSON path (`extraAttach.2`) */
  path: string;
  message: string;
}

/**
 * The checks of a route request beyond its schema: every node key exists, a length paid out at the
 * start comes with the anchor it is paid out from, that anchor is an attach point (the station's or
 * one of `extraAttach`), and the length is below the tether (the request's, else the station's).
 * `kindOf` says whether a key is an attach point, another node, or none. `fullTetherOut` accepts
 * the whole tether out as well: a route can end in that state, so the next one may start from it
 * (findRoute does; a request from outside may not). Empty when the request can be answered.
 */
export function routeRequestProblems(
  request: RouteRequest,
  defaultTetherLengthM: number,
  kindOf: (key: string) => 'attach' | 'node' | undefined,
  { fullTetherOut = false } = {},
): RouteRequestProblem[] {
  const problems: RouteRequestProblem[] = [];
  const unknown = (path: string, key: string) =>
    problems.push({ kind: 'unknown-key', path, message: `unknown node key "${key}"` });
  for (const field of ['from', 'to'] as const) if (!kindOf(request[field])) unknown(field, request[field]);
  const extra = new Set<string>();
  request.extraAttach?.forEach((key, i) => {
    if (kindOf(key)) extra.add(key);
    else unknown(`extraAttach.${i}`, key);
  });
  const anchor = request.startAnchor;
  if (anchor !== undefined) {
    const kind = kindOf(anchor);
    if (!kind) unknown('startAnchor', anchor);
    else if (kind !== 'attach' && !extra.has(anchor)) {
      problems.push({
        kind: 'invalid',
        path: 'startAnchor',
        message: `"${anchor}" is not a tether attach point (an anchor, the airlock or one of extraAttach)`,
      });
    }
  } else if (request.startPaidOutM !== undefined) {
    problems.push({
      kind: 'invalid',
      path: 'startAnchor',
      message: 'give the anchor the tether is clipped to when giving the length paid out from it',
    });
  }
  const tether = request.tetherLengthM ?? defaultTetherLengthM;
  const paid = request.startPaidOutM;
  const fits = fullTetherOut ? paid! <= tether + TETHER_EPS_M : paid! < tether;
  if (paid !== undefined && !(paid >= 0 && fits)) {
    problems.push({
      kind: 'invalid',
      path: 'startPaidOutM',
      message: `the paid-out length must be at least 0 m and less than the ${fmt(tether)} tether`,
    });
  }
  return problems;
}

/**
 * The station's attach points plus a query's extra ones (a copy only when there are any), and the
 * extra ones that are not the station's.
 */
function attachWith(c: CompiledStation, extra: readonly string[] | undefined) {
  const added = [...new Set((extra ?? []).map((key) => c.keyToIndex.get(key)!))].filter(
    (v) => !c.isAttach[v],
  );
  if (!added.length) return { isAttach: c.isAttach, added };
  const isAttach = c.isAttach.slice();
  for (const v of added) isAttach[v] = 1;
  return { isAttach, added };
}

/**
 * A translation route between two nodes, from a tether state: the crew member at `from` is
 * clipped at `startAnchor` with `startPaidOutM` out (without them, freshly clipped at `from`).
 * The request must pass routeRequestProblems (a RangeError names the first problem otherwise);
 * `from === to` is answered as infeasible `same-node` rather than an empty route, so a caller
 * never mistakes a typo'd duplicate for a real route.
 */
export function findRoute(
  c: CompiledStation,
  settings: StationSettings,
  request: RouteRequest,
  options: FindRouteOptions = {},
): RouteResult {
  const kindOf = (key: string) => {
    const v = c.keyToIndex.get(key);
    return v === undefined ? undefined : c.isAttach[v] ? 'attach' : 'node';
  };
  const problem = routeRequestProblems(request, settings.tetherLengthM, kindOf, { fullTetherOut: true })[0];
  if (problem) throw new RangeError(problem.message);
  const s = c.keyToIndex.get(request.from)!;
  const t = c.keyToIndex.get(request.to)!;
  const { tether, mask, arcSeconds, landmarkTimesValid } = searchTerms(c, settings, request);
  const { isAttach, added } = attachWith(c, request.extraAttach);
  const startAnchor = request.startAnchor === undefined ? s : c.keyToIndex.get(request.startAnchor)!;
  const startPaidOutM = request.startPaidOutM ?? 0;
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
    isAttach,
    extraAttach: added,
    startAnchor,
    startPaidOutM,
    startGiven: request.startAnchor !== undefined,
    endCap: request.endPaidOutMaxM ?? Infinity,
  };
  if (s === t) return infeasible(q, 'same-node', `The route starts and ends at ${request.from}.`);

  if (request.mode === 'fastest') {
    // the landmark A* needs no clip graph: every strategy but the reference check uses the bound
    const quick = quickestWalk(
      c,
      s,
      t,
      searchParams(q, 'lex', 0),
      TRAVEL_TIME_TIE_S,
      q.strategy !== 'label-search',
    );
    if (!quick) return diagnose(q);
    if (quick.fits) return buildRoute(q, quick.arcs, []);
    const fitted = search(q, 'sum', 0);
    if (!fitted) return diagnose(q);
    const plan = swapsOf(q, quick.arcs);
    const need = plan.feasible ? q.tether : plan.requiredTetherM;
    return buildRoute(q, fewestSwapsAtLeastTime(q, fitted.arcs), [
      `The quickest way needs a tether of at least ${fmt(need)}; this is the quickest route that fits the ${fmt(q.tether)} tether.`,
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
