import { DEFAULT_SETTINGS, type Vec3 } from '../schemas/station';
import type { PlannedSocket, SocketAssignment, SocketPlanResult } from '../schemas/sockets';
import { REACH_TOLERANCE_M, reachCheck, workPoint } from './reach';

/**
 * The socket planner: the fewest candidate sockets that bring every coverable target
 * within foot-restraint reach (`|t − c| ≤ R`, see reach.ts).
 *
 * Candidates that reach no target are dropped, candidates reaching the same targets are merged
 * (the one with the smaller total distance stays) and candidates whose targets are a strict subset
 * of another's are dropped (skipped above DOMINANCE_LIMIT distinct candidates): none of this
 * changes the smallest count, and a grid of many candidates often shrinks enough to be solved
 * exactly. When at most EXACT_CANDIDATE_LIMIT candidates remain the answer is exact (branch and
 * bound over bitmasks, seeded with the greedy answer, so a greedy answer that is already optimal is
 * kept; a search that runs past its node budget returns its best cover so far, marked not exact);
 * beyond, it is the classic greedy over every reaching candidate (most newly covered targets;
 * ties: an existing socket before a new one, then the smaller summed distance to them, then the
 * earlier candidate). Candidates reaching the same targets keep an existing socket over a new one,
 * so a new socket is only proposed where it reaches something no existing one does. Every covered target is
 * assigned to its nearest chosen socket. Exact answers list sockets in candidate order, greedy ones
 * in pick order.
 */

export const EXACT_CANDIDATE_LIMIT = 30;
/** Above this many distinct candidates the quadratic dominance pass is skipped: the plan is greedy then. */
const DOMINANCE_LIMIT = 1500;
/** Keeps a pathological instance from holding a request: realistic ones need well under 10^4 nodes. */
export const SEARCH_NODE_BUDGET = 2_000_000;

export interface SocketCandidate {
  /** an existing socket's key; without one the candidate is a new socket on a truss face */
  key?: string;
  position: Vec3;
  normal: Vec3;
}

export interface PlanSocketsInput {
  targets: readonly Vec3[];
  candidates: readonly SocketCandidate[];
  standOffM: number;
  radiusM: number;
  yawStepDeg?: number;
  pitchStepDeg?: number;
  /** `auto` (default): exact when few enough candidates remain, else greedy */
  method?: 'auto' | 'exact' | 'greedy';
  /** search nodes before the exact search gives up and returns its best so far with exact: false */
  nodeBudget?: number;
}

export interface SocketPlan extends SocketPlanResult {
  /** indices into the input candidates, parallel to `sockets` */
  chosen: number[];
  /** candidates searched: those reaching a target, less duplicates and dominated ones (greedy: only the first) */
  usefulCandidateCount: number;
  /** branch-and-bound nodes visited (0 for greedy) */
  searchNodes: number;
}

function popcount(x: number): number {
  x -= (x >>> 1) & 0x55555555;
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  return (((x + (x >>> 4)) & 0x0f0f0f0f) * 0x01010101) >>> 24;
}

interface Coverage {
  words: number;
  /** per candidate, a bitset over targets */
  sets: Uint32Array[];
  /** distance[c * targetCount + t] from candidate c's work point to target t */
  distance: Float64Array;
  coverable: Uint32Array;
}

function coverage(input: PlanSocketsInput): Coverage {
  const n = input.targets.length;
  const words = Math.ceil(n / 32);
  const distance = new Float64Array(input.candidates.length * n);
  const coverable = new Uint32Array(words);
  const limit = input.radiusM + REACH_TOLERANCE_M;
  const sets = input.candidates.map((cand, ci) => {
    const c = workPoint(cand.position, cand.normal, input.standOffM);
    const set = new Uint32Array(words);
    input.targets.forEach((t, ti) => {
      const dx = t[0] - c[0],
        dy = t[1] - c[1],
        dz = t[2] - c[2];
      const d = Math.sqrt(dx * dx + dy * dy + dz * dz);
      distance[ci * n + ti] = d;
      if (d <= limit) set[ti >>> 5] |= 1 << (ti & 31);
    });
    for (let w = 0; w < words; w++) coverable[w] |= set[w];
    return set;
  });
  return { words, sets, distance, coverable };
}

const has = (set: Uint32Array, i: number) => (set[i >>> 5] & (1 << (i & 31))) !== 0;

function gainOver(set: Uint32Array, covered: Uint32Array): number {
  let g = 0;
  for (let w = 0; w < set.length; w++) g += popcount(set[w] & ~covered[w]);
  return g;
}

function distanceOver(cov: Coverage, c: number, n: number, covered: Uint32Array | null): number {
  let sum = 0;
  const set = cov.sets[c];
  for (let w = 0; w < set.length; w++) {
    let bits = covered ? set[w] & ~covered[w] : set[w];
    while (bits !== 0) {
      const low = bits & -bits;
      sum += cov.distance[c * n + w * 32 + (31 - Math.clz32(low))];
      bits ^= low;
    }
  }
  return sum;
}

/** Classic greedy over the given candidate indices. */
/** a candidate that is not yet a socket on the station (a grid point): installing one is real work */
const isNew = (input: PlanSocketsInput, c: number) => input.candidates[c].key === undefined;

function greedyCover(
  cov: Coverage,
  n: number,
  pool: readonly number[],
  fresh: (c: number) => boolean,
): number[] {
  const covered = new Uint32Array(cov.words);
  let remaining = gainOver(cov.coverable, covered);
  const chosen: number[] = [];
  while (remaining > 0) {
    let best = -1;
    let bestGain = 0;
    let bestDistance = Infinity;
    for (const c of pool) {
      const g = gainOver(cov.sets[c], covered);
      if (g < bestGain || g === 0) continue;
      if (g > bestGain) {
        best = c;
        bestGain = g;
        bestDistance = NaN;
        continue;
      }
      // equal gain: an existing socket before a new one, then the nearer
      if (fresh(c) !== fresh(best)) {
        if (!fresh(c)) {
          best = c;
          bestDistance = NaN;
        }
        continue;
      }
      if (Number.isNaN(bestDistance)) bestDistance = distanceOver(cov, best, n, covered);
      const d = distanceOver(cov, c, n, covered);
      if (d < bestDistance) {
        best = c;
        bestDistance = d;
      }
    }
    chosen.push(best);
    for (let w = 0; w < cov.words; w++) covered[w] |= cov.sets[best][w];
    remaining -= bestGain;
  }
  return chosen;
}

/**
 * Of candidates reaching the same targets, keeps an existing socket before a new one, then the one
 * with the smallest total distance (then the first): a new socket is only proposed where no existing
 * one reaches the same targets.
 */
function mergeEqual(
  cov: Coverage,
  n: number,
  pool: readonly number[],
  fresh: (c: number) => boolean,
): number[] {
  const kept = new Map<string, { c: number; total: number; fresh: boolean }>();
  for (const c of pool) {
    const key = cov.sets[c].join(',');
    const total = distanceOver(cov, c, n, null);
    const seen = kept.get(key);
    const better = !seen || (seen.fresh && !fresh(c)) || (seen.fresh === fresh(c) && total < seen.total);
    if (better) kept.set(key, { c, total, fresh: fresh(c) });
  }
  return [...kept.values()].map((k) => k.c).sort((a, b) => a - b);
}

/** Drops candidates whose targets are a strict subset of another's (quadratic: callers cap it). */
function undominated(cov: Coverage, pool: readonly number[]): number[] {
  return pool.filter((a) =>
    pool.every((b) => {
      if (a === b) return true;
      const sa = cov.sets[a];
      const sb = cov.sets[b];
      for (let w = 0; w < cov.words; w++) if (sa[w] & ~sb[w]) return true;
      return false;
    }),
  );
}

/**
 * Exact minimum hitting set: each target is a bitmask over at most 30 candidates, and a plan must
 * hit every mask. Branches on the open target with the fewest options; a candidate already tried
 * at a level is excluded from its later siblings, so no set is searched twice. The lower bound is
 * the number of open targets with pairwise disjoint options found by one greedy pass.
 */
function exactHittingSet(
  masks: number[],
  gainOrder: (options: number, chosen: number) => number[],
  seed: number,
  nodeBudget: number,
) {
  let best = seed;
  let bestCount = popcount(seed);
  let nodes = 0;
  const search = (chosen: number, count: number, excluded: number) => {
    if (++nodes > nodeBudget) return;
    let pick = -1;
    let pickOptions = 33;
    let bound = 0;
    let used = 0;
    for (const mask of masks) {
      if (mask & chosen) continue;
      const options = mask & ~excluded;
      const k = popcount(options);
      if (k === 0) return;
      if (k < pickOptions) {
        pick = options;
        pickOptions = k;
      }
      if ((options & used) === 0) {
        bound++;
        used |= options;
      }
    }
    if (pick === -1) {
      if (count < bestCount) {
        best = chosen;
        bestCount = count;
      }
      return;
    }
    if (count + Math.max(bound, 1) >= bestCount) return;
    let tried = excluded;
    for (const bit of gainOrder(pick, chosen)) {
      search((chosen | bit) >>> 0, count + 1, tried);
      tried = (tried | bit) >>> 0;
      if (count + 1 >= bestCount || nodes > nodeBudget) return;
    }
  };
  search(0, 0, 0);
  return { best, nodes: Math.min(nodes, nodeBudget), complete: nodes <= nodeBudget };
}

function exactCover(
  cov: Coverage,
  n: number,
  pool: readonly number[],
  seed: readonly number[],
  nodeBudget: number,
) {
  if (pool.length > EXACT_CANDIDATE_LIMIT) {
    throw new RangeError(
      `exact planning takes at most ${EXACT_CANDIDATE_LIMIT} useful candidates (got ${pool.length})`,
    );
  }
  const unique = new Set<number>();
  for (let t = 0; t < n; t++) {
    let mask = 0;
    pool.forEach((c, bit) => {
      if (has(cov.sets[c], t)) mask |= 1 << bit;
    });
    if (mask !== 0) unique.add(mask >>> 0);
  }
  // A target whose options include all of another target's options is hit whenever that one is.
  const all = [...unique].sort((a, b) => popcount(a) - popcount(b));
  const masks = all.filter((m, i) => !all.some((o, j) => j < i && (o & m) === o));
  const seedMask = seed.reduce((acc, c) => (acc | (1 << pool.indexOf(c))) >>> 0, 0);
  const gainOrder = (options: number, chosen: number) => {
    const bits: { bit: number; gain: number }[] = [];
    for (let b = 0; b < pool.length; b++) {
      const bit = (1 << b) >>> 0;
      if (!(options & bit)) continue;
      let gain = 0;
      for (const m of masks) if (m & bit && !(m & chosen)) gain++;
      bits.push({ bit, gain });
    }
    return bits.sort((x, y) => y.gain - x.gain).map((x) => x.bit);
  };
  const { best, nodes, complete } = exactHittingSet(masks, gainOrder, seedMask, nodeBudget);
  const chosen = pool.filter((_, bit) => best & (1 << bit));
  return { chosen, nodes, complete };
}

export function planSockets(input: PlanSocketsInput): SocketPlan {
  const n = input.targets.length;
  const method = input.method ?? 'auto';
  const cov = coverage(input);
  const reaching = cov.sets.flatMap((set, c) => (set.some((w) => w !== 0) ? [c] : []));
  const fresh = (c: number) => isNew(input, c);
  const merged = method === 'greedy' ? reaching : mergeEqual(cov, n, reaching, fresh);
  const pool = method !== 'greedy' && merged.length <= DOMINANCE_LIMIT ? undominated(cov, merged) : merged;
  let exact = method === 'exact' || (method === 'auto' && pool.length <= EXACT_CANDIDATE_LIMIT);
  let chosen = greedyCover(cov, n, exact ? pool : reaching, fresh);
  let nodes = 0;
  if (exact) {
    const result = exactCover(cov, n, pool, chosen, input.nodeBudget ?? SEARCH_NODE_BUDGET);
    exact = result.complete;
    chosen = result.chosen;
    nodes = result.nodes;
  }
  const uncovered: number[] = [];
  const assignments: SocketAssignment[] = [];
  const yawStepDeg = input.yawStepDeg ?? DEFAULT_SETTINGS.reach.yawStepDeg;
  const pitchStepDeg = input.pitchStepDeg ?? DEFAULT_SETTINGS.reach.pitchStepDeg;
  for (let t = 0; t < n; t++) {
    if (!has(cov.coverable, t)) {
      uncovered.push(t);
      continue;
    }
    let socket = 0;
    for (let s = 1; s < chosen.length; s++) {
      if (cov.distance[chosen[s] * n + t] < cov.distance[chosen[socket] * n + t]) socket = s;
    }
    const cand = input.candidates[chosen[socket]];
    const { reachable: _reachable, ...angles } = reachCheck({
      socketPosition: cand.position,
      socketNormal: cand.normal,
      target: input.targets[t],
      standOffM: input.standOffM,
      radiusM: input.radiusM,
      yawStepDeg,
      pitchStepDeg,
    });
    assignments.push({ target: t, socket, ...angles });
  }
  const sockets: PlannedSocket[] = chosen.map((c) => {
    const cand = input.candidates[c];
    return cand.key ?? { position: cand.position, normal: cand.normal };
  });
  return {
    sockets,
    exact,
    uncovered,
    assignments,
    candidateCount: input.candidates.length,
    chosen,
    usefulCandidateCount: pool.length,
    searchNodes: nodes,
  };
}
