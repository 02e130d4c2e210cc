import { planSockets, type SocketCandidate } from '../shared/compute/socket-planner';
import { gridCandidates } from '../shared/compute/truss-faces';
import { DEFAULT_SETTINGS, type Segment, type Vec3 } from '../shared/schemas/station';

/**
 * Socket planner timings on invented instances: 30 candidates solved exactly against a brute force
 * by increasing subset size, and ~2,000 grid candidates solved greedily against a naive greedy over
 * Sets. The references also check the planner's answer size.
 */

const { standOffM, radiusM } = DEFAULT_SETTINGS.reach;

/** Park–Miller minimal standard generator: enough for reproducible layout noise. */
function rng(seed: number) {
  let s = seed % 2147483647 || 1;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function time<T>(runs: number, f: () => T): { ms: number; value: T } {
  let value = f();
  const ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    value = f();
    ms.push(performance.now() - t0);
  }
  return { ms: median(ms), value };
}

function covers(c: SocketCandidate, t: Vec3): boolean {
  const w = c.position.map((p, i) => p + c.normal[i] * standOffM);
  return Math.hypot(t[0] - w[0], t[1] - w[1], t[2] - w[2]) <= radiusM + 1e-9;
}

/** Reference: try every subset of size 1, 2, … until one covers every coverable target. */
function bruteForceBySize(candidates: SocketCandidate[], targets: Vec3[]): number {
  const words = Math.ceil(targets.length / 32);
  const sets = candidates.map((c) => {
    const s = new Uint32Array(words);
    targets.forEach((t, i) => {
      if (covers(c, t)) s[i >>> 5] |= 1 << (i & 31);
    });
    return s;
  });
  const need = new Uint32Array(words);
  for (const s of sets) for (let w = 0; w < words; w++) need[w] |= s[w];
  if (need.every((w) => w === 0)) return 0;
  const acc = Array.from({ length: candidates.length + 1 }, () => new Uint32Array(words));
  const pick = (depth: number, k: number, from: number): boolean => {
    if (depth === k) return acc[depth].every((w, i) => w === need[i]);
    for (let c = from; c <= candidates.length - (k - depth); c++) {
      for (let w = 0; w < words; w++) acc[depth + 1][w] = acc[depth][w] | sets[c][w];
      if (pick(depth + 1, k, c + 1)) return true;
    }
    return false;
  };
  for (let k = 1; ; k++) if (pick(0, k, 0)) return k;
}

/** Reference: the textbook greedy over Sets, gains recomputed every round. */
function naiveGreedy(candidates: SocketCandidate[], targets: Vec3[]): number {
  const sets = candidates.map((c) => new Set(targets.flatMap((t, i) => (covers(c, t) ? [i] : []))));
  const left = new Set<number>();
  for (const s of sets) for (const t of s) left.add(t);
  let count = 0;
  while (left.size > 0) {
    let best = sets[0];
    let bestGain = -1;
    for (const s of sets) {
      let g = 0;
      for (const t of s) if (left.has(t)) g++;
      if (g > bestGain) {
        best = s;
        bestGain = g;
      }
    }
    for (const t of best) left.delete(t);
    count++;
  }
  return count;
}

/** A worksite cluster above one truss face (+z at z = 0), with 30 sockets scattered on the face. */
function faceInstance(seed: number) {
  const r = rng(seed);
  const targets: Vec3[] = Array.from({ length: 50 }, () => [r() * 4, r() * 1.5, standOffM - 0.4 + r() * 0.9]);
  const candidates: SocketCandidate[] = Array.from({ length: 30 }, (_, i) => ({
    key: `S${i}`,
    position: [-0.3 + r() * 4.6, -0.3 + r() * 2.1, 0],
    normal: [0, 0, 1],
  }));
  return { targets, candidates };
}

/** Sockets facing every way around a dense 1.5 m cluster: few candidates merge or drop out. */
function cloudInstance(seed: number) {
  const r = rng(seed);
  const size = 1.5;
  const targets: Vec3[] = Array.from({ length: 60 }, () => [r() * size, r() * size, r() * size]);
  const candidates: SocketCandidate[] = Array.from({ length: 30 }, (_, i) => {
    const work = [r() * size, r() * size, r() * size];
    const d = [r() - 0.5, r() - 0.5, r() - 0.5];
    const len = Math.hypot(d[0], d[1], d[2]);
    const normal = d.map((c) => c / len) as Vec3;
    return { key: `C${i}`, position: work.map((c, a) => c - normal[a] * standOffM) as Vec3, normal };
  });
  return { targets, candidates };
}

/** An 8-bay truss along x gridded every 0.5 m, with 25 worksites of 8 task points each around it. */
function trussInstance(seed: number) {
  const r = rng(seed);
  const segments: Segment[] = Array.from({ length: 8 }, (_, i) => ({
    key: `B${i}`,
    kind: 'truss',
    center: [i * 5, 0, 0],
    size: [5, 3, 3],
  }));
  const candidates = gridCandidates(segments, 0.5);
  const targets: Vec3[] = [];
  for (let w = 0; w < 25; w++) {
    const c = candidates[Math.floor(r() * candidates.length)];
    const site = c.position.map((p, a) => p + c.normal[a] * standOffM);
    for (let k = 0; k < 8; k++) targets.push(site.map((p) => p + (r() - 0.5) * 1.4) as Vec3);
  }
  return { segments, targets, candidates };
}

export async function run(): Promise<void> {
  const runs = 7;
  console.log(
    `socket planner (h ${standOffM} m, R ${radiusM} m: planning defaults from memory), median of ${runs} runs`,
  );

  const exactCases = [
    ...[1, 2, 3].map((seed) => ({ name: `face cluster #${seed}`, ...faceInstance(seed) })),
    ...[3, 4].map((seed) => ({ name: `dense cloud #${seed}`, ...cloudInstance(seed) })),
  ];
  let slowest = 0;
  for (const inst of exactCases) {
    const planned = time(runs, () => planSockets({ ...inst, standOffM, radiusM }));
    const brute = time(3, () => bruteForceBySize(inst.candidates, inst.targets));
    const greedy = planSockets({ ...inst, standOffM, radiusM, method: 'greedy' });
    const p = planned.value;
    slowest = Math.max(slowest, planned.ms);
    console.log(
      `  exact, ${inst.name}: 30 candidates (${p.usefulCandidateCount} after merging/dominance), ` +
        `${inst.targets.length} targets (${p.uncovered.length} unreachable): ${p.sockets.length} sockets, exact=${p.exact}, ` +
        `${p.searchNodes} search nodes, ${planned.ms.toFixed(2)} ms | brute force by size: ${brute.value} sockets, ` +
        `${brute.ms.toFixed(1)} ms (${(brute.ms / planned.ms).toFixed(0)}× slower) | greedy alone: ${greedy.sockets.length}` +
        (brute.value === p.sockets.length ? '' : '  FAIL: sizes differ'),
    );
  }

  console.log(
    `  target: 30 candidates exact well under 1 s — slowest median ${slowest.toFixed(2)} ms${slowest < 1000 ? '' : '  FAIL'}`,
  );

  const g = trussInstance(7);
  const gridMs = time(runs, () => gridCandidates(g.segments, 0.5)).ms;
  const planned = time(runs, () =>
    planSockets({ targets: g.targets, candidates: g.candidates, standOffM, radiusM }),
  );
  const greedyOnly = time(runs, () =>
    planSockets({ targets: g.targets, candidates: g.candidates, standOffM, radiusM, method: 'greedy' }),
  );
  const naive = time(3, () => naiveGreedy(g.candidates, g.targets));
  const p = planned.value;
  console.log(
    `  greedy, ${g.candidates.length} grid candidates (${p.usefulCandidateCount} useful), ${g.targets.length} targets ` +
      `(${p.uncovered.length} unreachable): ${p.sockets.length} sockets, exact=${p.exact}, ${planned.ms.toFixed(1)} ms ` +
      `(+ ${gridMs.toFixed(1)} ms to grid 8 bays) | naive Set greedy: ${naive.value} sockets, ${naive.ms.toFixed(1)} ms ` +
      `(${(naive.ms / planned.ms).toFixed(1)}× slower); greedy without the dominance pass ${greedyOnly.ms.toFixed(1)} ms`,
  );
}
