import type { CompiledStation } from './compiled-station';
import { MinHeap } from './routes-heap';
import { TETHER_EPS_M } from './tether';

/**
 * Search kernels over a compiled station. Per-query state lives in scratch buffers cached per
 * compiled station and reset by a query stamp, so a query allocates nothing in the common case.
 */

export interface Scratch {
  stamp: number;
  seen: Int32Array;
  dist: Float64Array;
  predArc: Int32Array;
  hStamp: Int32Array;
  hSeconds: Float64Array;
  hMetres: Float64Array;
  headStamp: Int32Array;
  head: Int32Array;
  layerStamp: number;
  layerSeen: Int32Array;
  layerDist: Float64Array;
  swapStamp: Int32Array;
  swapLayer: Int32Array;
  swapReach: Float64Array;
  sources: Int32Array;
  heap: MinHeap;
  heap2: MinHeap;
  labels: LabelStore;
}

class LabelStore {
  size = 0;
  node = new Int32Array(1024);
  parent = new Int32Array(1024);
  arc = new Int32Array(1024);
  next = new Int32Array(1024);
  swaps = new Int32Array(1024);
  swapped = new Uint8Array(1024);
  dead = new Uint8Array(1024);
  seconds = new Float64Array(1024);
  paid = new Float64Array(1024);
  p1 = new Float64Array(1024);
  p2 = new Float64Array(1024);

  add(): number {
    if (this.size === this.node.length) this.grow();
    return this.size++;
  }

  private grow(): void {
    const cap = this.node.length * 2;
    for (const k of [
      'node',
      'parent',
      'arc',
      'next',
      'swaps',
      'swapped',
      'dead',
      'seconds',
      'paid',
      'p1',
      'p2',
    ] as const) {
      const old = this[k];
      const arr = new (old.constructor as new (n: number) => typeof old)(cap);
      arr.set(old as never);
      (this as Record<string, unknown>)[k] = arr;
    }
  }
}

const scratchByStation = new WeakMap<CompiledStation, Scratch>();

export function scratchFor(c: CompiledStation): Scratch {
  let s = scratchByStation.get(c);
  if (!s) {
    const n = c.nodeCount;
    s = {
      stamp: 0,
      seen: new Int32Array(n),
      dist: new Float64Array(n),
      predArc: new Int32Array(n),
      hStamp: new Int32Array(n),
      hSeconds: new Float64Array(n),
      hMetres: new Float64Array(n),
      headStamp: new Int32Array(n),
      head: new Int32Array(n),
      layerStamp: 0,
      layerSeen: new Int32Array(n),
      layerDist: new Float64Array(n),
      swapStamp: new Int32Array(n),
      swapLayer: new Int32Array(n),
      swapReach: new Float64Array(n),
      sources: new Int32Array(n),
      heap: new MinHeap(1024),
      heap2: new MinHeap(1024),
      labels: new LabelStore(),
    };
    scratchByStation.set(c, s);
  }
  s.stamp++;
  if (s.stamp >= 0x7fffffff) {
    s.stamp = 1;
    s.seen.fill(0);
    s.hStamp.fill(0);
    s.headStamp.fill(0);
    s.swapStamp.fill(0);
  }
  return s;
}

/** The node an arc leaves from. */
export function arcSource(c: CompiledStation, a: number): number {
  const e = c.arcEdge[a];
  return c.edgeFrom[e] === c.targets[a] ? c.edgeTo[e] : c.edgeFrom[e];
}

/**
 * Plain Dijkstra on arc weights from s, stopping when t is settled; arcs with any `excludeMask`
 * flag are skipped. Returns the arcs of the path in walk order, or null when t is unreachable.
 */
export function dijkstraPath(
  c: CompiledStation,
  weights: Float64Array,
  s: number,
  t: number,
  excludeMask: number,
): number[] | null {
  const sc = scratchFor(c);
  const { seen, dist, predArc, heap } = sc;
  const stamp = sc.stamp;
  const { offsets, targets, arcFlags } = c;
  heap.clear();
  seen[s] = stamp;
  dist[s] = 0;
  predArc[s] = -1;
  heap.push(s, 0);
  let found = false;
  while (heap.size > 0) {
    const d = heap.topKey1();
    const v = heap.pop();
    if (d > dist[v]) continue;
    if (v === t) {
      found = true;
      break;
    }
    for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
      if (arcFlags[a] & excludeMask) continue;
      const u = targets[a];
      const nd = d + weights[a];
      if (seen[u] !== stamp || nd < dist[u]) {
        seen[u] = stamp;
        dist[u] = nd;
        predArc[u] = a;
        heap.push(u, nd);
      }
    }
  }
  return found ? predArcsPath(c, predArc, s, t) : null;
}

function predArcsPath(c: CompiledStation, predArc: Int32Array, s: number, t: number): number[] {
  const arcs: number[] = [];
  for (let v = t; v !== s;) {
    const a = predArc[v];
    arcs.push(a);
    v = arcSource(c, a);
  }
  return arcs.reverse();
}

/**
 * Least-time path by A* with the compiled landmark bounds: the same cost as dijkstraPath on
 * `weights`, but it settles a corridor towards t instead of a ball round s. A heap entry whose key
 * no longer matches its node's distance is stale; a node whose distance improves is pushed again.
 */
export function fastestPath(
  c: CompiledStation,
  weights: Float64Array,
  s: number,
  t: number,
  excludeMask: number,
  maxSpeedMps: number,
  landmarkTimesValid: boolean,
): number[] | null {
  const sc = scratchFor(c);
  const { seen, dist, predArc, heap, hSeconds } = sc;
  const stamp = sc.stamp;
  const { offsets, targets, arcFlags } = c;
  const bound = targetBound(c, sc, t, 1, maxSpeedMps, landmarkTimesValid);
  if (!bound(s)) return null;
  heap.clear();
  seen[s] = stamp;
  dist[s] = 0;
  predArc[s] = -1;
  heap.push(s, hSeconds[s]);
  while (heap.size > 0) {
    const k = heap.topKey1();
    const v = heap.pop();
    const d = dist[v];
    if (k > d + hSeconds[v]) continue;
    if (v === t) return predArcsPath(c, predArc, s, t);
    for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
      if (arcFlags[a] & excludeMask) continue;
      const u = targets[a];
      const nd = d + weights[a];
      if (seen[u] !== stamp || nd < dist[u]) {
        if (!bound(u)) continue;
        seen[u] = stamp;
        dist[u] = nd;
        predArc[u] = a;
        heap.push(u, nd + hSeconds[u]);
      }
    }
  }
  return null;
}

/** Nodes reachable from s over arcs without any `excludeMask` flag. */
export function reachable(c: CompiledStation, s: number, excludeMask: number): Uint8Array {
  const mark = new Uint8Array(c.nodeCount);
  const queue = new Int32Array(c.nodeCount);
  let qh = 0;
  let qt = 0;
  mark[s] = 1;
  queue[qt++] = s;
  while (qh < qt) {
    const v = queue[qh++];
    for (let a = c.offsets[v], end = c.offsets[v + 1]; a < end; a++) {
      const u = c.targets[a];
      if (mark[u] || c.arcFlags[a] & excludeMask) continue;
      mark[u] = 1;
      queue[qt++] = u;
    }
  }
  return mark;
}

/**
 * Landmark (ALT) lower bounds from any node to t, memoised in the scratch for this query stamp:
 * after `bound(v)` returns true, `hSeconds[v]` (times `secondsFactor`) and `hMetres[v]` hold them.
 * Returns false when v cannot reach t at all (a landmark reaches exactly one of them).
 */
export function targetBound(
  c: CompiledStation,
  sc: Scratch,
  t: number,
  secondsFactor: number,
  maxSpeedMps: number,
  useTimes: boolean,
): (v: number) => boolean {
  const stamp = sc.stamp;
  const { hStamp, hSeconds, hMetres } = sc;
  const lm = c.landmarks;
  const K = lm.count;
  const lmS = lm.seconds;
  const lmM = lm.metres;
  const tBase = t * K;
  const speedBound = secondsFactor / maxSpeedMps;
  return (v: number): boolean => {
    if (hStamp[v] === stamp) return hSeconds[v] !== Infinity;
    hStamp[v] = stamp;
    let bs = 0;
    let bm = 0;
    const vBase = v * K;
    for (let k = 0; k < K; k++) {
      const mt = lmM[tBase + k];
      const mv = lmM[vBase + k];
      if (mt === Infinity || mv === Infinity) {
        if (mt !== mv) {
          hSeconds[v] = Infinity;
          return false;
        }
        continue;
      }
      const dm = mt > mv ? mt - mv : mv - mt;
      if (dm > bm) bm = dm;
      if (useTimes) {
        const ds = lmS[tBase + k] - lmS[vBase + k];
        const a = ds < 0 ? -ds : ds;
        if (a > bs) bs = a;
      }
    }
    bs *= secondsFactor;
    if (bm * speedBound > bs) bs = bm * speedBound;
    hSeconds[v] = bs;
    hMetres[v] = bm;
    return true;
  };
}

export interface LabelSearchParams {
  /**
   * `sum`: minimise seconds + swapCost·swaps. `lex`: fewest swaps, then least seconds.
   * Dominance and ordering both use (p1, p2): sum → (cost, 0), lex → (swaps, seconds).
   */
  objective: 'sum' | 'lex';
  swapCost: number;
  /** arc seconds (not carrying) and the factor applied to them */
  weights: Float64Array;
  secondsFactor: number;
  tetherLengthM: number;
  excludeMask: number;
  /** landmark time bounds were computed with the same speeds as `weights` */
  landmarkTimesValid: boolean;
  /** the fastest speed of any kind, for a time bound from the metres bound */
  maxSpeedMps: number;
  /** the query's attach points: the station's, plus any that count for this query only */
  isAttach: Uint8Array;
  /** metres already paid out at the start (a swap at the start, when it is an attach point, resets it) */
  startPaidOutM: number;
  /** arrive with at most this much out (a label at the end with more goes on, to swap and come back) */
  endPaidOutMaxM?: number;
}

export interface LabelPath {
  arcs: number[];
  swaps: number;
  seconds: number;
}

/**
 * Exact label-setting A* over (node, tether paid out since the last clip), allowing revisits.
 * Lower bounds: landmark (ALT) bounds on remaining seconds and metres; the metres bound also gives
 * a bound on the swaps still needed. Labels at a node that are no better in (p1, p2) and in paid-out
 * than another are dropped. The start label carries the start's paid-out length; when the start is
 * an attach point, a second start label has swapped there.
 */
export function labelSearch(
  c: CompiledStation,
  s: number,
  t: number,
  p: LabelSearchParams,
): LabelPath | null {
  // Short queries finish before the layered swap bound would pay for itself; long ones restart with it.
  if (p.swapCost === 0 && p.objective === 'sum')
    return runLabels(c, s, t, p, false, Infinity) as LabelPath | null;
  const quick = runLabels(c, s, t, p, false, QUICK_LABELS);
  return quick === 'cap' ? (runLabels(c, s, t, p, true, Infinity) as LabelPath | null) : quick;
}

const QUICK_LABELS = 12_000;

function runLabels(
  c: CompiledStation,
  s: number,
  t: number,
  p: LabelSearchParams,
  useLayers: boolean,
  cap: number,
): LabelPath | null | 'cap' {
  const sc = scratchFor(c);
  const stamp = sc.stamp;
  const { hSeconds, hMetres, headStamp, head, heap } = sc;
  const L = sc.labels;
  L.size = 0;
  heap.clear();
  const { offsets, targets, arcFlags, arcLengthM } = c;
  const { weights, secondsFactor, tetherLengthM: tether, excludeMask, swapCost, isAttach } = p;
  const lex = p.objective === 'lex';
  const limit = tether + TETHER_EPS_M;
  const bound = targetBound(c, sc, t, secondsFactor, p.maxSpeedMps, p.landmarkTimesValid);
  const layers = useLayers ? swapLayers(c, sc, s, t, tether, excludeMask, isAttach) : -2;
  if (layers === -1) return null;
  const { swapStamp, swapLayer, swapReach } = sc;
  const swapsNeeded = (v: number, paid: number): number => {
    const need = hMetres[v] - (tether - paid);
    const alt = need > TETHER_EPS_M ? Math.ceil(need / tether - 1e-9) : 0;
    if (layers === -2) return alt;
    const k = swapStamp[v] === stamp ? swapLayer[v] + (paid + swapReach[v] > limit ? 1 : 0) : layers + 1;
    return k > alt ? k : alt;
  };

  // adds a label unless dominated; prunes the labels it dominates
  const offer = (
    v: number,
    parent: number,
    arc: number,
    swaps: number,
    seconds: number,
    paid: number,
    swapped: number,
  ) => {
    const p1 = lex ? swaps : seconds + swapCost * swaps;
    const p2 = lex ? seconds : 0;
    if (headStamp[v] !== stamp) {
      headStamp[v] = stamp;
      head[v] = -1;
    }
    let prev = -1;
    for (let y = head[v]; y !== -1;) {
      const nextY = L.next[y];
      const yp1 = L.p1[y];
      if ((yp1 < p1 || (yp1 === p1 && L.p2[y] <= p2)) && L.paid[y] <= paid) return;
      if ((p1 < yp1 || (p1 === yp1 && p2 <= L.p2[y])) && paid <= L.paid[y]) {
        L.dead[y] = 1;
        if (prev === -1) head[v] = nextY;
        else L.next[prev] = nextY;
      } else prev = y;
      y = nextY;
    }
    const x = L.add();
    L.node[x] = v;
    L.parent[x] = parent;
    L.arc[x] = arc;
    L.swaps[x] = swaps;
    L.swapped[x] = swapped;
    L.dead[x] = 0;
    L.seconds[x] = seconds;
    L.paid[x] = paid;
    L.p1[x] = p1;
    L.p2[x] = p2;
    L.next[x] = head[v];
    head[v] = x;
    const sw = swapsNeeded(v, paid);
    if (lex) heap.push(x, swaps + sw, seconds + hSeconds[v]);
    else heap.push(x, p1 + hSeconds[v] + swapCost * sw, hSeconds[v]);
  };

  if (!bound(s)) return null;
  const startPaid = p.startPaidOutM;
  offer(s, -1, -1, 0, 0, startPaid, 0);
  if (isAttach[s] && startPaid > 0) offer(s, -1, -1, 1, 0, 0, 1);
  let goal = -1;
  const endLimit = (p.endPaidOutMaxM ?? Infinity) + TETHER_EPS_M;
  while (heap.size > 0) {
    const x = heap.pop();
    if (L.dead[x]) continue;
    if (L.size > cap) return 'cap';
    const v = L.node[x];
    if (v === t && L.paid[x] <= endLimit) {
      goal = x;
      break;
    }
    const paid = L.paid[x];
    const seconds = L.seconds[x];
    const swaps = L.swaps[x];
    for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
      if (arcFlags[a] & excludeMask) continue;
      const np = paid + arcLengthM[a];
      if (np > limit) continue;
      const u = targets[a];
      if (!bound(u)) continue;
      const ns = seconds + weights[a] * secondsFactor;
      // a swap at the end only matters when the arrival must leave tether to spare
      if (isAttach[u] && (u !== t || endLimit < Infinity) && np > 0) offer(u, x, a, swaps + 1, ns, 0, 1);
      offer(u, x, a, swaps, ns, np, 0);
    }
  }
  if (goal < 0) return null;
  const arcs: number[] = [];
  for (let x = goal; L.arc[x] !== -1; x = L.parent[x]) arcs.push(L.arc[x]);
  return { arcs: arcs.reverse(), swaps: L.swaps[goal], seconds: L.seconds[goal] };
}

/**
 * Whether some walk s → t fits a tether of this length when swaps are free: the least paid-out
 * at each node, with attach points resetting it, by a label-correcting pass on a heap. The walk
 * starts with `startPaidOutM` out, or none when s is an attach point (a free swap there).
 */
export function fitsTether(
  c: CompiledStation,
  s: number,
  t: number,
  tetherLengthM: number,
  excludeMask: number,
  isAttach: Uint8Array,
  startPaidOutM: number,
): boolean {
  const sc = scratchFor(c);
  const { seen, dist, heap } = sc;
  const stamp = sc.stamp;
  const limit = tetherLengthM + TETHER_EPS_M;
  const startKey = isAttach[s] ? 0 : startPaidOutM;
  if (startKey > limit) return false;
  heap.clear();
  seen[s] = stamp;
  dist[s] = startKey;
  heap.push(s, startKey);
  while (heap.size > 0) {
    const d = heap.topKey1();
    const v = heap.pop();
    if (d > dist[v]) continue;
    if (v === t) return true;
    for (let a = c.offsets[v], end = c.offsets[v + 1]; a < end; a++) {
      if (c.arcFlags[a] & excludeMask) continue;
      const np = d + c.arcLengthM[a];
      if (np > limit) continue;
      const u = c.targets[a];
      const key = isAttach[u] ? 0 : np;
      if (seen[u] !== stamp || key < dist[u]) {
        seen[u] = stamp;
        dist[u] = key;
        heap.push(u, key);
      }
    }
  }
  return false;
}

/**
 * Exact fewest swaps to go from each node when freshly clipped there, in layers outward from t:
 * layer 0 is every node within one tether length of t, layer k every further node within one tether
 * length of an attach point of layer k - 1 (multi-source Dijkstra on metres, cut at the tether).
 * Stores the layer and the distance to it; a label with paid-out p at v then needs at least
 * layer(v) swaps, one more when p plus that distance passes the tether. Stops after the layer that
 * reaches s; nodes not reached by then need more. Returns that last layer, or -1 when s is out of
 * reach at any number of swaps.
 */
function swapLayers(
  c: CompiledStation,
  sc: Scratch,
  s: number,
  t: number,
  tether: number,
  excludeMask: number,
  isAttach: Uint8Array,
): number {
  const { layerSeen, layerDist, swapStamp, swapLayer, swapReach, sources } = sc;
  const heap = sc.heap2;
  const stamp = sc.stamp;
  const limit = tether + TETHER_EPS_M;
  const { offsets, targets, arcFlags, arcLengthM } = c;
  let count = 1;
  sources[0] = t;
  for (let k = 0; count > 0; k++) {
    const ls = ++sc.layerStamp;
    if (ls >= 0x7fffffff) {
      sc.layerStamp = 1;
      layerSeen.fill(0);
    }
    heap.clear();
    for (let i = 0; i < count; i++) {
      const v = sources[i];
      layerSeen[v] = sc.layerStamp;
      layerDist[v] = 0;
      heap.push(v, 0);
    }
    const cur = sc.layerStamp;
    count = 0;
    while (heap.size > 0) {
      const d = heap.topKey1();
      const v = heap.pop();
      if (d > layerDist[v]) continue;
      if (swapStamp[v] !== stamp) {
        swapStamp[v] = stamp;
        swapLayer[v] = k;
        swapReach[v] = d;
        if (isAttach[v]) sources[count++] = v;
      }
      for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
        if (arcFlags[a] & excludeMask) continue;
        const nd = d + arcLengthM[a];
        if (nd > limit) continue;
        const u = targets[a];
        if (layerSeen[u] !== cur || nd < layerDist[u]) {
          layerSeen[u] = cur;
          layerDist[u] = nd;
          heap.push(u, nd);
        }
      }
    }
    if (swapStamp[s] === stamp) return k;
  }
  return -1;
}
