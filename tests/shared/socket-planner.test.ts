import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { EXACT_CANDIDATE_LIMIT, planSockets, type SocketCandidate } from '@shared/compute/socket-planner';
import type { Vec3 } from '@shared/schemas/station';

// Independent of the module: coverage straight from |t − (p + n̂h)| ≤ R.
function reaches(c: SocketCandidate, t: Vec3, h: number, r: number): boolean {
  const len = Math.hypot(...c.normal);
  const w = c.position.map((p, i) => p + (c.normal[i] / len) * h);
  return Math.hypot(t[0] - w[0], t[1] - w[1], t[2] - w[2]) <= r + 1e-9;
}

function coverOf(candidates: SocketCandidate[], targets: Vec3[], h: number, r: number): boolean[][] {
  return candidates.map((c) => targets.map((t) => reaches(c, t, h, r)));
}

function coverable(cov: boolean[][], n: number): number[] {
  return Array.from({ length: n }, (_, t) => t).filter((t) => cov.some((row) => row[t]));
}

/** The smallest subset covering every coverable target, by trying all subsets. */
function bruteForceSize(cov: boolean[][], n: number): number {
  const need = coverable(cov, n);
  let best = Infinity;
  for (let s = 0; s < 1 << cov.length; s++) {
    const size = cov.reduce((k, _, c) => k + ((s >> c) & 1), 0);
    if (size >= best) continue;
    if (need.every((t) => cov.some((row, c) => (s >> c) & 1 && row[t]))) best = size;
  }
  return need.length === 0 ? 0 : best;
}

const quarter = fc.integer({ min: -8, max: 8 }).map((k) => k / 4);
const point = fc.tuple(quarter, quarter, quarter) as fc.Arbitrary<Vec3>;
const normal = fc
  .tuple(fc.integer({ min: -2, max: 2 }), fc.integer({ min: -2, max: 2 }), fc.integer({ min: -2, max: 2 }))
  .filter((v) => v.some((c) => c !== 0))
  .map((v) => {
    const len = Math.hypot(...v);
    return v.map((c) => c / len) as Vec3;
  });
const candidate = fc.record({ position: point, normal });
const instance = (maxCandidates: number, maxTargets: number) =>
  fc.record({
    candidates: fc.array(candidate, { minLength: 0, maxLength: maxCandidates }),
    targets: fc.array(point, { minLength: 1, maxLength: maxTargets }),
    standOffM: fc.constantFrom(0, 0.5, 1),
    radiusM: fc.constantFrom(0.5, 0.7, 1, 1.5),
  });

const covers = (cov: boolean[][], chosen: number[], t: number) => chosen.some((c) => cov[c][t]);

describe('socket planner against brute force', () => {
  it('exact: the smallest count, covering every coverable target', () => {
    fc.assert(
      fc.property(instance(12, 14), (inst) => {
        const plan = planSockets(inst);
        const cov = coverOf(inst.candidates, inst.targets, inst.standOffM, inst.radiusM);
        expect(plan.exact).toBe(true);
        expect(plan.chosen).toHaveLength(bruteForceSize(cov, inst.targets.length));
        expect(new Set(plan.chosen).size).toBe(plan.chosen.length);
        for (const t of coverable(cov, inst.targets.length)) expect(covers(cov, plan.chosen, t)).toBe(true);
      }),
      { numRuns: 400 },
    );
  });

  it('uncovered is exactly the targets no candidate reaches', () => {
    fc.assert(
      fc.property(
        instance(12, 14),
        fc.constantFrom('auto', 'greedy') as fc.Arbitrary<'auto' | 'greedy'>,
        (inst, method) => {
          const plan = planSockets({ ...inst, method });
          const cov = coverOf(inst.candidates, inst.targets, inst.standOffM, inst.radiusM);
          const expected = inst.targets.map((_, t) => t).filter((t) => !cov.some((row) => row[t]));
          expect(plan.uncovered).toEqual(expected);
          expect(plan.assignments.map((a) => a.target)).toEqual(coverable(cov, inst.targets.length));
        },
      ),
      { numRuns: 300 },
    );
  });

  it('greedy covers everything coverable within (ln n + 1) × the exact count', () => {
    fc.assert(
      fc.property(instance(12, 20), (inst) => {
        const greedy = planSockets({ ...inst, method: 'greedy' });
        const exact = planSockets({ ...inst, method: 'exact' });
        const cov = coverOf(inst.candidates, inst.targets, inst.standOffM, inst.radiusM);
        expect(greedy.exact).toBe(false);
        for (const t of coverable(cov, inst.targets.length)) expect(covers(cov, greedy.chosen, t)).toBe(true);
        expect(greedy.chosen.length).toBeGreaterThanOrEqual(exact.chosen.length);
        expect(greedy.chosen.length).toBeLessThanOrEqual(
          (Math.log(inst.targets.length) + 1) * exact.chosen.length + 1e-9,
        );
      }),
      { numRuns: 300 },
    );
  });

  it('assigns each covered target to its nearest chosen socket, with the reach it reports', () => {
    fc.assert(
      fc.property(instance(12, 14), (inst) => {
        const plan = planSockets(inst);
        for (const a of plan.assignments) {
          const t = inst.targets[a.target];
          const dist = plan.chosen.map((c) => {
            const { position: p, normal: n } = inst.candidates[c];
            return Math.hypot(
              t[0] - p[0] - n[0] * inst.standOffM,
              t[1] - p[1] - n[1] * inst.standOffM,
              t[2] - p[2] - n[2] * inst.standOffM,
            );
          });
          expect(a.distanceM).toBeCloseTo(Math.min(...dist), 9);
          expect(a.distanceM).toBeLessThanOrEqual(inst.radiusM + 1e-9);
          expect(dist[a.socket]).toBeCloseTo(a.distanceM, 9);
        }
      }),
      { numRuns: 200 },
    );
  });
});

describe('socket planner cases', () => {
  const up: Vec3 = [0, 0, 1];
  // a row of sockets 1 m apart along x; h 1, R 0.7 (planning defaults from memory)
  const row = (count: number, key = true): SocketCandidate[] =>
    Array.from({ length: count }, (_, i) => ({
      ...(key ? { key: `S${i}` } : {}),
      position: [i, 0, 0] as Vec3,
      normal: up,
    }));
  const reach = { standOffM: 1, radiusM: 0.7 };

  it('picks the one socket that reaches two targets over two that reach one each', () => {
    const targets: Vec3[] = [
      [0.4, 0, 1],
      [0.6, 0, 1],
    ];
    const plan = planSockets({ ...reach, targets, candidates: row(3) });
    expect(plan.sockets).toEqual(['S0']);
    expect(plan.exact).toBe(true);
    expect(plan.uncovered).toEqual([]);
    expect(plan.assignments.map((a) => [a.target, a.socket])).toEqual([
      [0, 0],
      [1, 0],
    ]);
  });

  it('reports unreachable targets and names new sockets by position and normal', () => {
    const targets: Vec3[] = [
      [0, 0, 1.2],
      [50, 0, 0],
      [3, 0, 1],
    ];
    const plan = planSockets({ ...reach, targets, candidates: row(4, false) });
    expect(plan.uncovered).toEqual([1]);
    expect(plan.sockets).toEqual([
      { position: [0, 0, 0], normal: up },
      { position: [3, 0, 0], normal: up },
    ]);
    expect(plan.assignments[1]).toMatchObject({ target: 2, socket: 1, yawDeg: 0, pitchDeg: 0 });
  });

  it('a socket normal decides which side it reaches', () => {
    const down: SocketCandidate = { key: 'D', position: [0, 0, 0], normal: [0, 0, -1] };
    const plan = planSockets({ ...reach, targets: [[0, 0, 1]], candidates: [down] });
    expect(plan.uncovered).toEqual([0]);
    expect(plan.sockets).toEqual([]);
  });

  it('stays exact when duplicates and sockets out of reach leave few enough candidates', () => {
    const targets: Vec3[] = Array.from({ length: 10 }, (_, i) => [i * 2, 0, 1]);
    const far = Array.from({ length: 40 }, (_, i) => ({ position: [i, 100, 0] as Vec3, normal: up }));
    const twins = [...row(20), ...row(20)];
    const plan = planSockets({ ...reach, targets, candidates: [...far, ...twins] });
    expect(plan.candidateCount).toBe(80);
    expect(plan.usefulCandidateCount).toBe(10);
    expect(plan.exact).toBe(true);
    expect(plan.sockets).toHaveLength(10);
  });

  it('goes greedy beyond the exact limit, and the exact method refuses it', () => {
    // each socket reaches its own target only: nothing to merge or drop
    const n = EXACT_CANDIDATE_LIMIT + 1;
    const targets: Vec3[] = Array.from({ length: n }, (_, i) => [i * 2, 0, 1]);
    const candidates = Array.from({ length: n }, (_, i) => ({ position: [i * 2, 0, 0] as Vec3, normal: up }));
    const plan = planSockets({ ...reach, targets, candidates });
    expect(plan.exact).toBe(false);
    expect(plan.sockets).toHaveLength(n);
    expect(planSockets({ ...reach, targets: targets.slice(1), candidates: candidates.slice(1) }).exact).toBe(
      true,
    );
    expect(() => planSockets({ ...reach, targets, candidates, method: 'exact' })).toThrow(RangeError);
  });

  it('greedy breaks ties by the smaller total distance', () => {
    const targets: Vec3[] = [[0, 0, 1.5]];
    const candidates: SocketCandidate[] = [
      { key: 'FAR', position: [0, 0, 0.1], normal: up },
      { key: 'NEAR', position: [0, 0, 0.4], normal: up },
    ];
    expect(planSockets({ ...reach, targets, candidates, method: 'greedy' }).sockets).toEqual(['NEAR']);
    expect(planSockets({ ...reach, targets, candidates }).sockets).toEqual(['NEAR']);
  });

  it('beats greedy where greedy is known to be suboptimal', () => {
    // Classic trap: one big set B covers the middle of both rows; rows A1, A2 each cover half.
    // Targets on a line; B reaches targets 1..4, A1 reaches 0..2, A2 reaches 3..5.
    const targets: Vec3[] = [0, 1, 2, 3, 4, 5].map((i) => [i * 0.45, 0, 1]);
    const a1: SocketCandidate = { key: 'A1', position: [0.45, 0, 0], normal: up };
    const a2: SocketCandidate = { key: 'A2', position: [1.8, 0, 0], normal: up };
    const b: SocketCandidate = { key: 'B', position: [1.125, 0, 0], normal: up };
    const inst = { standOffM: 1, radiusM: 0.68, targets, candidates: [b, a1, a2] };
    const cov = coverOf(inst.candidates, targets, 1, 0.68);
    expect(cov.map((r) => r.filter(Boolean).length)).toEqual([4, 3, 3]);
    expect(planSockets({ ...inst, method: 'greedy' }).sockets).toHaveLength(3);
    expect(planSockets(inst).sockets).toEqual(['A1', 'A2']);
    const cut = planSockets({ ...inst, nodeBudget: 1 });
    expect(cut.exact).toBe(false);
    expect(cut.sockets).toHaveLength(3);
    expect(cut.uncovered).toEqual([]);
  });

  it('handles no candidates and no targets', () => {
    expect(planSockets({ ...reach, targets: [[0, 0, 0]], candidates: [] })).toMatchObject({
      sockets: [],
      uncovered: [0],
      exact: true,
    });
    expect(planSockets({ ...reach, targets: [], candidates: row(2) })).toMatchObject({
      sockets: [],
      uncovered: [],
      assignments: [],
    });
  });
});

describe('existing sockets before new ones', () => {
  it('keeps an existing socket that reaches the same targets as a nearer grid point (common practice: new sockets are hardware work)', () => {
    const target: [number, number, number] = [0, 0, 1.8];
    const plan = planSockets({
      targets: [target],
      candidates: [
        { position: [0, 0, 0.8], normal: [0, 0, 1] }, // new, right under the task: 0.0 m
        { key: 'EX-S1', position: [0.5, 0, 0.8], normal: [0, 0, 1] }, // existing, 0.5 m off
      ],
      standOffM: 1,
      radiusM: 0.7,
    });
    expect(plan.sockets).toEqual(['EX-S1']);
    const greedy = planSockets({
      targets: [target],
      candidates: [
        { position: [0, 0, 0.8], normal: [0, 0, 1] },
        { key: 'EX-S1', position: [0.5, 0, 0.8], normal: [0, 0, 1] },
      ],
      standOffM: 1,
      radiusM: 0.7,
      method: 'greedy',
    });
    expect(greedy.sockets).toEqual(['EX-S1']);
  });

  it('still proposes a new socket where no existing one reaches', () => {
    const plan = planSockets({
      targets: [
        [0, 0, 1.8],
        [10, 0, 1.8],
      ],
      candidates: [
        { key: 'EX-S1', position: [0.3, 0, 0.8], normal: [0, 0, 1] },
        { position: [10, 0, 0.8], normal: [0, 0, 1] },
      ],
      standOffM: 1,
      radiusM: 0.7,
    });
    expect(plan.sockets).toEqual(['EX-S1', { position: [10, 0, 0.8], normal: [0, 0, 1] }]);
  });
});
