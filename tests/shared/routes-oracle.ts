import fc from 'fast-check';
import type { StationDocument, StationDocumentInput } from '@shared/schemas/station';
import { StationDocumentSchema } from '@shared/schemas/station';
import { segmentIntersectsHazard } from '@shared/compute/geometry';

/**
 * Independent reference for the route engine on small stations: enumerate every walk up to a
 * bounded number of edges and, per walk, find the fewest swaps by dynamic programming over clip
 * points (not the engine's greedy rule). Times are recomputed here from the document. A walk may
 * start from a tether state: some metres already out from an anchor behind, with a swap allowed
 * at the start when it is an attach point; extra nodes may count as attach points.
 */

export interface OracleEdge {
  to: number;
  lengthM: number;
  seconds: number;
}

export interface OracleBest {
  seconds: number;
  swaps: number;
  edges: number;
}

export interface OracleResult {
  /** least travel time, then (among walks of that time) fewest swaps */
  fastest: OracleBest | null;
  fewestSwaps: OracleBest | null;
  balanced: (OracleBest & { total: number }) | null;
}

const EPS = 1e-9;
/** travel times this close count as equal (as the engine's fastest mode takes them) */
const TIME_TIE = 1e-6;

export function adjacency(
  doc: StationDocument,
  opts: { allowRide?: boolean; carrying?: boolean; blocked?: Set<number> } = {},
): OracleEdge[][] {
  const index = new Map(doc.nodes.map((n, i) => [n.key, i]));
  const adj: OracleEdge[][] = doc.nodes.map(() => []);
  doc.edges.forEach((e, i) => {
    if (e.closed || opts.blocked?.has(i)) return;
    if (e.kind === 'ride' && !opts.allowRide) return;
    const a = index.get(e.from)!;
    const b = index.get(e.to)!;
    const pa = doc.nodes[a].position;
    const pb = doc.nodes[b].position;
    const lengthM =
      e.lengthM ?? Math.sqrt((pa[0] - pb[0]) ** 2 + (pa[1] - pb[1]) ** 2 + (pa[2] - pb[2]) ** 2);
    const speed = doc.settings.speedsMps[e.kind];
    let seconds = lengthM / speed + (e.kind === 'hop' ? doc.settings.hopSeconds : 0);
    if (opts.carrying) seconds *= doc.settings.carryFactor;
    adj[a].push({ to: b, lengthM, seconds });
    adj[b].push({ to: a, lengthM, seconds });
  });
  return adj;
}

/** Where a walk starts, tether-wise: metres already out, and whether the start may take a swap. */
export interface OracleStart {
  paidOutM: number;
  swapAtStart: boolean;
}

const FRESH: OracleStart = { paidOutM: 0, swapAtStart: false };

/**
 * Fewest swaps for a fixed walk by DP over which clip holds the tether: the anchor behind the
 * start (at minus the paid-out length), then any attach point of the walk before its end (the
 * start only when it may take a swap); -1 if none fits.
 */
export function minSwapsDp(
  positions: number[],
  attach: boolean[],
  tether: number,
  start: OracleStart = FRESH,
): number {
  const k = positions.length - 1;
  // clip c: c = 0 is the anchor behind the start, c = j + 1 a swap at walk position j
  const at = (c: number) => (c === 0 ? -start.paidOutM : positions[c - 1]);
  const dp = new Array<number>(k + 1).fill(Infinity);
  dp[0] = 0;
  for (let j = 0; j < k; j++) {
    if (!attach[j] || (j === 0 && !start.swapAtStart)) continue;
    for (let c = 0; c <= j; c++) {
      if (dp[c] !== Infinity && positions[j] - at(c) <= tether + EPS)
        dp[j + 1] = Math.min(dp[j + 1], dp[c] + 1);
    }
  }
  let best = Infinity;
  for (let c = 0; c <= k; c++) {
    if (dp[c] !== Infinity && positions[k] - at(c) <= tether + EPS) best = Math.min(best, dp[c]);
  }
  return best === Infinity ? -1 : best;
}

/** Attach points of a document, plus extra ones (by node index). */
export function attachMarks(doc: StationDocument, extra: readonly number[] = []): boolean[] {
  const marks = doc.nodes.map((n) => n.kind === 'anchor' || n.kind === 'airlock');
  for (const v of extra) marks[v] = true;
  return marks;
}

export function exhaustive(
  doc: StationDocument,
  adj: OracleEdge[][],
  s: number,
  t: number,
  tether: number,
  maxEdges: number,
  from: { paidOutM?: number; extraAttach?: readonly number[]; endCapM?: number } = {},
): OracleResult {
  const attachOf = attachMarks(doc, from.extraAttach);
  const start: OracleStart = { paidOutM: from.paidOutM ?? 0, swapAtStart: attachOf[s] };
  const swapSeconds = doc.settings.swapSeconds;
  const res: OracleResult = { fastest: null, fewestSwaps: null, balanced: null };
  const positions = [0];
  const attach = [attachOf[s]];
  const cap = from.endCapM;
  let least = Infinity;
  const quickest = new Map<number, OracleBest>();
  const walk = (v: number, seconds: number) => {
    if (v === t) {
      // at most `cap` out on arrival: a virtual last stretch of tether − cap with no attach point
      const here = positions[positions.length - 1];
      const swaps =
        cap === undefined
          ? minSwapsDp(positions, attach, tether, start)
          : minSwapsDp([...positions, here + tether - cap], [...attach, false], tether, start);
      if (swaps < 0) {
        // a walk may pass the end with too much out, swap beyond it and come back
        if (cap !== undefined) walkOn(v, seconds);
        return;
      }
      const edges = positions.length - 1;
      // least time; among walks within TIME_TIE of it, the fewest swaps (the quickest walk of
      // each swap count is kept: it outlasts any other of that count as the least time falls)
      least = Math.min(least, seconds);
      const kept = quickest.get(swaps);
      if (!kept || seconds < kept.seconds) quickest.set(swaps, { seconds, swaps, edges });
      const f = res.fewestSwaps;
      if (!f || swaps < f.swaps || (swaps === f.swaps && seconds < f.seconds))
        res.fewestSwaps = { seconds, swaps, edges };
      const total = seconds + swaps * swapSeconds;
      if (!res.balanced || total < res.balanced.total) res.balanced = { seconds, swaps, edges, total };
      return;
    }
    walkOn(v, seconds);
  };
  const walkOn = (v: number, seconds: number) => {
    if (positions.length - 1 >= maxEdges) return;
    const here = positions[positions.length - 1];
    for (const e of adj[v]) {
      // a stretch longer than the tether between attach points can never be repaired later
      if (e.lengthM > tether + EPS) continue;
      positions.push(here + e.lengthM);
      attach.push(attachOf[e.to]);
      walk(e.to, seconds + e.seconds);
      positions.pop();
      attach.pop();
    }
  };
  walk(s, 0);
  for (const w of quickest.values()) {
    if (w.seconds > least + TIME_TIE) continue;
    const f = res.fastest;
    if (!f || w.swaps < f.swaps) res.fastest = w;
  }
  return res;
}

// integers scaled down: fc.double favours 0 and the bounds, which piles nodes on top of each other
const decimal = (min: number, max: number) =>
  fc.integer({ min: min * 100, max: max * 100 }).map((v) => v / 100);
const coord = decimal(-4, 4);

/** Small random stations: 4–7 nodes, a spanning tree plus extra edges, mixed kinds and settings. */
export const smallStationArb = fc
  .record({
    n: fc.integer({ min: 4, max: 7 }),
    positions: fc.array(fc.tuple(coord, coord, coord), { minLength: 7, maxLength: 7 }),
    kinds: fc.array(
      fc.constantFrom('anchor', 'anchor', 'anchor', 'junction', 'junction', 'airlock', 'worksite'),
      { minLength: 7, maxLength: 7 },
    ),
    parents: fc.array(fc.nat(), { minLength: 7, maxLength: 7 }),
    extra: fc.array(
      fc.tuple(fc.nat(), fc.nat(), fc.constantFrom('handrail', 'handrail', 'hop', 'ride'), fc.boolean()),
      {
        maxLength: 8,
      },
    ),
    givenLength: fc.array(fc.option(decimal(0.5, 5), { nil: undefined }), {
      minLength: 12,
      maxLength: 12,
    }),
    handrail: decimal(0.05, 0.5),
    hop: decimal(0.05, 0.5),
    ride: decimal(0.05, 0.5),
    hopSeconds: decimal(0, 40),
    swapSeconds: decimal(0, 120),
    tether: decimal(4, 9),
    keepOut: fc.option(fc.tuple(coord, coord, coord, decimal(0.2, 0.8)), { nil: undefined, freq: 2 }),
    caution: fc.option(fc.tuple(coord, coord, coord), { nil: undefined }),
  })
  .map((r) => {
    const keys = Array.from({ length: r.n }, (_, i) => `N${i}`);
    const edges: StationDocumentInput['edges'] = [];
    const pairs = new Set<string>();
    const addEdge = (a: number, b: number, kind: 'handrail' | 'hop' | 'ride', closed = false) => {
      const pair = `${Math.min(a, b)}-${Math.max(a, b)}-${kind}`;
      if (a === b || pairs.has(pair)) return;
      pairs.add(pair);
      const lengthM = r.givenLength[edges.length % 12];
      edges.push({ from: keys[a], to: keys[b], kind, closed, ...(lengthM !== undefined ? { lengthM } : {}) });
    };
    for (let i = 1; i < r.n; i++) addEdge(i, r.parents[i] % i, 'handrail');
    for (const [a, b, kind, closed] of r.extra)
      addEdge(a % r.n, b % r.n, kind, closed && kind !== 'handrail');
    const hazards: StationDocumentInput['hazards'] = [];
    if (r.keepOut) {
      const [x, y, z, radiusM] = r.keepOut;
      hazards.push({ key: 'KO', kind: 'keep-out', shape: 'sphere', center: [x, y, z], radiusM });
    }
    if (r.caution) {
      const [x, y, z] = r.caution;
      hazards.push({ key: 'CA', kind: 'caution', shape: 'box', min: [x, y, z], max: [x + 3, y + 3, z + 3] });
    }
    const input: StationDocumentInput = {
      format: 'tetherwise.station',
      version: 1,
      name: 'random',
      settings: {
        tetherLengthM: r.tether,
        speedsMps: { handrail: r.handrail, hop: r.hop, ride: r.ride },
        hopSeconds: r.hopSeconds,
        swapSeconds: r.swapSeconds,
      },
      nodes: keys.map((key, i) => ({ key, kind: r.kinds[i] as 'anchor', position: r.positions[i] })),
      edges,
      hazards,
    };
    return StationDocumentSchema.parse(input);
  });

/** Edges whose segment touches a keep-out hazard: the engine excludes them, and so must the oracle. */
export function keepOutEdges(doc: StationDocument): Set<number> {
  const pos = new Map(doc.nodes.map((n) => [n.key, n.position]));
  const blocked = new Set<number>();
  doc.edges.forEach((e, i) => {
    if (
      doc.hazards.some(
        (h) => h.kind === 'keep-out' && segmentIntersectsHazard(pos.get(e.from)!, pos.get(e.to)!, h),
      )
    ) {
      blocked.add(i);
    }
  });
  return blocked;
}

/**
 * Two or three branches of handrails from S to T made of the same lengths in another order, with
 * attach points in different places: the branches tie on time (to within float rounding) and
 * often differ in swaps.
 */
export const tiedBranchesStationArb = fc
  .record({
    branches: fc.integer({ min: 2, max: 3 }),
    lengths: fc.array(decimal(0.3, 2.5), { minLength: 3, maxLength: 5 }),
    order: fc.array(fc.array(fc.nat(), { minLength: 5, maxLength: 5 }), { minLength: 3, maxLength: 3 }),
    anchors: fc.array(fc.boolean(), { minLength: 12, maxLength: 12 }),
    tetherShare: fc.integer({ min: 25, max: 80 }),
  })
  .map((r) => {
    const total = r.lengths.reduce((a, b) => a + b, 0);
    const tether = Math.max(Math.max(...r.lengths), Math.round(total * r.tetherShare) / 100);
    const k = r.lengths.length;
    const nodes: StationDocumentInput['nodes'] = [
      { key: 'S', kind: 'anchor', position: [0, 0, 0] },
      { key: 'T', kind: 'worksite', position: [k, 0, 0] },
    ];
    const edges: StationDocumentInput['edges'] = [];
    for (let b = 0; b < r.branches; b++) {
      const order = r.lengths
        .map((lengthM, i) => ({ lengthM, key: r.order[b][i] }))
        .sort((x, y) => x.key - y.key);
      let prev = 'S';
      order.forEach(({ lengthM }, i) => {
        const key = i === k - 1 ? 'T' : `B${b}-${i + 1}`;
        if (key !== 'T') {
          const kind = r.anchors[b * 4 + i] ? 'anchor' : 'junction';
          nodes.push({ key, kind, position: [i + 1, b + 1, 0] });
        }
        edges.push({ from: prev, to: key, kind: 'handrail', lengthM });
        prev = key;
      });
    }
    return StationDocumentSchema.parse({
      format: 'tetherwise.station',
      version: 1,
      name: 'tied branches',
      settings: { tetherLengthM: tether },
      nodes,
      edges,
    } satisfies StationDocumentInput);
  });
