import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { RouteMode, RouteRequest } from '@shared/schemas/route';
import { compileStation } from '@shared/compute/compiled-station';
import { findRoute, type RouteStrategy } from '@shared/compute/routes';
import {
  clipGraphFor,
  clipMemory,
  clipRestBounds,
  costMarksFor,
  DEFAULT_CLIP_MEMORY_BYTES,
  hasClipGraph,
  setClipMemoryBudget,
  pruneStretches,
  type ClipGraph,
  type ClipRows,
} from '@shared/compute/routes-clip';
import { excludeMaskFor } from '@shared/compute/routes';
import { generateTrussStation } from '@shared/compute/truss-generator';
import type { StationDocument } from '@shared/schemas/station';
import { attachMarks, smallStationArb } from './routes-oracle';

const MODES: RouteMode[] = ['fastest', 'fewest-swaps', 'balanced'];

function compare(
  c: ReturnType<typeof compileStation>,
  settings: Parameters<typeof findRoute>[1],
  req: Omit<RouteRequest, 'mode'>,
) {
  for (const mode of MODES) {
    const run = (strategy: RouteStrategy) => findRoute(c, settings, { ...req, mode }, { strategy });
    const clip = run('clip-graph');
    const label = run('label-search');
    expect(clip.feasible, `${mode} ${req.from}→${req.to} feasibility`).toBe(label.feasible);
    if (!clip.feasible || !label.feasible) {
      if (!clip.feasible && !label.feasible) expect(clip.reasonCode).toBe(label.reasonCode);
      continue;
    }
    if (mode === 'fewest-swaps') expect(clip.swapCount).toBe(label.swapCount);
    if (mode === 'balanced') expect(clip.totalSeconds).toBeCloseTo(label.totalSeconds, 6);
    else expect(clip.travelSeconds).toBeCloseTo(label.travelSeconds, 6);
    expect(clip.maxPaidOutM).toBeLessThanOrEqual(clip.tetherLengthM + 1e-9);
  }
}

/**
 * Best clip-to-clip cost from attach s to attach t: stretches between swaps from `mid`, the last
 * one from the full rows; `swapCost` Infinity means fewest swaps, then least time. A plain
 * Dijkstra over (swaps, seconds), quadratic and small on purpose.
 */
function bestCost(cg: ClipGraph, mid: ClipRows, s: number, t: number, swapCost: number): [number, number] {
  const A = cg.offsets.length - 1;
  const lex = swapCost === Infinity;
  const key = (sw: number, sec: number): [number, number] => (lex ? [sw, sec] : [sec + swapCost * sw, 0]);
  const less = (x: [number, number], y: [number, number]) => x[0] < y[0] || (x[0] === y[0] && x[1] < y[1]);
  const swaps = new Float64Array(A).fill(Infinity);
  const secs = new Float64Array(A).fill(Infinity);
  const done = new Uint8Array(A);
  swaps[s] = 0;
  secs[s] = 0;
  let best: [number, number] = [Infinity, Infinity];
  for (;;) {
    let a = -1;
    for (let i = 0; i < A; i++)
      if (!done[i] && swaps[i] < Infinity && (a < 0 || less(key(swaps[i], secs[i]), key(swaps[a], secs[a]))))
        a = i;
    if (a < 0) return best;
    done[a] = 1;
    for (let e = cg.offsets[a]; e < cg.offsets[a + 1]; e++) {
      if (cg.targets[e] !== t) continue;
      const k = key(swaps[a], secs[a] + cg.seconds[e]);
      if (less(k, best)) best = k;
    }
    for (let e = mid.offsets[a]; e < mid.offsets[a + 1]; e++) {
      const b = mid.targets[e];
      if (b === t || done[b]) continue;
      if (less(key(swaps[a] + 1, secs[a] + mid.seconds[e]), key(swaps[b], secs[b]))) {
        swaps[b] = swaps[a] + 1;
        secs[b] = secs[a] + mid.seconds[e];
      }
    }
  }
}

describe('kept stretches of the clip graph', () => {
  const doc = generateTrussStation({ nodes: 900, seed: 5 });
  const c = compileStation(doc);
  const cases = fc.tuple(fc.nat(), fc.nat(), fc.constantFrom(6, 12, 25.9));

  function isSubsetOfFull(cg: ClipGraph, rows: ClipRows) {
    for (let a = 0; a + 1 < cg.offsets.length; a++) {
      const full = new Map<number, number>();
      for (let e = cg.offsets[a]; e < cg.offsets[a + 1]; e++) full.set(cg.targets[e], cg.seconds[e]);
      for (let e = rows.offsets[a]; e < rows.offsets[a + 1]; e++)
        expect(full.get(rows.targets[e])).toBe(rows.seconds[e]);
    }
  }

  it('drops most stretches and keeps the fewest swaps and the least swap-costed time between attach points', () => {
    const cg = clipGraphFor(c, c.arcSeconds, 25.9, excludeMaskFor(false));
    expect(cg.swapRows.targets.length).toBeLessThan(cg.targets.length / 2);
    isSubsetOfFull(cg, cg.swapRows);
    fc.assert(
      fc.property(cases, fc.constantFrom(Infinity, 0, 7, 90), ([i, j, tether], swapCost) => {
        const g = clipGraphFor(c, c.arcSeconds, tether, excludeMaskFor(false));
        const A = g.attachNodes.length;
        fc.pre(i % A !== j % A);
        const full = bestCost(g, g, i % A, j % A, swapCost);
        const kept = bestCost(g, g.swapRows, i % A, j % A, swapCost);
        expect(kept[0]).toBeCloseTo(full[0], 6);
        expect(kept[1]).toBeCloseTo(full[1], 6);
      }),
      { numRuns: 60 },
    );
  });

  it('with free swaps, keeps only a few stretches and the least time between attach points', () => {
    const cg = clipGraphFor(c, c.arcSeconds, 25.9, excludeMaskFor(false));
    const rows = pruneStretches(cg, 0);
    expect(rows.targets.length).toBeLessThan(cg.targets.length / 4);
    isSubsetOfFull(cg, rows);
    fc.assert(
      fc.property(cases, fc.constantFrom(0, 3, 90), ([i, j, tether], swapCost) => {
        const g = clipGraphFor(c, c.arcSeconds, tether, excludeMaskFor(false));
        const A = g.attachNodes.length;
        fc.pre(i % A !== j % A);
        const full = bestCost(g, g, i % A, j % A, swapCost);
        const kept = bestCost(g, pruneStretches(g, swapCost), i % A, j % A, swapCost);
        expect(kept[0]).toBeCloseTo(full[0], 6);
      }),
      { numRuns: 60 },
    );
  });
});

describe('cost landmarks of the clip graph', () => {
  const doc = generateTrussStation({ nodes: 900, seed: 5 });
  const c = compileStation(doc);

  it('give the least swap-costed time from each landmark, and lower bounds both ways from any attach point', () => {
    fc.assert(
      fc.property(
        fc.nat(),
        fc.nat(),
        fc.constantFrom(2.5, 6, 12, 25.9),
        fc.constantFrom(7, 90),
        (i, j, tether, swapCost) => {
          const g = clipGraphFor(c, c.arcSeconds, tether, excludeMaskFor(false));
          const A = g.attachNodes.length;
          const a = i % A;
          const t = j % A;
          fc.pre(a !== t);
          const marks = costMarksFor(g, swapCost);
          const K = marks.count;
          const best = bestCost(g, g, a, t, swapCost)[0];
          for (let k = 0; k < K; k++) {
            const fromL = marks.cost[a * K + k];
            const toT = marks.toEnd[t * K + k];
            // the rows are symmetric: a landmark that reaches t but not a says a cannot reach t
            if (fromL === Infinity) {
              if (marks.cost[t * K + k] < Infinity) expect(best).toBe(Infinity);
              continue;
            }
            // cost(a → t) ≥ cost(L → t) − cost(L → a), and (times the same both ways)
            // cost(a → t) ≥ cost(L → a) − cost(L → t) − swapCost
            if (best === Infinity) expect(toT).toBe(Infinity);
            else {
              expect(toT - fromL).toBeLessThanOrEqual(best + 1e-6);
              expect(fromL - marks.cost[t * K + k] - swapCost).toBeLessThanOrEqual(best + 1e-6);
            }
          }
          // at a landmark itself the bound is the least cost
          for (let k = 0; k < K; k++) {
            let L = -1;
            for (let x = 0; x < A && L < 0; x++) if (marks.cost[x * K + k] === 0) L = x;
            expect(L).toBeGreaterThanOrEqual(0);
            if (L === t) continue;
            const exact = bestCost(g, g, L, t, swapCost)[0];
            if (exact === Infinity) expect(marks.toEnd[t * K + k]).toBe(Infinity);
            else expect(marks.toEnd[t * K + k]).toBeCloseTo(exact, 6);
          }
        },
      ),
      { numRuns: 40 },
    );
  });
});

describe('lower bounds of a clip-graph query', () => {
  /**
   * Every bound the search puts on the rest of a route from a fresh clip at one of the query's
   * attach points is at most the least cost from there, as the label search finds it (a fresh
   * route from that attach point, with the query's extra attach points, limit on arrival and
   * carrying): with a swap cost the cost itself, for fewest swaps the swaps and the time apart.
   */
  function boundsHold(
    doc: StationDocument,
    c: ReturnType<typeof compileStation>,
    s: number,
    t: number,
    extra: number[],
    endCapM: number | undefined,
    carrying: boolean,
  ) {
    const { settings } = doc;
    const marks = attachMarks(doc, extra);
    const added = extra.filter((v) => !c.isAttach[v]);
    for (const mode of ['balanced', 'fewest-swaps'] as const) {
      const bounds = clipRestBounds(c, s, t, {
        objective: mode === 'balanced' ? 'sum' : 'lex',
        swapCost: mode === 'balanced' ? settings.swapSeconds : 0,
        weights: c.arcSeconds,
        secondsFactor: carrying ? settings.carryFactor : 1,
        tetherLengthM: settings.tetherLengthM,
        excludeMask: excludeMaskFor(false),
        landmarkTimesValid: true,
        maxSpeedMps: Math.max(settings.speedsMps.handrail, settings.speedsMps.hop, settings.speedsMps.ride),
        isAttach: Uint8Array.from(marks, Number),
        extraAttach: added,
        startPaidOutM: 0,
        ...(endCapM === undefined ? {} : { endPaidOutMaxM: endCapM }),
      });
      for (const { node, rest1, rest2 } of bounds) {
        const r = findRoute(
          c,
          settings,
          {
            from: doc.nodes[node].key,
            to: doc.nodes[t].key,
            mode,
            carrying,
            extraAttach: extra.map((v) => doc.nodes[v].key),
            ...(endCapM === undefined ? {} : { endPaidOutMaxM: endCapM }),
          },
          { strategy: 'label-search' },
        );
        if (!r.feasible) continue;
        const at = `${mode} bound from ${doc.nodes[node].key} to ${doc.nodes[t].key}`;
        if (mode === 'balanced') expect(rest1, at).toBeLessThanOrEqual(r.totalSeconds + 1e-6);
        else {
          expect(rest1, at).toBeLessThanOrEqual(r.swapCount);
          expect(rest2, at).toBeLessThanOrEqual(r.travelSeconds + 1e-6);
        }
      }
    }
  }

  it('never exceed the least cost on small random stations, with extra attach points and a limit on arrival', () => {
    fc.assert(
      fc.property(
        smallStationArb,
        fc.tuple(fc.nat(), fc.nat()),
        fc.array(fc.nat(), { maxLength: 3 }),
        fc.option(fc.integer({ min: 0, max: 100 }), { nil: undefined }),
        fc.boolean(),
        (doc, [i, j], extraPicks, capPct, carrying) => {
          const n = doc.nodes.length;
          const [s, t] = [i % n, j % n];
          fc.pre(s !== t);
          const extra = [...new Set(extraPicks.map((v) => v % n))];
          const cap = capPct === undefined ? undefined : (capPct / 100) * doc.settings.tetherLengthM;
          boundsHold(doc, compileStation(doc), s, t, extra, cap, carrying);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('never exceed the least cost on a generated truss towards a worksite or an attach point', () => {
    const doc = generateTrussStation({ nodes: 600, seed: 9 });
    const c = compileStation(doc);
    const ends = doc.nodes.flatMap((v, i) => (v.kind === 'worksite' || v.kind === 'anchor' ? [i] : []));
    fc.assert(
      fc.property(
        fc.nat(),
        fc.nat(),
        fc.array(fc.nat(), { maxLength: 2 }),
        fc.option(fc.integer({ min: 30, max: 100 }), { nil: undefined }),
        fc.boolean(),
        (i, j, extraPicks, capPct, carrying) => {
          const s = ends[i % ends.length];
          const t = ends[j % ends.length];
          fc.pre(s !== t);
          const extra = [...new Set(extraPicks.map((v) => v % doc.nodes.length))];
          const cap = capPct === undefined ? undefined : (capPct / 100) * doc.settings.tetherLengthM;
          boundsHold(doc, c, s, t, extra, cap, carrying);
        },
      ),
      { numRuns: 6 },
    );
  });
});

describe('clip-graph search against the label-setting search', () => {
  // the sparse zone near the far end has anchors only on dead-end stubs, so long tethers and short
  // ones take different detours there
  const doc = generateTrussStation({ nodes: 1500, seed: 11 });
  const c = compileStation(doc);
  const keys = doc.nodes.map((n) => n.key);
  const attach = doc.nodes.filter((n) => n.kind === 'anchor' || n.kind === 'airlock').map((n) => n.key);
  const sparse = doc.nodes
    .filter((n) => n.position[0] > 0.85 * Math.max(...doc.nodes.map((m) => m.position[0])))
    .map((n) => n.key);

  it('gives the same optimum on a generated truss for random queries and tether lengths', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...attach, ...keys),
        fc.constantFrom(...attach, ...keys, ...sparse),
        fc.constantFrom(6, 9.5, 15, 25.9, 40),
        fc.boolean(),
        fc.boolean(),
        (from, to, tetherLengthM, allowRide, carrying) => {
          fc.pre(from !== to);
          compare(c, doc.settings, { from, to, tetherLengthM, allowRide, carrying });
        },
      ),
      { numRuns: 120 },
    );
  });

  it('gives the same optimum from a tether state, with extra attach points and a limit on arrival', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...keys),
        fc.constantFrom(...keys, ...sparse),
        fc.array(fc.constantFrom(...keys), { maxLength: 3 }),
        fc.nat(),
        fc.integer({ min: 0, max: 99 }).map((v) => v / 100),
        fc.option(
          fc.integer({ min: 0, max: 100 }).map((v) => v / 100),
          { nil: undefined },
        ),
        fc.boolean(),
        (from, to, extraAttach, anchorPick, share, capShare, carrying) => {
          fc.pre(from !== to);
          const anchors = [...attach, ...extraAttach];
          const tetherLengthM = doc.settings.tetherLengthM;
          compare(c, doc.settings, {
            from,
            to,
            carrying,
            extraAttach,
            startAnchor: anchors[anchorPick % anchors.length],
            startPaidOutM: share * tetherLengthM,
            ...(capShare === undefined ? {} : { endPaidOutMaxM: capShare * tetherLengthM }),
          });
        },
      ),
      { numRuns: 120 },
    );
  });

  it('walks a stretch it has walked before the same way as a fresh search does', () => {
    const cg = clipGraphFor(c, c.arcSeconds, doc.settings.tetherLengthM, excludeMaskFor(false));
    fc.assert(
      fc.property(
        fc.constantFrom(...keys),
        fc.constantFrom(...keys, ...sparse),
        fc.constantFrom(...attach),
        fc.integer({ min: 0, max: 99 }).map((v) => v / 100),
        fc.constantFrom<RouteMode>('balanced', 'fewest-swaps'),
        (from, to, startAnchor, share, mode) => {
          fc.pre(from !== to);
          const req: RouteRequest = {
            from,
            to,
            mode,
            startAnchor,
            startPaidOutM: share * doc.settings.tetherLengthM,
          };
          const run = () => findRoute(c, doc.settings, req, { strategy: 'clip-graph' });
          run();
          const warm = run();
          cg.walks.clear();
          const fresh = run();
          expect(warm).toEqual(fresh);
        },
      ),
      { numRuns: 60 },
    );
    // the long routes of a day on this truss pass through the same stretches
    expect(cg.walks.size).toBeGreaterThan(0);
  });

  it('gives the same optimum with station settings other than the compiled ones', () => {
    const settings = {
      ...doc.settings,
      hopSeconds: 2,
      swapSeconds: 20,
      speedsMps: { handrail: 0.2, hop: 0.05, ride: 0.3 },
    };
    fc.assert(
      fc.property(
        fc.constantFrom(...attach),
        fc.constantFrom(...sparse, ...attach),
        fc.constantFrom(8, 25.9),
        (from, to, tetherLengthM) => {
          fc.pre(from !== to);
          compare(c, settings, { from, to, tetherLengthM });
        },
      ),
      { numRuns: 40 },
    );
  });

  it('gives the same optimum between attach points at any swap time, free swaps included', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...attach),
        fc.constantFrom(...attach),
        fc.constantFrom(6, 9.5, 25.9),
        fc.constantFrom(0, 4, 90, 400),
        (from, to, tetherLengthM, swapSeconds) => {
          fc.pre(from !== to);
          compare(c, { ...doc.settings, swapSeconds }, { from, to, tetherLengthM });
        },
      ),
      { numRuns: 80 },
    );
  });

  it('gives the same optimum on small random stations', () => {
    fc.assert(
      fc.property(
        smallStationArb,
        fc.nat(),
        fc.nat(),
        fc.boolean(),
        fc.boolean(),
        (small, a, b, allowRide, carrying) => {
          const n = small.nodes.length;
          fc.pre(a % n !== b % n);
          compare(compileStation(small), small.settings, {
            from: small.nodes[a % n].key,
            to: small.nodes[b % n].key,
            allowRide,
            carrying,
          });
        },
      ),
      { numRuns: 400 },
    );
  });

  it('keeps one clip graph per tether length and exclusion set', () => {
    const one = clipGraphFor(c, c.arcSeconds, 25.9, 3);
    expect(clipGraphFor(c, c.arcSeconds, 25.9, 3)).toBe(one);
    expect(clipGraphFor(c, c.arcSeconds, 20, 3)).not.toBe(one);
    expect(one.targets.length).toBeGreaterThan(one.attachNodes.length);
  });
});

describe('clip graphs kept within a memory budget', () => {
  it('drops the least recently used beyond the budget, always keeps the newest, and answers the same after', () => {
    const doc = generateTrussStation({ nodes: 600, seed: 7 });
    const c = compileStation(doc);
    const lengths = [15, 17, 19, 21];
    const graphs = lengths.map((l) => clipGraphFor(c, c.arcSeconds, l, 0));
    const bytes = graphs.map((g) => g.memoryBytes);
    expect(clipHeld(c, lengths)).toEqual([true, true, true, true]);
    try {
      // room for the two most recent: they stay (a longer tether's graph is the larger)
      expect(bytes[3]).toBeGreaterThan(bytes[0]);
      setClipMemoryBudget(bytes[2] + bytes[3]);
      expect(clipHeld(c, lengths)).toEqual([false, false, true, true]);
      expect(clipMemory().bytes).toBeLessThanOrEqual(clipMemory().budgetBytes);
      // using one makes it the most recent: the other goes when a new one comes
      clipGraphFor(c, c.arcSeconds, 19, 0);
      clipGraphFor(c, c.arcSeconds, 15, 0);
      expect(clipHeld(c, lengths)).toEqual([true, false, true, false]);
      // a budget smaller than any graph still keeps the newest one
      setClipMemoryBudget(1);
      expect(clipMemory().graphs).toBe(1);
      expect(clipHeld(c, lengths)).toEqual([true, false, false, false]);
      // a dropped graph is rebuilt when asked for: the routes are the ones the label search finds
      compare(c, doc.settings, { from: doc.nodes[0].key, to: doc.nodes[400].key, tetherLengthM: 21 });
    } finally {
      setClipMemoryBudget(DEFAULT_CLIP_MEMORY_BYTES);
    }
  });
});

function clipHeld(c: ReturnType<typeof compileStation>, lengths: number[]) {
  return lengths.map((l) => hasClipGraph(c.arcSeconds, l, 0));
}
