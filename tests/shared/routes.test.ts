import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { UndirectedGraph } from 'graphology';
import { dijkstra } from 'graphology-shortest-path';
import createGraph from 'ngraph.graph';
import { nba } from 'ngraph.path';
import type { RouteFeasible, RouteMode, RouteRequest, RouteResult } from '@shared/schemas/route';
import kestrel from '../../server/db/seed/kestrel-station.json';
import {
  parseStationDocument,
  StationDocumentSchema,
  type StationDocument,
  type StationDocumentInput,
} from '@shared/schemas/station';
import { compileStation, edgeSeconds } from '@shared/compute/compiled-station';
import { findRoute, hasNodeKey } from '@shared/compute/routes';
import {
  adjacency,
  attachMarks,
  exhaustive,
  keepOutEdges,
  minSwapsDp,
  smallStationArb,
  tiedBranchesStationArb,
  type OracleResult,
} from './routes-oracle';

const station = (input: Omit<StationDocumentInput, 'format' | 'version' | 'name'>): StationDocument =>
  StationDocumentSchema.parse({ format: 'tetherwise.station', version: 1, name: 'test', ...input });

const feasible = (r: RouteResult): RouteFeasible => {
  if (!r.feasible) throw new Error(`expected a route, got ${r.reasonCode}: ${r.reason}`);
  return r;
};

describe('fastest route distances', () => {
  it('matches Cormen, Leiserson, Rivest, Stein, Introduction to Algorithms 3rd ed. Fig. 24.6 (two-way variant)', () => {
    // Directed list from the figure taken as two-way edges, keeping the shorter of t–y (2, 3) and x–z (4, 6).
    const edges: [string, string, number][] = [
      ['s', 't', 10],
      ['s', 'y', 5],
      ['t', 'x', 1],
      ['t', 'y', 2],
      ['x', 'z', 4],
      ['y', 'x', 9],
      ['y', 'z', 2],
      ['z', 's', 7],
    ];
    const doc = station({
      settings: { tetherLengthM: 1000, speedsMps: { handrail: 1, hop: 1, ride: 1 }, hopSeconds: 0 },
      nodes: ['s', 't', 'x', 'y', 'z'].map((key, i) => ({
        key,
        kind: 'anchor' as const,
        position: [i, 0, 0] as [number, number, number],
      })),
      edges: edges.map(([from, to, lengthM]) => ({ from, to, lengthM, kind: 'handrail' as const })),
    });
    const c = compileStation(doc);
    const got = Object.fromEntries(
      ['t', 'x', 'y', 'z'].map((k) => [
        k,
        feasible(findRoute(c, doc.settings, { from: 's', to: k, mode: 'fastest' })).travelSeconds,
      ]),
    );
    expect(got).toEqual({ t: 7, x: 8, y: 5, z: 7 });
  });

  it('agrees with graphology-shortest-path and ngraph.path on random stations', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 40 }),
        fc.array(fc.tuple(fc.nat(), fc.nat(), fc.double({ min: 0, max: 50, noNaN: true }), fc.boolean()), {
          maxLength: 120,
        }),
        fc.nat(),
        fc.nat(),
        (n, extra, a, b) => {
          const keys = Array.from({ length: n }, (_, i) => `V${i}`);
          const seen = new Set<string>();
          const edges: StationDocumentInput['edges'] = [];
          for (const [x, y, len, hop] of extra) {
            const [p, q] = [x % n, y % n];
            const kind = hop ? 'hop' : 'handrail';
            if (p === q || seen.has(`${Math.min(p, q)}-${Math.max(p, q)}-${kind}`)) continue;
            seen.add(`${Math.min(p, q)}-${Math.max(p, q)}-${kind}`);
            edges.push({ from: keys[p], to: keys[q], kind, lengthM: len });
          }
          const doc = station({
            settings: { tetherLengthM: 1000, hopSeconds: 7 },
            nodes: keys.map((key, i) => ({
              key,
              kind: 'junction' as const,
              position: [i, i % 3, 0] as [number, number, number],
            })),
            edges,
          });
          const s = keys[a % n];
          const t = keys[b % n];
          fc.pre(s !== t);

          const weight = new Map<string, number>();
          const pairKey = (u: string, v: string) => (u < v ? `${u}|${v}` : `${v}|${u}`);
          for (const e of doc.edges) {
            const w = edgeSeconds(e.kind, e.lengthM!, doc.settings);
            weight.set(pairKey(e.from, e.to), Math.min(weight.get(pairKey(e.from, e.to)) ?? Infinity, w));
          }
          const pathCost = (path: string[]) =>
            path.slice(1).reduce((sum, v, i) => sum + weight.get(pairKey(path[i], v))!, 0);

          const g = new UndirectedGraph();
          keys.forEach((k) => g.addNode(k));
          for (const [pair, w] of weight) {
            const [u, v] = pair.split('|');
            g.addEdge(u, v, { w });
          }
          const gPath = dijkstra.bidirectional(g, s, t, 'w');

          const ng = createGraph<unknown, { w: number }>();
          keys.forEach((k) => ng.addNode(k));
          for (const [pair, w] of weight) {
            const [u, v] = pair.split('|');
            ng.addLink(u, v, { w });
          }
          const nPath = nba(ng, { distance: (_f, _t, link) => link.data.w })
            .find(s, t)
            .map((node) => String(node.id));

          const r = findRoute(compileStation(doc), doc.settings, { from: s, to: t, mode: 'fastest' });
          if (!gPath) {
            expect(r.feasible).toBe(false);
            expect(nPath.length).toBe(0);
            return;
          }
          const expected = pathCost(gPath);
          expect(pathCost(nPath)).toBeCloseTo(expected, 9);
          expect(feasible(r).travelSeconds).toBeCloseTo(expected, 9);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('exact modes against exhaustive walk search', () => {
  const MAX_EDGES = 9;
  const modes: RouteMode[] = ['fastest', 'fewest-swaps', 'balanced'];

  /**
   * One answer against the oracle's best walks: the engine's own walk checked independently (its
   * swaps only at attach points, the DP agrees on their count, the tether never over its length,
   * the tether state at the end), then its cost against the best of the bounded walks.
   */
  function checkAgainstOracle(
    doc: StationDocument,
    r: RouteResult,
    mode: RouteMode,
    best: OracleResult,
    start: { anchor: string; paidOutM: number; attach: boolean[]; endCapM?: number },
  ) {
    if (!r.feasible) {
      expect(best.fastest, `${mode}: oracle found a walk the engine missed (${r.reason})`).toBeNull();
      return;
    }
    const index = new Map(doc.nodes.map((n, i) => [n.key, i]));
    const positions = [0, ...r.legs.map((l) => l.startM + l.lengthM)];
    const attach = r.nodes.map((k) => start.attach[index.get(k)!]);
    const oracleStart = { paidOutM: start.paidOutM, swapAtStart: attach[0] };
    // a limit on arrival as the oracle takes it: a last virtual stretch of tether − limit
    const cap = start.endCapM;
    const capped = cap === undefined ? [] : [r.lengthM + r.tetherLengthM - cap];
    const dpSwaps = minSwapsDp(
      [...positions, ...capped],
      [...attach, ...capped.map(() => false)],
      r.tetherLengthM,
      oracleStart,
    );
    expect(dpSwaps).toBe(r.swapCount);
    // paid out along the walk, from the swaps as reported
    let clipM = -start.paidOutM;
    let clipNode = start.anchor;
    let next = 0;
    for (let i = 0; i < positions.length; i++) {
      while (next < r.swaps.length && Math.abs(r.swaps[next].atM - positions[i]) < 1e-9) {
        const sw = r.swaps[next++];
        expect(sw.node).toBe(r.nodes[i]);
        expect(attach[i], `swap at ${sw.node}, not an attach point`).toBe(true);
        expect(sw.paidOutM).toBeCloseTo(positions[i] - clipM, 9);
        clipM = positions[i];
        clipNode = sw.node;
      }
      expect(positions[i] - clipM).toBeLessThanOrEqual(r.tetherLengthM + 1e-9);
    }
    expect(next).toBe(r.swaps.length);
    expect(r.maxPaidOutM).toBeLessThanOrEqual(r.tetherLengthM + 1e-9);
    expect(r.tetherAtStart).toEqual({ anchor: start.anchor, paidOutM: start.paidOutM });
    expect(r.tetherAtEnd?.anchor).toBe(clipNode);
    expect(r.tetherAtEnd?.paidOutM).toBeCloseTo(r.lengthM - clipM, 9);

    const short = r.legs.length <= MAX_EDGES;
    if (mode === 'fastest') {
      // least time, and among routes of that time (both within a microsecond) the fewest swaps
      expect(best.fastest === null || r.travelSeconds <= best.fastest.seconds + 1e-6).toBe(true);
      if (short) {
        expect(Math.abs(r.travelSeconds - best.fastest!.seconds)).toBeLessThanOrEqual(2e-6);
        expect(r.swapCount).toBe(best.fastest!.swaps);
      }
    } else if (mode === 'fewest-swaps') {
      const o = best.fewestSwaps;
      if (o)
        expect(
          r.swapCount < o.swaps || (r.swapCount === o.swaps && r.travelSeconds <= o.seconds + 1e-6),
        ).toBe(true);
      if (short) {
        expect(r.swapCount).toBe(o!.swaps);
        expect(r.travelSeconds).toBeCloseTo(o!.seconds, 6);
      }
    } else {
      const o = best.balanced;
      if (o) expect(r.totalSeconds).toBeLessThanOrEqual(o.total + 1e-6);
      if (short) expect(r.totalSeconds).toBeCloseTo(o!.total, 6);
    }
  }

  it('finds the best walk in every mode on small random stations', () => {
    fc.assert(
      fc.property(
        smallStationArb,
        fc.nat(),
        fc.nat(),
        fc.boolean(),
        fc.boolean(),
        (doc, a, b, allowRide, carrying) => {
          const n = doc.nodes.length;
          const s = a % n;
          const t = b % n;
          fc.pre(s !== t);
          const c = compileStation(doc);
          const adj = adjacency(doc, { allowRide, carrying, blocked: keepOutEdges(doc) });
          const best = exhaustive(doc, adj, s, t, doc.settings.tetherLengthM, MAX_EDGES);
          const start = { anchor: doc.nodes[s].key, paidOutM: 0, attach: attachMarks(doc) };
          for (const mode of modes) {
            const r = findRoute(c, doc.settings, {
              from: doc.nodes[s].key,
              to: doc.nodes[t].key,
              mode,
              allowRide,
              carrying,
            });
            checkAgainstOracle(doc, r, mode, best, start);
          }
        },
      ),
      { numRuns: 600 },
    );
  });

  it('takes, among the quickest routes, the one with the fewest swaps', () => {
    fc.assert(
      fc.property(
        tiedBranchesStationArb,
        fc.option(fc.integer({ min: 0, max: 100 }), { nil: undefined }),
        (doc, capShare) => {
          const c = compileStation(doc);
          const tether = doc.settings.tetherLengthM;
          // sometimes with a limit on the tether out on arrival
          const endCapM = capShare === undefined ? undefined : (capShare / 100) * tether;
          const best = exhaustive(doc, adjacency(doc), 0, 1, tether, MAX_EDGES, { endCapM });
          const start = { anchor: 'S', paidOutM: 0, attach: attachMarks(doc), endCapM };
          const request: RouteRequest = { from: 'S', to: 'T', mode: 'fastest', endPaidOutMaxM: endCapM };
          for (const strategy of ['clip-graph', 'label-search'] as const) {
            const r = findRoute(c, doc.settings, request, { strategy });
            checkAgainstOracle(doc, r, 'fastest', best, start);
            if (r.feasible && endCapM !== undefined)
              expect(r.tetherAtEnd!.paidOutM).toBeLessThanOrEqual(endCapM + 1e-9);
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it('takes the quickest route with one swap on the demo station, not the one with two', () => {
    // PB3-W01 → SB4-W01 with a 25.9 m tether: two walks of the same travel time, one swap apart
    const parsed = parseStationDocument(kestrel);
    if (!parsed.ok) throw new Error('the demo station does not parse');
    const demo = compileStation(parsed.doc);
    const request = { from: 'PB3-W01', to: 'SB4-W01', tetherLengthM: 25.9 };
    const fewest = feasible(findRoute(demo, parsed.doc.settings, { ...request, mode: 'fewest-swaps' }));
    for (const strategy of ['clip-graph', 'label-search'] as const) {
      const fast = feasible(
        findRoute(demo, parsed.doc.settings, { ...request, mode: 'fastest' }, { strategy }),
      );
      expect(fast.travelSeconds).toBeCloseTo(fewest.travelSeconds, 6);
      expect(fast.swapCount).toBe(1);
      expect(fast.totalSeconds).toBeCloseTo(fewest.totalSeconds, 6);
    }
  });

  it('finds the best walk from a tether state, with extra attach points, by either search', () => {
    fc.assert(
      fc.property(
        smallStationArb,
        fc.nat(),
        fc.nat(),
        fc.array(fc.nat(), { maxLength: 3 }),
        fc.option(fc.nat(), { nil: undefined }),
        // the paid-out share of the tether: 0 (nothing out) often, up to just under all of it
        fc.oneof(
          fc.constant(0),
          fc.integer({ min: 0, max: 99 }).map((v) => v / 100),
        ),
        fc.boolean(),
        (doc, a, b, extraPicks, anchorPick, share, allowRide) => {
          const n = doc.nodes.length;
          const s = a % n;
          const t = b % n;
          fc.pre(s !== t);
          const extra = [...new Set(extraPicks.map((v) => v % n))];
          const attach = attachMarks(doc, extra);
          const attachIdx = attach.flatMap((m, i) => (m ? [i] : []));
          const anchor =
            anchorPick === undefined || !attachIdx.length
              ? undefined
              : attachIdx[anchorPick % attachIdx.length];
          const tether = doc.settings.tetherLengthM;
          const paidOutM = anchor === undefined ? 0 : share * tether;
          const c = compileStation(doc);
          const adj = adjacency(doc, { allowRide, blocked: keepOutEdges(doc) });
          const best = exhaustive(doc, adj, s, t, tether, MAX_EDGES, { paidOutM, extraAttach: extra });
          const start = { anchor: doc.nodes[anchor ?? s].key, paidOutM, attach };
          for (const mode of modes) {
            const request: RouteRequest = {
              from: doc.nodes[s].key,
              to: doc.nodes[t].key,
              mode,
              allowRide,
              ...(anchor !== undefined
                ? { startAnchor: doc.nodes[anchor].key, startPaidOutM: paidOutM }
                : {}),
              ...(extra.length ? { extraAttach: extra.map((v) => doc.nodes[v].key) } : {}),
            };
            for (const strategy of ['clip-graph', 'label-search'] as const) {
              const r = findRoute(c, doc.settings, request, { strategy });
              checkAgainstOracle(doc, r, mode, best, start);
              if (r.feasible) expect(r.startNotAttachable ?? false).toBe(anchor === undefined && !attach[s]);
            }
          }
        },
      ),
      { numRuns: 500 },
    );
  });

  it('finds the best walk from a tether state, with extra attach points and a limit on arrival, by either search', () => {
    fc.assert(
      fc.property(
        smallStationArb,
        fc.tuple(fc.nat(), fc.nat(), fc.nat()),
        fc.array(fc.nat(), { minLength: 1, maxLength: 3 }),
        fc.integer({ min: 0, max: 99 }).map((v) => v / 100),
        fc.integer({ min: 0, max: 100 }).map((v) => v / 100),
        (doc, picks, extraPicks, share, capShare) => {
          // the ends, the extra attach points and the anchor behind the start, by index
          const [s, t, anchorPick] = picks.map((v) => v % doc.nodes.length);
          fc.pre(s !== t);
          const extra = [...new Set(extraPicks.map((v) => v % doc.nodes.length))];
          const attach = attachMarks(doc, extra);
          const anchor = attach.flatMap((m, i) => (m ? [i] : []))[anchorPick % attach.filter(Boolean).length];
          const tether = doc.settings.tetherLengthM;
          const paidOutM = share * tether;
          const endCapM = capShare * tether;
          const c = compileStation(doc);
          const adj = adjacency(doc, { blocked: keepOutEdges(doc) });
          const best = exhaustive(doc, adj, s, t, tether, MAX_EDGES, {
            paidOutM,
            extraAttach: extra,
            endCapM,
          });
          const start = { anchor: doc.nodes[anchor].key, paidOutM, attach, endCapM };
          for (const mode of modes) {
            const request: RouteRequest = {
              from: doc.nodes[s].key,
              to: doc.nodes[t].key,
              mode,
              startAnchor: doc.nodes[anchor].key,
              startPaidOutM: paidOutM,
              extraAttach: extra.map((v) => doc.nodes[v].key),
              endPaidOutMaxM: endCapM,
            };
            for (const strategy of ['clip-graph', 'label-search'] as const)
              checkAgainstOracle(doc, findRoute(c, doc.settings, request, { strategy }), mode, best, start);
          }
        },
      ),
      { numRuns: 400 },
    );
  });

  it('detours to a dead-end anchor to swap and comes back', () => {
    // s —10 m— j —10 m— t with a 12 m tether: only a swap at the stub anchor D (1 m off j) makes it.
    const doc = station({
      settings: { tetherLengthM: 12 },
      nodes: [
        { key: 's', kind: 'anchor', position: [0, 0, 0] },
        { key: 'j', kind: 'junction', position: [10, 0, 0] },
        { key: 'D', kind: 'anchor', position: [10, 1, 0] },
        { key: 't', kind: 'worksite', position: [20, 0, 0] },
      ],
      edges: [
        { from: 's', to: 'j', kind: 'handrail' },
        { from: 'j', to: 't', kind: 'handrail' },
        { from: 'j', to: 'D', kind: 'handrail' },
      ],
    });
    const c = compileStation(doc);
    for (const mode of modes) {
      const r = feasible(findRoute(c, doc.settings, { from: 's', to: 't', mode }));
      expect(r.nodes).toEqual(['s', 'j', 'D', 'j', 't']);
      expect(r.swaps).toEqual([{ node: 'D', atM: 11, paidOutM: 11 }]);
      expect(r.lengthM).toBeCloseTo(22, 9);
      expect(r.maxPaidOutM).toBeCloseTo(11, 9);
    }
    const tooShort = findRoute(c, doc.settings, {
      from: 's',
      to: 't',
      mode: 'balanced',
      tetherLengthM: 10.5,
    });
    expect(tooShort).toMatchObject({ feasible: false, reasonCode: 'anchor-gap' });
    expect(tooShort.feasible === false && tooShort.reason).toContain('11 m');
  });
});

describe('routes from a tether state', () => {
  // airlock A —3 m— junction J —3 m— anchor B —3 m— worksite W, a 6 m tether (worked by hand)
  const doc = station({
    settings: { tetherLengthM: 6 },
    nodes: [
      { key: 'A', kind: 'airlock', position: [0, 0, 0] },
      { key: 'J', kind: 'junction', position: [3, 0, 0] },
      { key: 'B', kind: 'anchor', position: [6, 0, 0] },
      { key: 'W', kind: 'worksite', position: [9, 0, 0] },
    ],
    edges: [
      { from: 'A', to: 'J', kind: 'handrail' },
      { from: 'J', to: 'B', kind: 'handrail' },
      { from: 'B', to: 'W', kind: 'handrail' },
    ],
  });
  const c = compileStation(doc);
  const go = (req: Omit<RouteRequest, 'mode'>, mode: RouteMode = 'fewest-swaps') =>
    feasible(findRoute(c, doc.settings, { ...req, mode }));

  it('carries the state at the end of one route into the next, up to the whole tether out', () => {
    for (const mode of ['fastest', 'fewest-swaps', 'balanced'] as const) {
      const out = go({ from: 'A', to: 'W' }, mode);
      expect(out.swaps).toEqual([{ node: 'B', atM: 6, paidOutM: 6 }]);
      expect(out.tetherAtStart).toEqual({ anchor: 'A', paidOutM: 0 });
      expect(out.tetherAtEnd).toEqual({ anchor: 'B', paidOutM: 3 });
      const back = go({ from: 'W', to: 'A', startAnchor: 'B', startPaidOutM: 3 }, mode);
      expect(back.swaps).toEqual([{ node: 'B', atM: 3, paidOutM: 6 }]);
      expect(back.tetherAtEnd).toEqual({ anchor: 'B', paidOutM: 6 });
      // the whole tether out at the airlock: the first thing is a swap where the crew member stands
      const again = go({ from: 'A', to: 'J', startAnchor: 'B', startPaidOutM: 6 }, mode);
      expect(again.swaps).toEqual([{ node: 'A', atM: 0, paidOutM: 6 }]);
      expect(again.tetherAtEnd).toEqual({ anchor: 'A', paidOutM: 3 });
      expect(again.maxPaidOutM).toBe(6);
    }
  });

  it('says when the tether already out leaves no way on, and refuses a state the tether cannot hold', () => {
    const stuck = findRoute(c, doc.settings, {
      from: 'J',
      to: 'A',
      mode: 'balanced',
      startAnchor: 'B',
      startPaidOutM: 4,
    });
    expect(stuck).toMatchObject({ feasible: false, reasonCode: 'anchor-gap' });
    expect(stuck.feasible === false && stuck.reason).toContain('already paid out from B');
    // the shortest tether that would do: 4 m out plus the 3 m to the airlock
    expect(stuck.feasible === false && stuck.reason).toContain('7 m');
    expect(() =>
      findRoute(c, doc.settings, {
        from: 'J',
        to: 'A',
        mode: 'fastest',
        startAnchor: 'B',
        startPaidOutM: 6.5,
      }),
    ).toThrow(RangeError);
    expect(() =>
      findRoute(c, doc.settings, { from: 'J', to: 'A', mode: 'fastest', startAnchor: 'W' }),
    ).toThrow(/not a tether attach point/);
    // unless the query makes it one
    expect(go({ from: 'J', to: 'A', startAnchor: 'W', startPaidOutM: 2, extraAttach: ['W'] }).swapCount).toBe(
      0,
    );
  });
});

describe('route exclusions and reasons', () => {
  const line = (extra: Partial<Omit<StationDocumentInput, 'format' | 'version' | 'name'>> = {}) =>
    station({
      nodes: [
        { key: 'A', kind: 'airlock', position: [0, 0, 0] },
        { key: 'B', kind: 'anchor', position: [2, 0, 0] },
        { key: 'C', kind: 'anchor', position: [4, 0, 0] },
        { key: 'X', kind: 'anchor', position: [50, 0, 0] },
      ],
      edges: [
        { from: 'A', to: 'B', kind: 'handrail' },
        { from: 'B', to: 'C', kind: 'handrail' },
      ],
      ...extra,
    });

  it('names the keep-out hazard that blocks every route', () => {
    const doc = line({
      hazards: [{ key: 'RAD-1', kind: 'keep-out', shape: 'sphere', center: [3, 0.5, 0], radiusM: 1 }],
    });
    const r = findRoute(compileStation(doc), doc.settings, { from: 'A', to: 'C', mode: 'balanced' });
    expect(r).toMatchObject({ feasible: false, reasonCode: 'blocked-by-hazard', blockingHazards: ['RAD-1'] });
  });

  it('lists caution volumes the route passes', () => {
    const doc = line({
      hazards: [{ key: 'ANT-1', kind: 'caution', shape: 'box', min: [0.5, -1, -1], max: [1, 1, 1] }],
    });
    const r = feasible(findRoute(compileStation(doc), doc.settings, { from: 'A', to: 'C', mode: 'fastest' }));
    expect(r.cautionHazards).toEqual(['ANT-1']);
    expect(r.warnings.join(' ')).toContain('ANT-1');
  });

  it('reports disconnected, same-node, and closed or ride-only ways', () => {
    const doc = line({
      edges: [
        { from: 'A', to: 'B', kind: 'handrail' },
        { from: 'B', to: 'C', kind: 'handrail', closed: true },
        { from: 'A', to: 'C', kind: 'ride' },
      ],
    });
    const c = compileStation(doc);
    expect(findRoute(c, doc.settings, { from: 'A', to: 'X', mode: 'fastest' })).toMatchObject({
      reasonCode: 'disconnected',
    });
    expect(findRoute(c, doc.settings, { from: 'A', to: 'A', mode: 'fastest' })).toMatchObject({
      reasonCode: 'same-node',
    });
    const closed = findRoute(c, doc.settings, { from: 'A', to: 'C', mode: 'fewest-swaps' });
    expect(closed).toMatchObject({ feasible: false, reasonCode: 'disconnected' });
    const ride = feasible(
      findRoute(c, doc.settings, { from: 'A', to: 'C', mode: 'fewest-swaps', allowRide: true }),
    );
    expect(ride.legs.map((l) => l.kind)).toEqual(['ride']);
    expect(ride.travelSeconds).toBeCloseTo(4 / doc.settings.speedsMps.ride, 9);
    expect(hasNodeKey(c, 'B')).toBe(true);
    expect(hasNodeKey(c, 'nope')).toBe(false);
    expect(() => findRoute(c, doc.settings, { from: 'A', to: 'nope', mode: 'fastest' })).toThrow(
      /unknown node key/,
    );
  });

  it('warns when the start is not an attach point and multiplies time when carrying', () => {
    const doc = line({
      nodes: [
        { key: 'A', kind: 'junction', position: [0, 0, 0] },
        { key: 'B', kind: 'anchor', position: [2, 0, 0] },
        { key: 'C', kind: 'anchor', position: [4, 0, 0] },
      ],
    });
    const c = compileStation(doc);
    const plain = feasible(findRoute(c, doc.settings, { from: 'A', to: 'C', mode: 'fastest' }));
    const carried = feasible(
      findRoute(c, doc.settings, { from: 'A', to: 'C', mode: 'fastest', carrying: true }),
    );
    expect(plain.warnings[0]).toMatch(/not a tether attach point/);
    expect(carried.travelSeconds).toBeCloseTo(plain.travelSeconds * doc.settings.carryFactor, 9);
  });
});
