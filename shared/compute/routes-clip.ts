import type { CompiledStation } from './compiled-station';
import { MinHeap } from './routes-heap';
import { scratchFor, targetBound, type LabelPath, type LabelSearchParams } from './routes-search';
import { TETHER_EPS_M } from './tether';

/**
 * The clip graph of a compiled station for one tether length and set of excluded arcs: a route is
 * a chain of stretches, each from a clip point (the start, or an attach point where the crew
 * member swapped) to the next swap or the end, with at most one tether length paid out. The least
 * time of a stretch between two attach points does not depend on the rest of the route, so it is
 * computed once per attach point (an exact bounded search over (node, paid out)), and the exact
 * modes become a shortest-path search over attach points, plus a first and a last stretch.
 */
export interface ClipGraph {
  tetherLengthM: number;
  excludeMask: number;
  attachNodes: Int32Array;
  /** attach index of a node, -1 for other nodes */
  attachIndex: Int32Array;
  offsets: Int32Array;
  /** attach index of the far end of each stretch */
  targets: Int32Array;
  /** least time (arc weights, not carrying) of a stretch within the tether */
  seconds: Float64Array;
  /** clip landmarks: fewest stretches from landmark k to attach a at a * count + k */
  landmarkCount: number;
  landmarkHops: Int32Array;
  /**
   * per attach point t and clip landmark k, over the attach points of t's row (its last
   * stretches): least stretch count at t * count + k (UNREACHED if none is reached), greatest at
   * the same place in rowHopsHi (-1 if none), and whether one is not reached in rowHopsOff
   */
  rowHopsLo: Int32Array;
  rowHopsHi: Int32Array;
  rowHopsOff: Uint8Array;
  buildMs: number;
  memoryBytes: number;
  query: ClipQueryState | null;
  /** tether balls of nodes that are not attach points (extra attach points of queries), see ballOf */
  balls: Map<number, Ball>;
  /** least-time walks of whole-tether stretches between attach points, see stretchArcs */
  walks: Map<number, StretchWalk>;
  /** stretches kept for a `sum` search, by swap cost in stretch seconds (see pruneStretches) */
  pruned: Map<number, ClipRows>;
  /** the stretches worth a swap at their far end (see swapPointRows) */
  swapRows: ClipRows;
  /** swapRows transposed: for each attach point, the attach points whose swapRows reach it */
  swapRowsIn: { offsets: Int32Array; sources: Int32Array };
  /** cost landmarks for a `sum` search, by swap cost in stretch seconds (see costMarksFor) */
  costMarks: Map<number, CostMarks>;
}

/** Least clip-to-clip cost from a few attach points to every attach point (see costMarksFor). */
export interface CostMarks {
  count: number;
  /** least cost from landmark k to attach point a at a * count + k (Infinity when unreachable) */
  cost: Float64Array;
  /** least cost from landmark k to attach point t by a last stretch, at t * count + k */
  toEnd: Float64Array;
  buildMs: number;
}

export interface ClipRows {
  offsets: Int32Array;
  targets: Int32Array;
  seconds: Float64Array;
  buildMs: number;
}

const UNREACHED = 0x3fffffff;
const CLIP_LANDMARKS = 4;
const CACHED_PER_WEIGHTS = 4;

/** Scratch of the bounded stretch search, sized by the station's nodes. */
class StretchScratch {
  stamp = 0;
  bestStamp: Int32Array;
  bestLen: Float64Array;
  size = 0;
  node = new Int32Array(1024);
  parent = new Int32Array(1024);
  arc = new Int32Array(1024);
  len = new Float64Array(1024);
  time = new Float64Array(1024);
  heap = new MinHeap(1024);
  hitCount = 0;
  hitNode: Int32Array;
  hitTime: Float64Array;

  constructor(n: number) {
    this.bestStamp = new Int32Array(n);
    this.bestLen = new Float64Array(n);
    this.hitNode = new Int32Array(n);
    this.hitTime = new Float64Array(n);
  }

  add(v: number, parent: number, arc: number, len: number, time: number): number {
    if (this.size === this.node.length) {
      const cap = this.size * 2;
      const grow = <T extends Int32Array | Float64Array>(a: T): T => {
        const b = new (a.constructor as new (n: number) => T)(cap);
        b.set(a);
        return b;
      };
      this.node = grow(this.node);
      this.parent = grow(this.parent);
      this.arc = grow(this.arc);
      this.len = grow(this.len);
      this.time = grow(this.time);
    }
    const x = this.size++;
    this.node[x] = v;
    this.parent[x] = parent;
    this.arc[x] = arc;
    this.len[x] = len;
    this.time[x] = time;
    return x;
  }

  nextStamp(): number {
    if (++this.stamp >= 0x7fffffff) {
      this.stamp = 1;
      this.bestStamp.fill(0);
    }
    return this.stamp;
  }
}

const stretchScratch = new WeakMap<CompiledStation, StretchScratch>();

function stretchScratchFor(c: CompiledStation): StretchScratch {
  let sc = stretchScratch.get(c);
  if (!sc) stretchScratch.set(c, (sc = new StretchScratch(c.nodeCount)));
  return sc;
}

/** Where a stretch search is headed: its end, and the landmark lower bounds towards it. */
interface StretchGoal {
  dst: number;
  bound: (v: number) => boolean;
  hSeconds: Float64Array;
  hMetres: Float64Array;
}

/**
 * Least-time walks from src with at most `limit` metres, exact: labels (node, time, length) are
 * settled in time order and a label is dropped when a settled one at its node is no longer. The
 * first label settled at a node is its least time within the limit.
 *
 * Without a goal it lists each node marked in `clips` (and `extra`) as first settled, with that
 * time, in hitNode/hitTime, and returns -1. With a goal it returns the label of the least-time walk to
 * goal.dst (-1 if none), goal-directed: labels settle in order of time plus the landmark lower
 * bound on time to dst (consistent, so labels at one node still settle in time order and the same
 * dominance holds), and a label whose length plus the lower bound on metres to dst passes the
 * limit is never made, so it visits the lens between the two ends instead of the whole ball.
 */
function stretchSearch(
  c: CompiledStation,
  weights: Float64Array,
  excludeMask: number,
  limit: number,
  src: number,
  sc: StretchScratch,
  goal: StretchGoal | null,
  clips: Uint8Array = c.isAttach,
  extra = -1,
): number {
  const stamp = sc.nextStamp();
  const { bestStamp, bestLen, heap, hitNode, hitTime } = sc;
  const { offsets, targets, arcFlags, arcLengthM } = c;
  const dst = goal ? goal.dst : -1;
  sc.size = 0;
  let hits = 0;
  heap.clear();
  if (goal && !goal.bound(src)) return -1;
  heap.push(sc.add(src, -1, -1, 0, 0), goal ? goal.hSeconds[src] : 0, 0);
  while (heap.size > 0) {
    const x = heap.pop();
    const v = sc.node[x];
    const len = sc.len[x];
    if (bestStamp[v] === stamp) {
      if (len >= bestLen[v]) continue;
    } else {
      if (v === dst) return x;
      if (!goal && v !== src && (clips[v] || v === extra)) {
        hitNode[hits] = v;
        hitTime[hits++] = sc.time[x];
      }
      bestStamp[v] = stamp;
    }
    bestLen[v] = len;
    const time = sc.time[x];
    for (let a = offsets[v], end = offsets[v + 1]; a < end; a++) {
      if (arcFlags[a] & excludeMask) continue;
      const nl = len + arcLengthM[a];
      if (nl > limit) continue;
      const u = targets[a];
      if (bestStamp[u] === stamp && nl >= bestLen[u]) continue;
      const nt = time + weights[a];
      if (!goal) heap.push(sc.add(u, x, a, nl, nt), nt, nl);
      else if (goal.bound(u) && nl + goal.hMetres[u] <= limit)
        heap.push(sc.add(u, x, a, nl, nt), nt + goal.hSeconds[u], nl);
    }
  }
  sc.hitCount = hits;
  return -1;
}

/** The least-time walk src → dst within the tether (the label of its end in `sc`, or -1). */
function stretchWalk(
  c: CompiledStation,
  p: LabelSearchParams,
  limit: number,
  src: number,
  dst: number,
  sc: StretchScratch,
): number {
  const ns = scratchFor(c);
  const bound = targetBound(c, ns, dst, 1, p.maxSpeedMps, p.landmarkTimesValid);
  const goal = { dst, bound, hSeconds: ns.hSeconds, hMetres: ns.hMetres };
  return stretchSearch(c, p.weights, p.excludeMask, limit, src, sc, goal);
}

/** Every node within one tether of a node, by least time, with that time (see ballOf). */
interface Ball {
  nodes: Int32Array;
  seconds: Float64Array;
}

/** Balls a clip graph keeps at the most: a day's portable anchors, many times over. */
const BALLS_KEPT = 64;

const everyNode = new WeakMap<CompiledStation, Uint8Array>();

/**
 * The least-time stretch within the tether from node v to every node it reaches, in the order a
 * stretch search from v settles them (v itself left out): the stretch search from v lists, for any
 * set of clips, exactly the nodes of this list that are clips, in this order and with these times,
 * since which nodes are clips only decides what it lists, not what it settles. Kept per clip graph
 * (its weights, tether and exclusions are the ball's), so a day's queries that share an extra
 * attach point search its stretches once.
 */
function ballOf(cq: ClipQuery, v: number): Ball {
  const { cg, c } = cq;
  const held = cg.balls.get(v);
  if (held) {
    cg.balls.delete(v);
    cg.balls.set(v, held);
    return held;
  }
  let all = everyNode.get(c);
  if (!all) everyNode.set(c, (all = new Uint8Array(c.nodeCount).fill(1)));
  const st = cq.stretch;
  stretchSearch(c, cq.p.weights, cg.excludeMask, cq.limit, v, st, null, all);
  const ball = { nodes: st.hitNode.slice(0, st.hitCount), seconds: st.hitTime.slice(0, st.hitCount) };
  if (cg.balls.size >= BALLS_KEPT) {
    const [oldest, gone] = cg.balls.entries().next().value!;
    cg.balls.delete(oldest);
    cg.memoryBytes -= gone.nodes.byteLength + gone.seconds.byteLength;
  }
  cg.balls.set(v, ball);
  cg.memoryBytes += ball.nodes.byteLength + ball.seconds.byteLength;
  return ball;
}

/** The arcs of a stretch's least-time walk, in order, and its time (arc weights). */
interface StretchWalk {
  arcs: Int32Array;
  seconds: number;
}

/** Whole-tether stretch walks a clip graph keeps at the most (a day's routes share many). */
const WALKS_KEPT = 16_384;

/**
 * The least-time walk from attach point a to attach point b within the whole tether (a stretch
 * between two swaps), as stretchWalk finds it. It depends only on the clip graph's weights, tether
 * and exclusions (and the speeds the weights come from), so it is kept per clip graph, the
 * least recently used dropped first, and a day's routes along the same rails walk each stretch once.
 */
function stretchArcs(cq: ClipQuery, a: number, b: number): StretchWalk {
  const { cg, c, p, stretch: st } = cq;
  const key = cg.attachIndex[a] * cq.A + cg.attachIndex[b];
  const held = cg.walks.get(key);
  if (held) {
    cg.walks.delete(key);
    cg.walks.set(key, held);
    return held;
  }
  const x = stretchWalk(c, p, cq.limit, a, b, st);
  if (x < 0) throw new Error('internal: a clip-graph stretch has no walk');
  const walk = { arcs: walkArcs(st, x), seconds: st.time[x] };
  if (cg.walks.size >= WALKS_KEPT) {
    const [oldest, gone] = cg.walks.entries().next().value!;
    cg.walks.delete(oldest);
    cg.memoryBytes -= gone.arcs.byteLength;
  }
  cg.walks.set(key, walk);
  cg.memoryBytes += walk.arcs.byteLength;
  return walk;
}

/** The arcs from the stretch search's start to label x, in walk order. */
function walkArcs(st: StretchScratch, x: number): Int32Array {
  let n = 0;
  for (let y = x; st.arc[y] !== -1; y = st.parent[y]) n++;
  const arcs = new Int32Array(n);
  for (let y = x; st.arc[y] !== -1; y = st.parent[y]) arcs[--n] = st.arc[y];
  return arcs;
}

/** Farthest-first landmarks over the clip graph, by stretch count (breadth-first). */
function clipLandmarks(offsets: Int32Array, targets: Int32Array, count: number): Int32Array {
  const A = offsets.length - 1;
  const K = Math.min(count, A);
  const hops = new Int32Array(A * K);
  const nearest = new Int32Array(A).fill(UNREACHED + 1);
  const level = new Int32Array(A);
  const queue = new Int32Array(A);
  let next = 0;
  for (let k = 0; k < K; k++) {
    level.fill(UNREACHED);
    level[next] = 0;
    let qh = 0;
    let qt = 0;
    queue[qt++] = next;
    while (qh < qt) {
      const a = queue[qh++];
      for (let e = offsets[a], end = offsets[a + 1]; e < end; e++) {
        const b = targets[e];
        if (level[b] !== UNREACHED) continue;
        level[b] = level[a] + 1;
        queue[qt++] = b;
      }
    }
    let far = 0;
    for (let a = 0; a < A; a++) {
      hops[a * K + k] = level[a];
      if (level[a] < nearest[a]) nearest[a] = level[a];
      if (nearest[a] > nearest[far]) far = a;
    }
    next = far;
  }
  return hops;
}

/** Landmark stretch counts of each attach point's row, as ClipGraph.rowHopsLo/Hi/Off. */
function rowHops(offsets: Int32Array, targets: Int32Array, hops: Int32Array, K: number) {
  const A = offsets.length - 1;
  const lo = new Int32Array(A * K).fill(UNREACHED);
  const hi = new Int32Array(A * K).fill(-1);
  const off = new Uint8Array(A * K);
  for (let a = 0; a < A; a++) {
    const at = a * K;
    for (let e = offsets[a], end = offsets[a + 1]; e < end; e++) {
      const base = targets[e] * K;
      for (let k = 0; k < K; k++) {
        const v = hops[base + k];
        if (v === UNREACHED) off[at + k] = 1;
        else {
          if (v < lo[at + k]) lo[at + k] = v;
          if (v > hi[at + k]) hi[at + k] = v;
        }
      }
    }
  }
  return { lo, hi, off };
}

function buildClipGraph(
  c: CompiledStation,
  weights: Float64Array,
  tetherLengthM: number,
  excludeMask: number,
): ClipGraph {
  const t0 = performance.now();
  const n = c.nodeCount;
  const attachIndex = new Int32Array(n).fill(-1);
  let A = 0;
  for (let v = 0; v < n; v++) if (c.isAttach[v]) attachIndex[v] = A++;
  const attachNodes = new Int32Array(A);
  for (let v = 0; v < n; v++) if (attachIndex[v] >= 0) attachNodes[attachIndex[v]] = v;
  const sc = stretchScratchFor(c);
  const limit = tetherLengthM + TETHER_EPS_M;
  const offsets = new Int32Array(A + 1);
  let targets = new Int32Array(Math.max(16, A * 8));
  let seconds = new Float64Array(targets.length);
  let m = 0;
  for (let i = 0; i < A; i++) {
    stretchSearch(c, weights, excludeMask, limit, attachNodes[i], sc, null);
    const hits = sc.hitCount;
    if (m + hits > targets.length) {
      const cap = Math.max(2 * targets.length, m + hits);
      const t2 = new Int32Array(cap);
      const s2 = new Float64Array(cap);
      t2.set(targets.subarray(0, m));
      s2.set(seconds.subarray(0, m));
      targets = t2;
      seconds = s2;
    }
    for (let h = 0; h < hits; h++) {
      targets[m] = attachIndex[sc.hitNode[h]];
      seconds[m++] = sc.hitTime[h];
    }
    offsets[i + 1] = m;
  }
  targets = targets.slice(0, m);
  seconds = seconds.slice(0, m);
  const landmarkHops = clipLandmarks(offsets, targets, CLIP_LANDMARKS);
  const {
    lo: rowHopsLo,
    hi: rowHopsHi,
    off: rowHopsOff,
  } = rowHops(offsets, targets, landmarkHops, Math.min(CLIP_LANDMARKS, A));
  const swapRows = swapPointRows(offsets, targets, seconds);
  const swapRowsIn = transposeRows(swapRows);
  const cg: ClipGraph = {
    tetherLengthM,
    excludeMask,
    attachNodes,
    attachIndex,
    offsets,
    targets,
    seconds,
    landmarkCount: Math.min(CLIP_LANDMARKS, A),
    landmarkHops,
    rowHopsLo,
    rowHopsHi,
    rowHopsOff,
    buildMs: 0,
    memoryBytes: 0,
    query: null,
    balls: new Map(),
    walks: new Map(),
    pruned: new Map(),
    swapRows,
    swapRowsIn,
    costMarks: new Map(),
  };
  cg.memoryBytes = [
    attachNodes,
    attachIndex,
    offsets,
    targets,
    seconds,
    landmarkHops,
    rowHopsLo,
    rowHopsHi,
    rowHopsOff,
    swapRows.offsets,
    swapRows.targets,
    swapRows.seconds,
    swapRowsIn.offsets,
    swapRowsIn.sources,
  ].reduce((b, a) => b + a.byteLength, 0);
  cg.buildMs = performance.now() - t0;
  return cg;
}

/**
 * The stretches a search minimising time + swapCost·swaps needs. A stretch a→c can go when some
 * attach point b has t(a→b) + swapCost + t(b→c) ≤ t(a→c) with both parts strictly shorter than
 * t(a→c): the walk a→b→c (one swap at b) fits the tether and costs no more. Exact: by induction
 * on stretch time every dropped stretch is replaced by a chain of kept ones that costs no more, so
 * the least cost over the kept stretches is the least over all. `swapCost` is in stretch seconds
 * (the per-query swap cost over the carrying factor). Rows are kept in time order, as built.
 */
export function pruneStretches(cg: ClipGraph, swapCost: number): ClipRows {
  const cached = cg.pruned.get(swapCost);
  if (cached) return cached;
  const { offsets, targets, seconds } = cg;
  const dropped = new Int32Array(offsets.length - 1);
  const rows = keepRows(offsets, targets, seconds, (a, mark, inRow, rowTime, keep) => {
    const from = offsets[a];
    const end = offsets[a + 1];
    let maxTime = 0;
    for (let e = from; e < end; e++) if (seconds[e] > maxTime) maxTime = seconds[e];
    for (let e = from; e < end; e++) {
      const viaB = seconds[e] + swapCost;
      if (viaB >= maxTime) break;
      const b = targets[e];
      for (let g = offsets[b], gEnd = offsets[b + 1]; g < gEnd; g++) {
        const total = viaB + seconds[g];
        if (total > maxTime) break;
        const cc = targets[g];
        if (inRow[cc] !== mark) continue;
        const direct = rowTime[cc];
        if (total <= direct && seconds[e] < direct && seconds[g] < direct) dropped[cc] = mark;
      }
    }
    for (let e = from; e < end; e++) keep[e] = dropped[targets[e]] === mark ? 0 : 1;
  });
  cg.memoryBytes += rows.offsets.byteLength + rows.targets.byteLength + rows.seconds.byteLength;
  cg.pruned.set(swapCost, rows);
  return rows;
}

/**
 * Rows of the stretches `decide` keeps: it is called per attach point a with a's row marked
 * (inRow[c] === mark, rowTime[c] its time) and sets keep[e] for each e of the row.
 */
function keepRows(
  offsets: Int32Array,
  targets: Int32Array,
  seconds: Float64Array,
  decide: (a: number, mark: number, inRow: Int32Array, rowTime: Float64Array, keep: Uint8Array) => void,
): ClipRows {
  const t0 = performance.now();
  const A = offsets.length - 1;
  const inRow = new Int32Array(A);
  const rowTime = new Float64Array(A);
  const keep = new Uint8Array(targets.length);
  const keptOffsets = new Int32Array(A + 1);
  let m = 0;
  for (let a = 0; a < A; a++) {
    for (let e = offsets[a]; e < offsets[a + 1]; e++) {
      inRow[targets[e]] = a + 1;
      rowTime[targets[e]] = seconds[e];
    }
    decide(a, a + 1, inRow, rowTime, keep);
    for (let e = offsets[a]; e < offsets[a + 1]; e++) m += keep[e];
    keptOffsets[a + 1] = m;
  }
  const keptTargets = new Int32Array(m);
  const keptSeconds = new Float64Array(m);
  for (let e = 0, k = 0; e < targets.length; e++) {
    if (!keep[e]) continue;
    keptTargets[k] = targets[e];
    keptSeconds[k++] = seconds[e];
  }
  return {
    offsets: keptOffsets,
    targets: keptTargets,
    seconds: keptSeconds,
    buildMs: performance.now() - t0,
  };
}

/**
 * The stretches worth a swap at their far end, for either objective. From a, the swap point c
 * is dropped when for every stretch c→d (d ≠ a) either a reaches d directly in no more time than
 * via c (one swap fewer), or a does not reach d and some other b from a has a better key
 * t(a→b) + t(b→d), then a farther b, then a larger index: a walk a→c→d then becomes a→d or a→b→d,
 * with no more time and no more swaps. Exact: following such replacements from the start of a
 * walk, each step keeps a stretch or drops a swap (the best b for such a d is kept), so every optimum over
 * all stretches has one as good over the kept ones. Only a walk ending at an attach point can use
 * them: the stretch to another end is not among c's rows.
 */
function swapPointRows(offsets: Int32Array, targets: Int32Array, seconds: Float64Array): ClipRows {
  const A = offsets.length - 1;
  const bestStamp = new Int32Array(A);
  const bestArg = new Int32Array(A);
  const bestVal = new Float64Array(A);
  const bestFar = new Float64Array(A);
  return keepRows(offsets, targets, seconds, (a, mark, inRow, rowTime, keep) => {
    const from = offsets[a];
    const end = offsets[a + 1];
    for (let e = from; e < end; e++) {
      const b = targets[e];
      const tab = seconds[e];
      for (let g = offsets[b], gEnd = offsets[b + 1]; g < gEnd; g++) {
        const d = targets[g];
        if (inRow[d] === mark) continue;
        const v = tab + seconds[g];
        if (bestStamp[d] === mark) {
          const bv = bestVal[d];
          if (v > bv || (v === bv && (tab < bestFar[d] || (tab === bestFar[d] && b < bestArg[d])))) continue;
        }
        bestStamp[d] = mark;
        bestVal[d] = v;
        bestFar[d] = tab;
        bestArg[d] = b;
      }
    }
    for (let e = from; e < end; e++) {
      const cc = targets[e];
      const tac = seconds[e];
      keep[e] = 0;
      for (let g = offsets[cc], gEnd = offsets[cc + 1]; g < gEnd; g++) {
        const d = targets[g];
        if (d === a) continue;
        if (inRow[d] === mark) {
          if (rowTime[d] <= tac + seconds[g]) continue;
        } else if (bestArg[d] !== cc) continue;
        keep[e] = 1;
        break;
      }
    }
  });
}

/** Rows turned round: sources[offsets[b] .. offsets[b + 1]) are the a whose row holds b. */
function transposeRows(rows: ClipRows): { offsets: Int32Array; sources: Int32Array } {
  const A = rows.offsets.length - 1;
  const offsets = new Int32Array(A + 1);
  for (let e = 0; e < rows.targets.length; e++) offsets[rows.targets[e] + 1]++;
  for (let b = 0; b < A; b++) offsets[b + 1] += offsets[b];
  const fill = offsets.slice(0, A);
  const sources = new Int32Array(rows.targets.length);
  for (let a = 0; a < A; a++)
    for (let e = rows.offsets[a]; e < rows.offsets[a + 1]; e++) sources[fill[rows.targets[e]]++] = a;
  return { offsets, sources };
}

const COST_MARKS = 16;

/**
 * Cost landmarks for a search minimising time + swapCost·swaps (`swapCost` in stretch seconds):
 * farthest-first attach points L and, for every attach point a, the least cost of a chain of
 * stretches from a clip at L to a clip at a, each stretch its time plus the swap at its far end
 * (Dijkstra over all stretches: the swap rows keep the optima that end at an attach point with a
 * last stretch from the full rows, not a chain that stops with a swap). For a search towards t,
 * cost(a → t) ≥ cost(L → t) − cost(L → a) (the triangle inequality; consistent), where
 * cost(L → t) is the least over t's last stretches. The landmark bound on time plus the one on
 * swaps takes the two least apart, and where the least-time and the fewest-swap routes part, that
 * falls short by a share of every stretch; these take the two together.
 */
export function costMarksFor(cg: ClipGraph, swapCost: number): CostMarks {
  const cached = cg.costMarks.get(swapCost);
  if (cached) return cached;
  const t0 = performance.now();
  const { offsets, targets, seconds } = cg;
  const A = offsets.length - 1;
  const K = Math.min(COST_MARKS, A);
  const cost = new Float64Array(A * K);
  const dist = new Float64Array(A);
  const nearest = new Float64Array(A).fill(Infinity);
  const heap = new MinHeap(1024);
  let next = 0;
  for (let k = 0; k < K; k++) {
    dist.fill(Infinity);
    dist[next] = 0;
    heap.clear();
    heap.push(next, 0);
    while (heap.size > 0) {
      const d = heap.topKey1();
      const a = heap.pop();
      if (d > dist[a]) continue;
      for (let e = offsets[a], end = offsets[a + 1]; e < end; e++) {
        const b = targets[e];
        const nd = d + seconds[e] + swapCost;
        if (nd < dist[b]) {
          dist[b] = nd;
          heap.push(b, nd);
        }
      }
    }
    // the next landmark: the attach point farthest from all so far (unreached ones first)
    let far = 0;
    let farCost = -1;
    for (let a = 0; a < A; a++) {
      cost[a * K + k] = dist[a];
      if (dist[a] < nearest[a]) nearest[a] = dist[a];
      if (nearest[a] > farCost) {
        farCost = nearest[a];
        far = a;
      }
    }
    next = far;
  }
  const toEnd = new Float64Array(A * K).fill(Infinity);
  for (let t = 0; t < A; t++) {
    const at = t * K;
    for (let e = offsets[t], end = offsets[t + 1]; e < end; e++) {
      const base = targets[e] * K;
      for (let k = 0; k < K; k++) {
        const v = cost[base + k] + seconds[e];
        if (v < toEnd[at + k]) toEnd[at + k] = v;
      }
    }
  }
  const marks: CostMarks = { count: K, cost, toEnd, buildMs: performance.now() - t0 };
  cg.memoryBytes += cost.byteLength + toEnd.byteLength;
  cg.costMarks.set(swapCost, marks);
  return marks;
}

const clipCache = new WeakMap<Float64Array, Map<string, ClipGraph>>();

/**
 * The clip graph for these arc weights (not carrying: carrying scales every stretch alike),
 * tether length and exclusions; built on first use and kept for the last few combinations.
 */
export function clipGraphFor(
  c: CompiledStation,
  weights: Float64Array,
  tetherLengthM: number,
  excludeMask: number,
): ClipGraph {
  const key = `${tetherLengthM}|${excludeMask}`;
  const held = clipCache.get(weights)?.get(key);
  return remember(weights, key, held ?? buildClipGraph(c, weights, tetherLengthM, excludeMask));
}

/** Clip graphs kept in this thread, least recently used first: what the memory budget counts. */
const kept: { weights: Float64Array; key: string; cg: ClipGraph }[] = [];

/**
 * Bytes the kept clip graphs of this thread may take together (their typed arrays, as
 * `memoryBytes` counts them). The most recent one is always kept, whatever its size; older ones
 * go, least recently used first, until the rest fit.
 */
export const DEFAULT_CLIP_MEMORY_BYTES = 512 * 2 ** 20;
let budgetBytes = DEFAULT_CLIP_MEMORY_BYTES;

export function setClipMemoryBudget(bytes: number): void {
  budgetBytes = bytes;
  evictOverBudget();
}

/** The clip graphs kept in this thread: how many, their bytes, and the budget they live within. */
export function clipMemory(): { graphs: number; bytes: number; budgetBytes: number } {
  return { graphs: kept.length, bytes: kept.reduce((n, k) => n + k.cg.memoryBytes, 0), budgetBytes };
}

function forget(index: number): void {
  const [gone] = kept.splice(index, 1);
  clipCache.get(gone.weights)?.delete(gone.key);
}

function evictOverBudget(): void {
  // memoryBytes grows as a graph gains pruned rows and cost marks, so the sum is taken afresh
  let total = clipMemory().bytes;
  while (kept.length > 1 && total > budgetBytes) {
    total -= kept[0].cg.memoryBytes;
    forget(0);
  }
}

/**
 * Files a clip graph as the most recent, dropping the oldest for its weights beyond the few kept
 * and then the least recently used of any weights while all of them exceed the memory budget.
 */
function remember(weights: Float64Array, key: string, cg: ClipGraph): ClipGraph {
  let byKey = clipCache.get(weights);
  if (!byKey) clipCache.set(weights, (byKey = new Map()));
  const at = kept.findIndex((k) => k.weights === weights && k.key === key);
  if (at >= 0) kept.splice(at, 1);
  else if (byKey.size >= CACHED_PER_WEIGHTS) {
    const oldest = byKey.keys().next().value!;
    const i = kept.findIndex((k) => k.weights === weights && k.key === oldest);
    if (i >= 0) forget(i);
    else byKey.delete(oldest);
  }
  byKey.set(key, cg);
  kept.push({ weights, key, cg });
  evictOverBudget();
  return cg;
}

/** A clip graph as plain data: typed arrays a worker thread can build and hand over without a copy. */
export type ClipGraphParts = Omit<ClipGraph, 'query' | 'balls' | 'walks' | 'pruned' | 'costMarks'> & {
  pruned: [number, ClipRows][];
  costMarks: [number, CostMarks][];
};

/**
 * The clip graph for these parameters, built with the stretches kept for free swaps (what the
 * `fastest` fallback uses) and the cost landmarks for each of `swapCosts` (stretch seconds: the
 * station's swap time, for `balanced` without carrying) as well, as parts and the buffers to
 * transfer.
 */
export function buildClipGraphParts(
  c: CompiledStation,
  weights: Float64Array,
  tetherLengthM: number,
  excludeMask: number,
  swapCosts: readonly number[] = [],
): { parts: ClipGraphParts; transfer: ArrayBuffer[] } {
  const cg = clipGraphFor(c, weights, tetherLengthM, excludeMask);
  pruneStretches(cg, 0);
  for (const sc of swapCosts) if (sc > 0) costMarksFor(cg, sc);
  const { query: _query, balls: _balls, walks: _walks, pruned, costMarks, ...rest } = cg;
  const parts: ClipGraphParts = { ...rest, pruned: [...pruned], costMarks: [...costMarks] };
  const rows = [parts.swapRows, ...parts.pruned.map(([, r]) => r)];
  const arrays = [
    parts.attachNodes,
    parts.attachIndex,
    parts.offsets,
    parts.targets,
    parts.seconds,
    parts.landmarkHops,
    parts.rowHopsLo,
    parts.rowHopsHi,
    parts.rowHopsOff,
    parts.swapRowsIn.offsets,
    parts.swapRowsIn.sources,
  ];
  for (const r of rows) arrays.push(r.offsets, r.targets, r.seconds);
  for (const [, m] of parts.costMarks) arrays.push(m.cost, m.toEnd);
  return { parts, transfer: [...new Set(arrays.map((a) => a.buffer as ArrayBuffer))] };
}

/**
 * Files a clip graph built elsewhere (buildClipGraphParts on a station compiled from the same
 * document) under these weights, so later searches use it. The caller vouches that the weights are
 * the ones it was built with.
 */
export function adoptClipGraph(weights: Float64Array, parts: ClipGraphParts): ClipGraph {
  const cg: ClipGraph = {
    ...parts,
    query: null,
    balls: new Map(),
    walks: new Map(),
    pruned: new Map(parts.pruned),
    costMarks: new Map(parts.costMarks),
  };
  return remember(weights, `${parts.tetherLengthM}|${parts.excludeMask}`, cg);
}

/** Whether the clip graph for these parameters is already built. */
export function hasClipGraph(weights: Float64Array, tetherLengthM: number, excludeMask: number): boolean {
  return clipCache.get(weights)?.has(`${tetherLengthM}|${excludeMask}`) ?? false;
}

/**
 * Per-query arrays over clip slots, reset by a stamp. A slot is an attach point's index, or, past
 * the station's A attach points, one of the query's extra attach points (A + j); in the search's
 * arrays the slot after them (A + extras) stands for t.
 */
interface ClipQueryState {
  stamp: number;
  /** slots the arrays below hold, t's included */
  capacity: number;
  /** the search: the best key parts so far at each clip (see searchClips) and the clip before it */
  seen: Int32Array;
  cost1: Float64Array;
  cost2: Float64Array;
  pred: Int32Array;
  /** lower bounds on the rest of the route from a fresh clip at each slot, memoised */
  restStamp: Int32Array;
  rest1: Float64Array;
  rest2: Float64Array;
  /** slots with a last stretch to t (its least time within the limit on arrival, stretch seconds) */
  lastStamp: Int32Array;
  last: Float64Array;
  lastList: Int32Array;
  /** the first clips (see firstClips), with the time of the first stretch to each */
  firstStamp: Int32Array;
  firstCount: number;
  firstList: Int32Array;
  firstTime: Float64Array;
  /** fewest swaps from each levelled slot to t (see swapLevels) */
  levelStamp: Int32Array;
  level: Int32Array;
  queue: Int32Array;
  /** per clip landmark: least and greatest stretch count to t's last-stretch attach points, and whether one is unreached */
  endHopsLo: Int32Array;
  endHopsHi: Int32Array;
  endHopsOff: Uint8Array;
  /**
   * per cost landmark: the least cost from it to t (ahead), and what the bound back takes off (the
   * least of: for an attach-point t, between it and t plus a swap; over t's last clips, the most of
   * between it and the clip less the last stretch, gathered in backToEnd)
   */
  markToEnd: Float64Array;
  markFromEnd: Float64Array;
  backToEnd: Float64Array;
  /** extra attach point j's stretches: slots and times at extraRow[j] .. extraRow[j + 1] */
  extraRow: number[];
  extraTargets: number[];
  extraSeconds: number[];
  /** per attach point, its stretches to extra attach points: a list from toExtraHead through toExtraNext */
  toExtraStamp: Int32Array;
  toExtraHead: Int32Array;
  toExtraNext: number[];
  toExtraSlot: number[];
  toExtraSeconds: number[];
  /** per extra attach point j and cost landmark k, at j * count + k: its potentials ahead and back */
  extraAhead: number[];
  extraBack: number[];
  heap: MinHeap;
}

function queryState(cg: ClipGraph, extras: number): ClipQueryState {
  const A = cg.attachNodes.length;
  let q = cg.query;
  if (!q || q.capacity < A + extras + 1) {
    const n = A + 1 + Math.max(extras, 8);
    q = cg.query = {
      stamp: q?.stamp ?? 0,
      capacity: n,
      seen: new Int32Array(n),
      cost1: new Float64Array(n),
      cost2: new Float64Array(n),
      pred: new Int32Array(n),
      restStamp: new Int32Array(n),
      rest1: new Float64Array(n),
      rest2: new Float64Array(n),
      lastStamp: new Int32Array(n),
      last: new Float64Array(n),
      lastList: new Int32Array(n),
      firstStamp: new Int32Array(n),
      firstCount: 0,
      firstList: new Int32Array(n),
      firstTime: new Float64Array(n),
      levelStamp: new Int32Array(n),
      level: new Int32Array(n),
      queue: new Int32Array(n),
      endHopsLo: new Int32Array(cg.landmarkCount),
      endHopsHi: new Int32Array(cg.landmarkCount),
      endHopsOff: new Uint8Array(cg.landmarkCount),
      markToEnd: new Float64Array(COST_MARKS),
      markFromEnd: new Float64Array(COST_MARKS),
      backToEnd: new Float64Array(COST_MARKS),
      extraRow: [],
      extraTargets: [],
      extraSeconds: [],
      toExtraStamp: new Int32Array(A),
      toExtraHead: new Int32Array(A),
      toExtraNext: [],
      toExtraSlot: [],
      toExtraSeconds: [],
      extraAhead: [],
      extraBack: [],
      heap: new MinHeap(1024),
    };
  }
  if (++q.stamp >= 0x7fffffff) {
    q.stamp = 1;
    for (const a of [q.seen, q.restStamp, q.lastStamp, q.firstStamp, q.levelStamp, q.toExtraStamp]) a.fill(0);
  }
  return q;
}

/** One clip-graph query: its terms, and the arrays its phases fill. */
interface ClipQuery {
  c: CompiledStation;
  cg: ClipGraph;
  p: LabelSearchParams;
  s: number;
  t: number;
  /** the station's attach points: slots below A are theirs */
  A: number;
  /** the query's extra attach points (slot A + j is extras[j]); t only when the arrival is capped */
  extras: readonly number[];
  /** t's slot in the search's arrays */
  end: number;
  /** attach indices of s and t, -1 for another node */
  sIdx: number;
  tIdx: number;
  /** s's slot when s is an attach point (the station's or an extra one), else -1 */
  sSlot: number;
  /** t's slot when a clip at t counts (a swap at the end, to meet a limit on arrival), else -1 */
  tSlot: number;
  /** a slot never offered: t's, when a clip there cannot help */
  tSkip: number;
  lex: boolean;
  /** the query's factor on stretch seconds (carrying) */
  f: number;
  swapCost: number;
  /** the tether, with the float margin */
  limit: number;
  /** metres out at the start; 0 is a fresh clip at s (the anchor behind does not matter then) */
  startPaid: number;
  fresh: boolean;
  /** at most this much out on arrival (the tether when the request sets no lower limit) */
  cap: number;
  capped: boolean;
  /** the last stretches are t's row of the clip graph (t an attach point, no cap, no extras) */
  plainEnd: boolean;
  /** the query's attach points, node by node */
  clips: Uint8Array;
  /** the stretches between the first clip and the last one (see middleRows) */
  rows: ClipRows;
  /** the swap rows, where they serve a clip far from the end and the extra attach points (see nearEnd); else null */
  farRows: ClipRows | null;
  state: ClipQueryState;
  stretch: StretchScratch;
  /** station landmark bounds to t: after toT(v), hSeconds[v] (times f) and hMetres[v] */
  toT: (v: number) => boolean;
  hSeconds: Float64Array;
  hMetres: Float64Array;
}

/**
 * The stretches the search follows between clips (a last stretch always comes from the full rows,
 * or from a search back from t): for free swaps the ones pruneStretches keeps; towards an
 * attach-point t with no limit on arrival and no extra attach points the swap rows; else the full
 * rows, which the search narrows to the swap rows and, near the end, the stretches into clips with
 * a last stretch or one to an extra attach point (see nearEnd). Each keeps an optimum of its case.
 */
function middleRows(cg: ClipGraph, lex: boolean, swapCost: number, plainEnd: boolean): ClipRows {
  if (!lex && swapCost === 0) return pruneStretches(cg, 0);
  return plainEnd ? cg.swapRows : cg;
}

/**
 * Whether a station attach point a may have a stretch to a clip whose next stretch is not one of
 * the swap rows' kind: a last stretch to t, or a stretch to an extra attach point. Such a clip is
 * within one tether of t or of an extra attach point, so a is within two, and the station
 * landmarks' lower bound on metres rules that out for most a. Out of a the search follows the
 * swap rows, and, when a is near, the stretches of its full row to such clips: on an optimal
 * chain a → c → d with c of neither kind, d is an attach point of c's row, and the swap rows drop
 * a → c only where a → d, or a → b → d with a → b kept, is as good (see swapPointRows); replacing
 * stretch by stretch from the start of the chain ends on one made of swap rows and stretches into
 * clips of those two kinds, as good.
 */
function nearEnd(cq: ClipQuery, a: number): boolean {
  const v = cq.cg.attachNodes[a];
  const reach = 2 * cq.limit;
  if (!cq.toT(v) || cq.hMetres[v] <= reach) return true;
  const lm = cq.c.landmarks;
  const K = lm.count;
  const metres = lm.metres;
  for (const x of cq.extras) {
    let bound = 0;
    for (let k = 0; k < K; k++) {
      const mx = metres[x * K + k];
      const mv = metres[v * K + k];
      if (mx === Infinity || mv === Infinity) {
        if (mx !== mv) bound = Infinity;
        continue;
      }
      const d = mx > mv ? mx - mv : mv - mx;
      if (d > bound) bound = d;
    }
    if (bound <= reach) return true;
  }
  return false;
}

function clipQuery(
  c: CompiledStation,
  cg: ClipGraph,
  p: LabelSearchParams,
  s: number,
  t: number,
  toT: (v: number) => boolean,
  ns: ReturnType<typeof scratchFor>,
): ClipQuery {
  const lex = p.objective === 'lex';
  const tether = p.tetherLengthM;
  const capped = (p.endPaidOutMaxM ?? Infinity) < tether;
  const cap = capped ? p.endPaidOutMaxM! : tether;
  // without a limit on arrival a swap at t never helps: t is then no clip
  const extras = (p.extraAttach ?? []).filter((v) => capped || v !== t);
  const A = cg.attachNodes.length;
  const slotOf = (v: number) => {
    const j = extras.indexOf(v);
    return cg.attachIndex[v] >= 0 ? cg.attachIndex[v] : j < 0 ? -1 : A + j;
  };
  const tIdx = cg.attachIndex[t];
  const plainEnd = tIdx >= 0 && !capped && extras.length === 0;
  const sSlot = p.isAttach[s] ? slotOf(s) : -1;
  return {
    c,
    cg,
    p,
    s,
    t,
    A,
    extras,
    end: A + extras.length,
    sIdx: cg.attachIndex[s],
    tIdx,
    sSlot,
    tSlot: capped && p.isAttach[t] ? slotOf(t) : -1,
    tSkip: capped ? -1 : tIdx,
    lex,
    f: p.secondsFactor,
    swapCost: p.swapCost,
    limit: tether + TETHER_EPS_M,
    startPaid: p.startPaidOutM,
    fresh: p.startPaidOutM <= 0,
    cap,
    capped,
    plainEnd,
    clips: p.isAttach,
    rows: middleRows(cg, lex, p.swapCost, plainEnd),
    farRows: plainEnd || (!lex && p.swapCost === 0) ? null : cg.swapRows,
    state: queryState(cg, extras.length),
    stretch: stretchScratchFor(c),
    toT,
    hSeconds: ns.hSeconds,
    hMetres: ns.hMetres,
  };
}

/** The slot of a node the query's stretch searches list: its attach index, else its extra slot, else -1. */
function slotOf(cq: ClipQuery, v: number): number {
  const a = cq.cg.attachIndex[v];
  if (a >= 0) return a;
  const j = cq.extras.indexOf(v);
  return j < 0 ? -1 : cq.A + j;
}

function nodeOf(cq: ClipQuery, slot: number): number {
  return slot < cq.A ? cq.cg.attachNodes[slot] : cq.extras[slot - cq.A];
}

/**
 * Exact `lex` (fewest swaps, then least time) or `sum` (time + swapCost per swap) route by A* over
 * the clip graph; the same optimum as labelSearch with the same parameters. A route is a chain of
 * clips: s (when a fresh clip at an attach point) or the first attach point a swap is made at,
 * then one per swap, then t; between two clips the least-time stretch within the tether. A start
 * state makes the first stretch shorter (tether less the metres out), extra attach points are
 * clips with stretches searched per query, and a limit on arrival makes the last stretch shorter,
 * with a swap at t as one more way to meet it. Phases: the extra attach points' stretches, the
 * last stretches, the first clips, the swap levels (fewest swaps only), the bounds, one A* over
 * clips, and the walk along the chain found.
 */
export function clipSearch(c: CompiledStation, s: number, t: number, p: LabelSearchParams): LabelPath | null {
  const cg = clipGraphFor(c, p.weights, p.tetherLengthM, p.excludeMask);
  const ns = scratchFor(c);
  const toT = targetBound(c, ns, t, p.secondsFactor, p.maxSpeedMps, p.landmarkTimesValid);
  if (!toT(s)) return null;
  const cq = clipQuery(c, cg, p, s, t, toT, ns);
  const straight = () => walkClips(cq, [s, t]);
  if (straightAcross(cq)) return straight();
  if (cq.extras.length) extraRows(cq);
  const lastCount = lastStretches(cq);
  const direct = firstClips(cq);
  // a stretch straight to t needs no swap: the answer for fewest swaps, and for a swap cost when
  // no route with a swap (at least that cost plus the least time) could be cheaper
  if (direct < Infinity && (cq.lex || direct <= cq.swapCost + cq.hSeconds[s])) return straight();
  const levelsTo = cq.lex ? swapLevels(cq, lastCount) : -1;
  const rest = restBound(cq, lastCount, levelsTo);
  const chain = searchClips(cq, rest, direct, levelsTo);
  return chain ? walkClips(cq, chain) : null;
}

/**
 * The lower bounds a query's search puts on the rest of a route from a fresh clip at each of its
 * attach points (the station's and the extra ones, t left out): the key parts `rest1`, `rest2` of
 * searchClips (Infinity: cannot reach t). What the tests hold against the least costs.
 */
export function clipRestBounds(
  c: CompiledStation,
  s: number,
  t: number,
  p: LabelSearchParams,
): { node: number; rest1: number; rest2: number }[] {
  const cg = clipGraphFor(c, p.weights, p.tetherLengthM, p.excludeMask);
  const ns = scratchFor(c);
  const toT = targetBound(c, ns, t, p.secondsFactor, p.maxSpeedMps, p.landmarkTimesValid);
  const cq = clipQuery(c, cg, p, s, t, toT, ns);
  if (cq.extras.length) extraRows(cq);
  const lastCount = lastStretches(cq);
  firstClips(cq);
  const rest = restBound(cq, lastCount, cq.lex ? swapLevels(cq, lastCount) : -1);
  const out: { node: number; rest1: number; rest2: number }[] = [];
  for (let a = 0; a < cq.end; a++) {
    const node = nodeOf(cq, a);
    if (node === t) continue;
    const q = cq.state;
    out.push(rest(a) ? { node, rest1: q.rest1[a], rest2: q.rest2[a] } : { node, rest1: Infinity, rest2: 0 });
  }
  return out;
}

/**
 * Between two attach points one stretch apart, from a fresh clip and with no limit on arrival,
 * that stretch is the answer for fewest swaps (no swap), and for a swap cost when it takes no
 * longer than a swap plus the least time of any route. Checked before any other per-query work.
 */
function straightAcross(cq: ClipQuery): boolean {
  const { cg, sIdx, tIdx } = cq;
  if (sIdx < 0 || tIdx < 0 || !cq.fresh || cq.capped) return false;
  for (let e = cg.offsets[tIdx], end = cg.offsets[tIdx + 1]; e < end; e++) {
    if (cg.targets[e] === sIdx) return cq.lex || cq.f * cg.seconds[e] <= cq.swapCost + cq.hSeconds[cq.s];
  }
  return false;
}

/**
 * The extra attach points' stretches: each one's row (the query's attach points in its ball) and,
 * since stretch times are the same both ways, the same stretch from each attach point of that row
 * back to it.
 */
function extraRows(cq: ClipQuery): void {
  const { state: q, A } = cq;
  const { toExtraStamp, toExtraHead, stamp } = q;
  q.extraRow.length = 0;
  q.extraTargets.length = 0;
  q.extraSeconds.length = 0;
  q.toExtraNext.length = 0;
  q.toExtraSlot.length = 0;
  q.toExtraSeconds.length = 0;
  q.extraRow.push(0);
  const clips = cq.clips;
  cq.extras.forEach((x, j) => {
    const ball = ballOf(cq, x);
    for (let h = 0; h < ball.nodes.length; h++) {
      const v = ball.nodes[h];
      if (!clips[v]) continue;
      const b = slotOf(cq, v);
      if (b < 0) continue;
      const time = ball.seconds[h];
      q.extraTargets.push(b);
      q.extraSeconds.push(time);
      if (b >= A) continue;
      if (toExtraStamp[b] !== stamp) {
        toExtraStamp[b] = stamp;
        toExtraHead[b] = -1;
      }
      q.toExtraNext.push(toExtraHead[b]);
      q.toExtraSlot.push(A + j);
      q.toExtraSeconds.push(time);
      toExtraHead[b] = q.toExtraSlot.length - 1;
    }
    q.extraRow.push(q.extraTargets.length);
  });
}

/**
 * The last stretches: the slots within one stretch of t, within the limit on arrival, each with
 * the least time of that stretch (t's row of the clip graph, or a stretch search from t: stretch
 * times are the same both ways), and t's own slot with no time when a clip at t counts. Returns
 * how many, listed in state.lastList.
 */
function lastStretches(cq: ClipQuery): number {
  const { cg, state: q, tIdx } = cq;
  const { lastStamp, last, lastList, stamp } = q;
  let count = 0;
  const add = (b: number, time: number) => {
    lastStamp[b] = stamp;
    last[b] = time;
    lastList[count++] = b;
  };
  if (cq.plainEnd) {
    for (let e = cg.offsets[tIdx], end = cg.offsets[tIdx + 1]; e < end; e++)
      add(cg.targets[e], cg.seconds[e]);
    return count;
  }
  const st = cq.stretch;
  stretchSearch(cq.c, cq.p.weights, cq.p.excludeMask, cq.cap + TETHER_EPS_M, cq.t, st, null, cq.clips);
  for (let h = 0; h < st.hitCount; h++) {
    const b = slotOf(cq, st.hitNode[h]);
    if (b >= 0) add(b, st.hitTime[h]);
  }
  if (cq.tSlot >= 0) add(cq.tSlot, 0);
  return count;
}

/**
 * The first clips: from a fresh clip at an attach point s, s itself; else every slot one first
 * stretch from s (within the tether less the metres out at the start), a swap each, and s itself
 * when it is an attach point (a swap where the crew member stands). Listed with the first
 * stretch's time in state.firstList/firstTime. Returns the time (times f) of a first stretch
 * straight to t within the limit on arrival, Infinity when there is none.
 */
function firstClips(cq: ClipQuery): number {
  const { state: q, sSlot, f, s, t } = cq;
  q.firstCount = 0;
  if (cq.fresh && sSlot >= 0) {
    q.firstStamp[sSlot] = q.stamp;
    return q.lastStamp[sSlot] === q.stamp ? f * q.last[sSlot] : Infinity;
  }
  const add = (a: number, time: number) => {
    q.firstStamp[a] = q.stamp;
    q.firstList[q.firstCount] = a;
    q.firstTime[q.firstCount++] = time;
  };
  const st = cq.stretch;
  const room = cq.p.tetherLengthM - cq.startPaid;
  stretchSearch(cq.c, cq.p.weights, cq.p.excludeMask, room + TETHER_EPS_M, s, st, null, cq.clips, t);
  let direct = Infinity;
  for (let h = 0; h < st.hitCount; h++) {
    const v = st.hitNode[h];
    if (v === t) {
      if (!cq.capped) direct = f * st.hitTime[h];
      if (cq.tSlot < 0) continue;
    }
    const a = slotOf(cq, v);
    if (a >= 0) add(a, st.hitTime[h]);
  }
  if (sSlot >= 0) add(sSlot, 0);
  const endRoom = cq.cap - cq.startPaid + TETHER_EPS_M;
  if (cq.capped && endRoom >= 0) {
    stretchSearch(cq.c, cq.p.weights, cq.p.excludeMask, endRoom, s, st, null, cq.clips, t);
    for (let h = 0; h < st.hitCount; h++) if (st.hitNode[h] === t) direct = f * st.hitTime[h];
  }
  return direct;
}

/**
 * Swap levels, for fewest swaps: the fewest swaps from a fresh clip at each slot to t,
 * breadth-first from the last-stretch slots (level 0) backwards over the stretches the search
 * uses (the full rows and the extra attach points' stretches are their own transpose; the swap
 * rows have theirs), until the level where a first clip is met is complete. Afterwards every
 * levelled slot has its exact level and every other one needs more swaps than the returned
 * level; -1 when the levels ran out first (no first clip reaches t at any number of swaps).
 */
function swapLevels(cq: ClipQuery, lastCount: number): number {
  const { cg, state: q, tSkip, A } = cq;
  const { levelStamp, queue, lastList, stamp } = q;
  const full = cq.rows === cg;
  const inOffsets = full ? cg.offsets : cg.swapRowsIn.offsets;
  const inSources = full ? cg.targets : cg.swapRowsIn.sources;
  const withExtras = cq.extras.length > 0;
  let qt = levelSlots(q, lastList, 0, lastCount, 0, 0, tSkip);
  let reached = firstLevelled(q, 0, qt, 0);
  for (let qh = 0; qh < qt; qh++) {
    const b = queue[qh];
    const next = q.level[b] + 1;
    if (reached >= 0 && next > reached) break;
    const from = qt;
    if (b >= A) qt = levelSlots(q, q.extraTargets, q.extraRow[b - A], q.extraRow[b - A + 1], next, qt, tSkip);
    else {
      qt = levelSlots(q, inSources, inOffsets[b], inOffsets[b + 1], next, qt, tSkip);
      if (withExtras && q.toExtraStamp[b] === stamp)
        for (let x = q.toExtraHead[b]; x !== -1; x = q.toExtraNext[x]) {
          const a = q.toExtraSlot[x];
          if (levelStamp[a] === stamp) continue;
          levelStamp[a] = stamp;
          q.level[a] = next;
          queue[qt++] = a;
        }
    }
    if (reached < 0) reached = firstLevelled(q, from, qt, next);
  }
  return reached;
}

/** Levels the slots of list[from .. to) not levelled yet (t's skipped), queued from qt on; the new qt. */
function levelSlots(
  q: ClipQueryState,
  list: ArrayLike<number>,
  from: number,
  to: number,
  next: number,
  qt: number,
  skip: number,
): number {
  const { levelStamp, level, queue, stamp } = q;
  for (let e = from; e < to; e++) {
    const a = list[e];
    if (levelStamp[a] === stamp || a === skip) continue;
    levelStamp[a] = stamp;
    level[a] = next;
    queue[qt++] = a;
  }
  return qt;
}

/** `next` when a first clip is among queue[from .. to), else -1. */
function firstLevelled(q: ClipQueryState, from: number, to: number, next: number): number {
  for (let i = from; i < to; i++) if (q.firstStamp[q.queue[i]] === q.stamp) return next;
  return -1;
}

/**
 * The lower bound on the rest of a route from a fresh clip at slot a: `rest(a)` fills
 * state.rest1[a] and rest2[a] (the two key parts, see searchClips) and returns false when a cannot
 * reach t. Memoised per query. The bounds:
 * - time: the station landmarks' bound on time to t;
 * - swaps (fewest swaps): the exact level where a is levelled, else one more than the last level;
 *   without levels, the metres landmark bound over the tether and, with no extra attach points
 *   (they shorten stretch counts), the clip landmarks' stretch counts to t's last stretches;
 * - with a swap cost, the cost landmarks (see costMarksTowards) on time and swaps together;
 *   towards an attach point with no extra attach points they alone are the bound (time plus swaps
 *   is seldom higher there).
 * A limit on arrival only removes routes, so a bound without it still holds.
 */
function restBound(cq: ClipQuery, lastCount: number, levelsTo: number): (a: number) => boolean {
  const { cg, state: q, lex, swapCost, tIdx } = cq;
  const { restStamp, rest1, rest2, stamp } = q;
  const withExtras = cq.extras.length > 0;
  const { tSlot, A, extras } = cq;
  const attachNodes = cg.attachNodes;
  const marks = !lex && swapCost > 0 ? costMarksTowards(cq, lastCount) : null;
  if (marks && tIdx >= 0 && !withExtras) {
    return (a: number): boolean => {
      if (restStamp[a] === stamp) return rest1[a] !== Infinity;
      restStamp[a] = stamp;
      // a clip at t has nothing left (t's row, which the landmarks' end cost comes from, lacks t)
      const h = a === tSlot ? 0 : marks(a, 0);
      rest1[a] = h;
      rest2[a] = 0;
      return h !== Infinity;
    };
  }
  if (!withExtras) endHopRanges(cq, lastCount);
  const { endHopsLo, endHopsHi, endHopsOff, level, levelStamp } = q;
  const { hSeconds, hMetres, toT } = cq;
  const hops = cg.landmarkHops;
  const K = withExtras ? 0 : cg.landmarkCount;
  const tether = cq.p.tetherLengthM;
  const swapsAfter = (a: number, v: number): number => {
    if (lex && levelStamp[a] === stamp) return level[a];
    if (lex && levelsTo < 0) return Infinity;
    const need = hMetres[v] - tether;
    let sw = need > TETHER_EPS_M ? Math.ceil(need / tether - 1e-9) : 0;
    if (lex && levelsTo + 1 > sw) sw = levelsTo + 1;
    for (let k = 0, base = a * K; k < K; k++) {
      const ha = hops[base + k];
      let lb: number;
      if (ha === UNREACHED) lb = endHopsOff[k] ? 0 : Infinity;
      else if (endHopsHi[k] < 0) lb = Infinity;
      else lb = ha > endHopsHi[k] ? ha - endHopsHi[k] : ha < endHopsLo[k] ? endHopsLo[k] - ha : 0;
      if (lb > sw) sw = lb;
    }
    return sw;
  };
  return (a: number): boolean => {
    if (restStamp[a] === stamp) return rest1[a] !== Infinity;
    restStamp[a] = stamp;
    const v = a < A ? attachNodes[a] : extras[a - A];
    const sw = lastCount > 0 && toT(v) ? swapsAfter(a, v) : Infinity;
    if (sw === Infinity) {
      rest1[a] = Infinity;
      return false;
    }
    if (lex) {
      rest1[a] = sw;
      rest2[a] = hSeconds[v];
      return true;
    }
    const h = hSeconds[v] + swapCost * sw;
    rest1[a] = marks ? marks(a, h) : h;
    rest2[a] = 0;
    return rest1[a] !== Infinity;
  };
}

/** Per clip landmark, the least and greatest stretch count to t's last-stretch attach points. */
function endHopRanges(cq: ClipQuery, lastCount: number): void {
  const { cg, state: q, tIdx } = cq;
  const { endHopsLo, endHopsHi, endHopsOff } = q;
  const K = cg.landmarkCount;
  if (cq.plainEnd) {
    for (let k = 0, at = tIdx * K; k < K; k++) {
      endHopsLo[k] = cg.rowHopsLo[at + k];
      endHopsHi[k] = cg.rowHopsHi[at + k];
      endHopsOff[k] = cg.rowHopsOff[at + k];
    }
    return;
  }
  endHopsLo.fill(UNREACHED);
  endHopsHi.fill(-1);
  endHopsOff.fill(0);
  for (let h = 0; h < lastCount; h++) {
    const base = q.lastList[h] * K;
    for (let k = 0; k < K; k++) {
      const v = cg.landmarkHops[base + k];
      if (v === UNREACHED) endHopsOff[k] = 1;
      else {
        if (v < endHopsLo[k]) endHopsLo[k] = v;
        if (v > endHopsHi[k]) endHopsHi[k] = v;
      }
    }
  }
}

/**
 * The cost-landmark bound for a swap cost: `marks(a, h)` is the larger of h and the landmarks'
 * bound from slot a, Infinity when a cannot reach t. For each landmark L:
 * cost(a → t) ≥ cost(L → t) − cost(L → a) (ahead), and, since stretch times are the same both
 * ways, back: towards an attach point t, cost(a → t) ≥ cost(a ↔ L) − cost(t ↔ L) − swapCost;
 * towards any t, cost(a → t) ≥ cost(a ↔ L) − max over the last clips c of (cost(c ↔ L) − last(c)),
 * since a route's last clip c has cost(a → c) ≥ cost(a ↔ L) − cost(c ↔ L) and then its last
 * stretch. A landmark that reaches a but not t makes the bound ahead +Infinity, and one that
 * reaches t's last clips but not a the bound back, as they should (a and t are then in different parts);
 * one that reaches neither makes NaN, which no comparison takes. The factor and a float margin
 * (less a hair, so rounding in the sums cannot lift the bound past the cost) go on the largest.
 * Extra attach points are not in the landmarks' chains: see extraPotentials.
 */
function costMarksTowards(cq: ClipQuery, lastCount: number): (a: number, h: number) => number {
  const { cg, state: q, tIdx, f, swapCost, A } = cq;
  const marks = costMarksFor(cg, swapCost / f);
  const count = marks.count;
  const cost = marks.cost;
  const { markToEnd, markFromEnd, backToEnd, extraAhead, extraBack } = q;
  const withExtras = cq.extras.length > 0;
  markFromEnd.fill(Infinity);
  if (tIdx >= 0) for (let k = 0; k < count; k++) markFromEnd[k] = cost[tIdx * count + k] + swapCost / f;
  if (tIdx >= 0 && !withExtras) {
    for (let k = 0; k < count; k++) markToEnd[k] = marks.toEnd[tIdx * count + k];
  } else {
    if (withExtras) extraPotentials(cq, marks);
    markToEnd.fill(Infinity);
    backToEnd.fill(-Infinity);
    for (let h = 0; h < lastCount; h++) {
      const b = q.lastList[h];
      for (let k = 0; k < count; k++) {
        const d = b < A ? cost[b * count + k] : extraAhead[(b - A) * count + k];
        const v = d + q.last[b];
        if (v < markToEnd[k]) markToEnd[k] = v;
        const back = (b < A ? cost[b * count + k] : extraBack[(b - A) * count + k]) - q.last[b];
        if (back > backToEnd[k]) backToEnd[k] = back;
      }
    }
    for (let k = 0; k < count; k++) if (backToEnd[k] < markFromEnd[k]) markFromEnd[k] = backToEnd[k];
    if (withExtras) extraGains(cq, marks);
  }
  const bound = (m: number, h: number): number => {
    if (m === Infinity) return Infinity;
    const lb = f * m * (1 - 1e-12) - 1e-9;
    return lb > h ? lb : h;
  };
  // the station's attach points and the extra ones apart: the first is the search's inner loop
  const station = (a: number, h: number): number => {
    let m = 0;
    for (let k = 0, base = a * count; k < count; k++) {
      const d = cost[base + k];
      const ahead = markToEnd[k] - d;
      if (ahead > m) m = ahead;
      const back = d - markFromEnd[k];
      if (back > m) m = back;
    }
    return bound(m, h);
  };
  if (!withExtras) return station;
  return (a: number, h: number): number => {
    if (a < A) return station(a, h);
    let m = 0;
    for (let k = 0, base = (a - A) * count; k < count; k++) {
      const ahead = markToEnd[k] - extraAhead[base + k];
      if (ahead > m) m = ahead;
      const back = extraBack[base + k] - markFromEnd[k];
      if (back > m) m = back;
    }
    return bound(m, h);
  };
}

/**
 * Cost-landmark potentials of the extra attach points. The landmark bounds are differences of a
 * potential (ahead: cost(L → a); back: minus cost(a ↔ L)) that no stretch between the station's
 * attach points rises by more than its cost. An extra attach point x takes, ahead, the least
 * potential of a station attach point of its row plus the stretch and swap to x, and back the
 * greatest less them, so no stretch into x rises by more than its cost; see extraGains for the
 * stretches out of x.
 */
function extraPotentials(cq: ClipQuery, marks: CostMarks): void {
  const { state: q, A } = cq;
  const { count, cost } = marks;
  const sc = cq.swapCost / cq.f;
  const E = cq.extras.length;
  q.extraAhead.length = E * count;
  q.extraBack.length = E * count;
  for (let j = 0; j < E; j++) {
    for (let k = 0; k < count; k++) {
      let ahead = Infinity;
      let back = -Infinity;
      for (let e = q.extraRow[j], end = q.extraRow[j + 1]; e < end; e++) {
        const u = q.extraTargets[e];
        if (u >= A) continue;
        const d = cost[u * count + k];
        const c = q.extraSeconds[e] + sc;
        if (d + c < ahead) ahead = d + c;
        if (d - c > back) back = d - c;
      }
      q.extraAhead[j * count + k] = ahead;
      q.extraBack[j * count + k] = back;
    }
  }
}

/**
 * A stretch out of an extra attach point x can rise in potential by more than its cost (x may
 * join attach points the station's chains keep far apart). A route passes each clip at most once,
 * so the bounds stay below the cost when each landmark's end potential is lowered by the sum, over
 * the extra attach points, of the most any stretch out of one rises beyond its cost (the last
 * stretch to t included). A sum that is not finite drops the landmark from the bound.
 */
function extraGains(cq: ClipQuery, marks: CostMarks): void {
  const { state: q, A } = cq;
  const { count, cost } = marks;
  const { markToEnd, markFromEnd, extraAhead, extraBack } = q;
  const sc = cq.swapCost / cq.f;
  const E = cq.extras.length;
  for (let k = 0; k < count; k++) {
    let gainAhead = 0;
    let gainBack = 0;
    for (let j = 0; j < E; j++) {
      const x = A + j;
      const ax = extraAhead[j * count + k];
      const bx = extraBack[j * count + k];
      let ga = 0;
      let gb = 0;
      for (let e = q.extraRow[j], end = q.extraRow[j + 1]; e < end; e++) {
        const w = q.extraTargets[e];
        const c = q.extraSeconds[e] + sc;
        const aw = w < A ? cost[w * count + k] : extraAhead[(w - A) * count + k];
        const bw = w < A ? cost[w * count + k] : extraBack[(w - A) * count + k];
        // NaN (both potentials infinite) counts as an unbounded rise
        const up = aw - ax - c;
        if (!(up <= ga)) ga = up === up ? up : Infinity;
        const down = bx - bw - c;
        if (!(down <= gb)) gb = down === down ? down : Infinity;
      }
      if (q.lastStamp[x] === q.stamp) {
        const up = markToEnd[k] - ax - q.last[x];
        if (!(up <= ga)) ga = up === up ? up : Infinity;
        if (markFromEnd[k] !== Infinity) {
          const down = bx - markFromEnd[k] - q.last[x];
          if (!(down <= gb)) gb = down === down ? down : Infinity;
        }
      }
      gainAhead += ga;
      gainBack += gb;
    }
    markToEnd[k] = gainAhead < Infinity ? markToEnd[k] - gainAhead : -Infinity;
    markFromEnd[k] = gainBack < Infinity ? markFromEnd[k] + gainBack : Infinity;
  }
}

/**
 * A* over clips. The key of a clip has two parts: fewest swaps, (swaps, seconds); with a swap
 * cost, (seconds + swapCost × swaps, 0); seconds are times f. A clip is kept only when no
 * earlier one at its slot is as good in both parts, and it is settled in key order plus `rest`
 * (a lower bound; a clip settled again when a better key reaches it), so the first time t is
 * settled its cost is the least. With swap levels, a clip at b lies on a route with the fewest
 * swaps only if b is levelled and its level makes up that count: any other is dropped before its
 * bound is looked up. Returns the chain of clip nodes s … t (s twice when the route swaps where
 * it starts), or null.
 */
function searchClips(
  cq: ClipQuery,
  rest: (a: number) => boolean,
  direct: number,
  levelsTo: number,
): number[] | null {
  const { state: q, lex, f, swapCost, tSkip, sSlot, A, end: T } = cq;
  const { seen, cost1, cost2, pred, rest1, rest2, lastStamp, last, levelStamp, level, heap, stamp } = q;
  const { offsets: ro, targets: rt, seconds: rs } = cq.rows;
  const far = cq.farRows;
  const levelled = lex;
  const withExtras = cq.extras.length > 0;
  const freshAtS = cq.fresh && sSlot >= 0;
  // the fewest swaps of any route (unless the start is a fresh clip at s, the first clip is a swap)
  const fewest = freshAtS ? levelsTo : levelsTo + 1;
  const offerEnd = (from: number, c1: number, c2: number) => {
    if (seen[T] === stamp && (cost1[T] < c1 || (cost1[T] === c1 && cost2[T] <= c2))) return;
    seen[T] = stamp;
    cost1[T] = c1;
    cost2[T] = c2;
    pred[T] = from;
    heap.push(T, c1, c2);
  };
  const offer = (b: number, from: number, c1: number, c2: number) => {
    if (b === tSkip) return;
    if (seen[b] === stamp && (cost1[b] < c1 || (cost1[b] === c1 && cost2[b] <= c2))) return;
    if (levelled && (levelStamp[b] !== stamp || c1 + level[b] > fewest)) return;
    if (!rest(b)) return;
    seen[b] = stamp;
    cost1[b] = c1;
    cost2[b] = c2;
    pred[b] = from;
    heap.push(b, c1 + rest1[b], c2 + rest2[b]);
  };

  heap.clear();
  if (freshAtS) {
    if (!rest(sSlot)) return null;
    seen[sSlot] = stamp;
    cost1[sSlot] = 0;
    cost2[sSlot] = 0;
    pred[sSlot] = -1;
    heap.push(sSlot, rest1[sSlot], rest2[sSlot]);
  } else {
    if (direct < Infinity) offerEnd(-1, lex ? 0 : direct, lex ? direct : 0);
    for (let i = 0; i < q.firstCount; i++) {
      const time = f * q.firstTime[i];
      offer(q.firstList[i], -1, lex ? 1 : time + swapCost, lex ? time : 0);
    }
  }
  let found = false;
  while (heap.size > 0) {
    const k1 = heap.topKey1();
    const k2 = heap.topKey2();
    const a = heap.pop();
    if (a === T) {
      if (k1 !== cost1[T] || k2 !== cost2[T]) continue;
      found = true;
      break;
    }
    const c1 = cost1[a];
    const c2 = cost2[a];
    if (k1 !== c1 + rest1[a] || k2 !== c2 + rest2[a]) continue;
    if (lastStamp[a] === stamp) {
      const time = f * last[a];
      offerEnd(a, lex ? c1 : c1 + time, lex ? c2 + time : 0);
    }
    const swapped = lex ? c1 + 1 : c1 + swapCost;
    if (a >= A) {
      for (let e = q.extraRow[a - A], end = q.extraRow[a - A + 1]; e < end; e++) {
        const time = f * q.extraSeconds[e];
        offer(q.extraTargets[e], a, lex ? swapped : swapped + time, lex ? c2 + time : 0);
      }
      continue;
    }
    let o = ro;
    let tg = rt;
    let sec = rs;
    if (far !== null) {
      o = far.offsets;
      tg = far.targets;
      sec = far.seconds;
      if (nearEnd(cq, a)) {
        // beside the swap rows, the stretches to a clip whose next stretch is not of their kind
        for (let e = ro[a], end = ro[a + 1]; e < end; e++) {
          const b = rt[e];
          if (lastStamp[b] !== stamp && (!withExtras || q.toExtraStamp[b] !== stamp)) continue;
          const time = f * rs[e];
          offer(b, a, lex ? swapped : swapped + time, lex ? c2 + time : 0);
        }
      }
    }
    if (lex) {
      for (let e = o[a], end = o[a + 1]; e < end; e++) {
        const time = f * sec[e];
        offer(tg[e], a, swapped, c2 + time);
      }
    } else {
      // the one key: a slot already reached as cheaply is passed over here, the rest offered
      for (let e = o[a], end = o[a + 1]; e < end; e++) {
        const b = tg[e];
        const c = swapped + f * sec[e];
        if (seen[b] === stamp && cost1[b] <= c) continue;
        offer(b, a, c, 0);
      }
    }
    if (withExtras && q.toExtraStamp[a] === stamp) {
      for (let x = q.toExtraHead[a]; x !== -1; x = q.toExtraNext[x]) {
        const time = f * q.toExtraSeconds[x];
        offer(q.toExtraSlot[x], a, lex ? swapped : swapped + time, lex ? c2 + time : 0);
      }
    }
  }
  if (!found) return null;
  const chain: number[] = [cq.t];
  for (let a = pred[T]; a !== -1; a = pred[a]) chain.push(nodeOf(cq, a));
  if (!freshAtS || pred[T] === -1) chain.push(cq.s);
  return chain.reverse();
}

/**
 * The walk along a chain of clip points: the least-time walk of each stretch within the tether,
 * the first within what the start leaves of it, the last within the limit on arrival.
 */
function walkClips(cq: ClipQuery, clips: number[]): LabelPath {
  const { c, p, stretch: st } = cq;
  const arcs: number[] = [];
  let total = 0;
  for (let i = 0; i + 1 < clips.length; i++) {
    const before = i === 0 ? cq.startPaid : 0;
    let room = p.tetherLengthM - before;
    if (i === clips.length - 2) room = Math.min(room, cq.cap - before);
    const a = clips[i];
    const b = clips[i + 1];
    if (room === p.tetherLengthM && cq.cg.attachIndex[a] >= 0 && cq.cg.attachIndex[b] >= 0) {
      const walk = stretchArcs(cq, a, b);
      total += walk.seconds;
      for (let k = 0; k < walk.arcs.length; k++) arcs.push(walk.arcs[k]);
      continue;
    }
    let x = stretchWalk(c, p, room + TETHER_EPS_M, a, b, st);
    if (x < 0) throw new Error('internal: a clip-graph stretch has no walk');
    total += st.time[x];
    const from = arcs.length;
    for (; st.arc[x] !== -1; x = st.parent[x]) arcs.push(st.arc[x]);
    reverseFrom(arcs, from);
  }
  return { arcs, swaps: clips.length - 2, seconds: total * p.secondsFactor };
}

function reverseFrom(list: number[], from: number): void {
  for (let i = from, j = list.length - 1; i < j; i++, j--) {
    const tmp = list[i];
    list[i] = list[j];
    list[j] = tmp;
  }
}
