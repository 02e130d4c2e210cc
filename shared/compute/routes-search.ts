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
  layerStamp: number;
  layerSeen: Int32Array;
  layerDist: Float64Array;
  swapStamp: Int32Array;
  swapLayer: Int32Array;
  /** nodes quickestWalk has expanded, by query stamp */
  doneStamp: Int32Array;
  tightStamp: number;
  tightSeen: Int32Array;
  tightSettled: Int32Array;
  tightDist: Float64Array;
  swapReach: Float64Array;
  sources: Int32Array;
  heap: MinHeap;
  heap2: MinHeap;
  labels: LabelStore;
}

/**
 * Labels of a search over (node, tether state): parallel arrays, and per node a list of the live
 * labels there (valid for the query stamp given to `begin`).
 */
class LabelStore {
  size = 0;
  node = new Int32Array(1024);
  parent = new Int32Array(1024);
  arc = new Int32Array(1024);
  next = new Int32Array(1024);
  swaps = new Int32Array(1024);
  expanded = new Uint8Array(1024);
  dead = new Uint8Array(1024);
  seconds = new Float64Array(1024);
  paid = new Float64Array(1024);
  p1 = new Float64Array(1024);
  p2 = new Float64Array(1024);
  private stamp = 0;
  private headStamp: Int32Array;
  private head: Int32Array;

  constructor(nodes: number) {
    this.headStamp = new Int32Array(nodes);
    this.head = new Int32Array(nodes);
  }

  /** empties the store for a query with this stamp */
  begin(stamp: number): void {
    this.size = 0;
    this.stamp = stamp;
    if (stamp === 1) this.headStamp.fill(0);
  }

  /** the first live label at v, -1 if none */
  first(v: number): number {
    return this.headStamp[v] === this.stamp ? this.head[v] : -1;
  }

  /** takes label y, after `prev` (-1: y is first), out of v's list, as dead */
  unlink(v: number, prev: number, y: number): void {
    this.dead[y] = 1;
    if (prev === -1) this.head[v] = this.next[y];
    else this.next[prev] = this.next[y];
  }

  /** a new live label at the front of v's list */
  link(v: number, parent: number, arc: number, swaps: number, seconds: number, paid: number): number {
    if (this.size === this.node.length) this.grow();
    const x = this.size++;
    this.node[x] = v;
    this.parent[x] = parent;
    this.arc[x] = arc;
    this.swaps[x] = swaps;
    this.seconds[x] = seconds;
    this.paid[x] = paid;
    this.dead[x] = 0;
    this.expanded[x] = 0;
    this.next[x] = this.first(v);
    this.headStamp[v] = this.stamp;
    this.head[v] = x;
    return x;
  }

  /**
   * A label at v unless one there is no worse in swaps, time and paid out (dropping those it is no
   * worse than): the label's index, or -1.
   */
  offerPareto(v: number, parent: number, arc: number, swaps: number, seconds: number, paid: number): number {
    let prev = -1;
    for (let y = this.first(v); y !== -1;) {
      const nextY = this.next[y];
      const ys = this.swaps[y];
      const yt = this.seconds[y];
      const yp = this.paid[y];
      if (ys <= swaps && yt <= seconds && yp <= paid) return -1;
      if (swaps <= ys && seconds <= yt && paid <= yp) this.unlink(v, prev, y);
      else prev = y;
      y = nextY;
    }
    return this.link(v, parent, arc, swaps, seconds, paid);
  }

  /** the walk that ends in label `goal`, back along its parents */
  walk(goal: number): LabelPath {
    const arcs: number[] = [];
    for (let x = goal; this.arc[x] !== -1; x = this.parent[x]) arcs.push(this.arc[x]);
    return { arcs: arcs.reverse(), swaps: this.swaps[goal], seconds: this.seconds[goal] };
  }

  private grow(): void {
    const cap = this.node.length * 2;
    for (const k of [
      'node',
      'parent',
      'arc',
      'next',
      'swaps',
      'expanded',
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
      layerStamp: 0,
      layerSeen: new Int32Array(n),
      layerDist: new Float64Array(n),
      swapStamp: new Int32Array(n),
      swapLayer: new Int32Array(n),
      doneStamp: new Int32Array(n),
      tightStamp: 0,
      tightSeen: new Int32Array(n),
      tightSettled: new Int32Array(n),
      tightDist: new Float64Array(n),
      swapReach: new Float64Array(n),
      sources: new Int32Array(n),
      heap: new MinHeap(1024),
      heap2: new MinHeap(1024),
      labels: new LabelStore(n),
    };
    scratchByStation.set(c, s);
  }
  s.stamp++;
  if (s.stamp >= 0x7fffffff) {
    s.stamp = 1;
    s.seen.fill(0);
    s.hStamp.fill(0);
    s.swapStamp.fill(0);
    s.doneStamp.fill(0);
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
  /** the nodes isAttach marks beyond the station's attach points (none when absent) */
  extraAttach?: readonly number[];
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
  const { hSeconds, hMetres, heap } = sc;
  const L = sc.labels;
  L.begin(stamp);
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
  const offer = (v: number, parent: number, arc: number, swaps: number, seconds: number, paid: number) => {
    const p1 = lex ? swaps : seconds + swapCost * swaps;
    const p2 = lex ? seconds : 0;
    let prev = -1;
    for (let y = L.first(v); y !== -1;) {
      const nextY = L.next[y];
      const yp1 = L.p1[y];
      if ((yp1 < p1 || (yp1 === p1 && L.p2[y] <= p2)) && L.paid[y] <= paid) return;
      if ((p1 < yp1 || (p1 === yp1 && p2 <= L.p2[y])) && paid <= L.paid[y]) L.unlink(v, prev, y);
      else prev = y;
      y = nextY;
    }
    const x = L.link(v, parent, arc, swaps, seconds, paid);
    L.p1[x] = p1;
    L.p2[x] = p2;
    const sw = swapsNeeded(v, paid);
    if (lex) heap.push(x, swaps + sw, seconds + hSeconds[v]);
    else heap.push(x, p1 + hSeconds[v] + swapCost * sw, hSeconds[v]);
  };

  if (!bound(s)) return null;
  const startPaid = p.startPaidOutM;
  offer(s, -1, -1, 0, 0, startPaid);
  if (isAttach[s] && startPaid > 0) offer(s, -1, -1, 1, 0, 0);
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
      if (isAttach[u] && (u !== t || endLimit < Infinity) && np > 0) offer(u, x, a, swaps + 1, ns, 0);
      offer(u, x, a, swaps, ns, np);
    }
  }
  return goal < 0 ? null : L.walk(goal);
}

/** What quickestWalk found. */
export type QuickestWalk =
  | { fits: true; arcs: number[]; swaps: number }
  /** no walk of the least time fits the tether; `arcs` is one of them */
  | { fits: false; arcs: number[] };

/**
 * The quickest walk s → t and, among the walks of that time (to within `tie` seconds) that fit the
 * tether, the one with the fewest swaps; null when t cannot be reached at all. A* over nodes
 * (keys: least time plus the landmark bound, then least time; the bound is 0 when `useBound` is
 * false) that also keeps at each node the labels (swaps, paid out, time) of the walks reaching it
 * within `tie` of its least time, no label worse in all three than another. Every prefix of a walk
 * within `tie` of the least time to t is within `tie` of the least time to its own end, so no
 * such walk is lost; a node whose labels change after it was expanded (times within `tie` can pop
 * out of order) is queued again, and the search stops once the keys pass the least time to t plus
 * `tie`. Labels start from the start's paid-out length, with a swap at an attach-point start.
 */
export function quickestWalk(
  c: CompiledStation,
  s: number,
  t: number,
  p: LabelSearchParams,
  tie: number,
  useBound: boolean,
): QuickestWalk | null {
  const sc = scratchFor(c);
  const stamp = sc.stamp;
  const { seen, dist, predArc, heap, doneStamp: done } = sc;
  // without the bound the keys are the least times alone (a Dijkstra order), as a reference check
  const bound = targetBound(c, sc, t, p.secondsFactor, p.maxSpeedMps, p.landmarkTimesValid);
  const hSeconds = useBound ? sc.hSeconds : new Float64Array(c.nodeCount);
  const L = sc.labels;
  L.begin(stamp);
  heap.clear();
  const { offsets, targets, arcFlags, arcLengthM } = c;
  const { weights, secondsFactor: f, excludeMask, isAttach } = p;
  const limit = p.tetherLengthM + TETHER_EPS_M;
  const endLimit = (p.endPaidOutMaxM ?? Infinity) + TETHER_EPS_M;
  // with a limit on arrival, a swap at t counts, and a walk may go on past t to swap and come back
  const capped = endLimit < Infinity;
  let best = Infinity;

  if (!bound(s)) return null;
  seen[s] = stamp;
  dist[s] = 0;
  predArc[s] = -1;
  L.offerPareto(s, -1, -1, 0, 0, p.startPaidOutM);
  if (isAttach[s] && p.startPaidOutM > 0) L.offerPareto(s, -1, -1, 1, 0, 0);
  heap.push(s, hSeconds[s], 0);
  while (heap.size > 0) {
    const k = heap.topKey1();
    if (k > best + tie) break;
    const v = heap.pop();
    const d = dist[v];
    if (k > d + hSeconds[v]) continue;
    if (v === t) {
      if (best === Infinity) best = d;
      if (!capped) continue;
    }
    // least times first, as in a plain A*
    for (let a = offsets[v], end = offsets[v + 1]; done[v] !== stamp && a < end; a++) {
      if (arcFlags[a] & excludeMask) continue;
      const u = targets[a];
      const nd = d + weights[a] * f;
      if (seen[u] === stamp && nd >= dist[u]) continue;
      if (!bound(u)) continue;
      seen[u] = stamp;
      dist[u] = nd;
      predArc[u] = a;
      heap.push(u, nd + hSeconds[u], nd);
    }
    done[v] = stamp;
    // then the labels of v not yet carried on
    for (let x = L.first(v); x !== -1; x = L.next[x]) {
      if (L.expanded[x]) continue;
      L.expanded[x] = 1;
      const g = L.seconds[x];
      if (g > d + tie) continue;
      const swaps = L.swaps[x];
      const paid = L.paid[x];
      for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
        if (arcFlags[a] & excludeMask) continue;
        const u = targets[a];
        if (seen[u] !== stamp) continue;
        const ng = g + weights[a] * f;
        if (ng > dist[u] + tie || ng + hSeconds[u] > best + tie) continue;
        const np = paid + arcLengthM[a];
        if (np > limit) continue;
        let added = false;
        const swapHere = isAttach[u] && (u !== t || capped) && np > 0;
        if (swapHere) added = L.offerPareto(u, x, a, swaps + 1, ng, 0) >= 0;
        added = L.offerPareto(u, x, a, swaps, ng, np) >= 0 || added;
        // a node already expanded carries the new label on when it comes round again
        if (added && done[u] === stamp && (u !== t || capped)) heap.push(u, dist[u] + hSeconds[u], dist[u]);
      }
    }
  }
  if (best === Infinity) return null;
  let goal = -1;
  for (let x = L.first(t); x !== -1; x = L.next[x]) {
    if (L.seconds[x] > best + tie || L.paid[x] > endLimit) continue;
    if (
      goal < 0 ||
      L.swaps[x] < L.swaps[goal] ||
      (L.swaps[x] === L.swaps[goal] && L.seconds[x] < L.seconds[goal])
    )
      goal = x;
  }
  if (goal < 0) return { fits: false, arcs: predArcsPath(c, predArc, s, t) };
  return { fits: true, arcs: L.walk(goal).arcs, swaps: L.swaps[goal] };
}

/**
 * The walk s → t with the fewest swaps, if fewer than `fewerThan`, among the walks that fit the
 * tether and take at most `maxSeconds`; null if there is none. Meant for a limit at (to within
 * rounding) the least time of any walk: such walks then run along least times to t, and the
 * search sees only the nodes settleTimesToTarget settles. Labels (node, swaps, seconds, paid out)
 * are set in order of swaps, then seconds plus the exact time to t; a label no better in all three
 * than another at its node is dropped (under a time limit, fewer swaps do not make up for more
 * time). The start label carries the start's paid-out length, and a limit on the tether out on
 * arrival holds, as in the label search.
 */
export function fewestSwapsWithin(
  c: CompiledStation,
  s: number,
  t: number,
  p: LabelSearchParams,
  maxSeconds: number,
  fewerThan: number,
): LabelPath | null {
  settleTimesToTarget(c, s, t, p, maxSeconds);
  const sc = scratchFor(c);
  const stamp = sc.stamp;
  const { heap, tightSettled: settled, tightDist: toT } = sc;
  const mark = sc.tightStamp;
  if (settled[s] !== mark) return null;
  const L = sc.labels;
  L.begin(stamp);
  heap.clear();
  const { offsets, targets, arcFlags, arcLengthM } = c;
  const { weights, secondsFactor: f, excludeMask, isAttach } = p;
  const limit = p.tetherLengthM + TETHER_EPS_M;
  // with a limit on arrival, a label at t with more out goes on, to swap and come back
  const endLimit = (p.endPaidOutMaxM ?? Infinity) + TETHER_EPS_M;

  const offer = (v: number, parent: number, arc: number, swaps: number, seconds: number, paid: number) => {
    if (swaps >= fewerThan) return;
    const x = L.offerPareto(v, parent, arc, swaps, seconds, paid);
    if (x >= 0) heap.push(x, swaps, seconds + toT[v]);
  };

  offer(s, -1, -1, 0, 0, p.startPaidOutM);
  if (isAttach[s] && p.startPaidOutM > 0) offer(s, -1, -1, 1, 0, 0);
  while (heap.size > 0) {
    const x = heap.pop();
    if (L.dead[x]) continue;
    const v = L.node[x];
    if (v === t && L.paid[x] <= endLimit) return L.walk(x);
    const swaps = L.swaps[x];
    const seconds = L.seconds[x];
    const paid = L.paid[x];
    for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
      if (arcFlags[a] & excludeMask) continue;
      const u = targets[a];
      if (settled[u] !== mark) continue;
      const ns = seconds + weights[a] * f;
      if (ns + toT[u] > maxSeconds) continue;
      const np = paid + arcLengthM[a];
      if (np > limit) continue;
      if (isAttach[u] && (u !== t || endLimit < Infinity) && np > 0) offer(u, x, a, swaps + 1, ns, 0);
      offer(u, x, a, swaps, ns, np);
    }
  }
  return null;
}

/**
 * Least seconds to t (arc weights times the factor) of every node on some walk s → t of at most
 * `maxSeconds`: A* from t towards s with the landmark bound to s (arc times are the same both
 * ways), settling nodes while their key is within the limit. Afterwards `tightSettled[v] ===
 * tightStamp` marks those nodes, with their exact time to t in `tightDist`; a node not settled
 * has time to t plus the bound from s beyond the limit, so it is on no such walk.
 */
function settleTimesToTarget(
  c: CompiledStation,
  s: number,
  t: number,
  p: LabelSearchParams,
  maxSeconds: number,
): void {
  const sc = scratchFor(c);
  if (++sc.tightStamp >= 0x7fffffff) {
    sc.tightStamp = 1;
    sc.tightSeen.fill(0);
    sc.tightSettled.fill(0);
  }
  const { tightSeen: seen, tightSettled: settled, tightDist: dist, hSeconds, heap } = sc;
  const mark = sc.tightStamp;
  const bound = targetBound(c, sc, s, p.secondsFactor, p.maxSpeedMps, p.landmarkTimesValid);
  const { offsets, targets, arcFlags } = c;
  const { weights, secondsFactor: f, excludeMask } = p;
  heap.clear();
  if (!bound(t)) return;
  seen[t] = mark;
  dist[t] = 0;
  heap.push(t, hSeconds[t]);
  while (heap.size > 0) {
    const k = heap.topKey1();
    if (k > maxSeconds) break;
    const v = heap.pop();
    if (settled[v] === mark) continue;
    settled[v] = mark;
    const d = dist[v];
    for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
      if (arcFlags[a] & excludeMask) continue;
      const u = targets[a];
      if (settled[u] === mark) continue;
      const nd = d + weights[a] * f;
      if (seen[u] === mark && nd >= dist[u]) continue;
      if (!bound(u) || nd + hSeconds[u] > maxSeconds) continue;
      seen[u] = mark;
      dist[u] = nd;
      heap.push(u, nd + hSeconds[u]);
    }
  }
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
