import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { RouteFeasible, RouteMode, RouteResult } from '@shared/schemas/route';
import { compileStation } from '@shared/compute/compiled-station';
import { findRoute } from '@shared/compute/routes';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { parseStationDocument } from '@shared/schemas/station';
import { segmentIntersectsHazard } from '@shared/compute/geometry';

const doc = generateTrussStation({ nodes: 1200, seed: 3 });
const c = compileStation(doc);
const attach = doc.nodes.filter((n) => n.kind === 'anchor' || n.kind === 'airlock').map((n) => n.key);
const pos = new Map(doc.nodes.map((n) => [n.key, n.position]));
const kindOf = new Map(doc.nodes.map((n) => [n.key, n.kind]));
const closed = new Set(doc.edges.filter((e) => e.closed).map((e) => [e.from, e.to].sort().join('|')));

function checkRoute(r: RouteFeasible, allowRide: boolean) {
  expect(r.lengthM).toBeCloseTo(
    r.legs.reduce((s, l) => s + l.lengthM, 0),
    9,
  );
  expect(r.travelSeconds).toBeCloseTo(
    r.legs.reduce((s, l) => s + l.seconds, 0),
    9,
  );
  expect(r.totalSeconds).toBeCloseTo(r.travelSeconds + r.swapCount * doc.settings.swapSeconds, 9);
  expect(r.maxPaidOutM).toBeLessThanOrEqual(r.tetherLengthM + 1e-9);
  r.swaps.forEach((s, i) => {
    expect(['anchor', 'airlock']).toContain(kindOf.get(s.node));
    expect(s.paidOutM).toBeLessThanOrEqual(r.tetherLengthM + 1e-9);
    if (i > 0) expect(s.atM).toBeGreaterThan(r.swaps[i - 1].atM);
  });
  for (const l of r.legs) {
    if (!allowRide) expect(l.kind).not.toBe('ride');
    expect(closed.has([l.from, l.to].sort().join('|'))).toBe(false);
    for (const h of doc.hazards) {
      if (h.kind === 'keep-out')
        expect(segmentIntersectsHazard(pos.get(l.from)!, pos.get(l.to)!, h)).toBe(false);
    }
  }
}

describe('route properties on a generated truss', () => {
  it('generates a valid station document', () => {
    expect(parseStationDocument(doc).ok).toBe(true);
  });
  it('legs add up, the tether holds, exclusions hold, and the modes order as they should', () => {
    fc.assert(
      fc.property(
        fc.nat({ max: attach.length - 1 }),
        fc.nat({ max: attach.length - 1 }),
        fc.boolean(),
        fc.boolean(),
        fc.integer({ min: 15, max: 40 }),
        (a, b, allowRide, carrying, tetherLengthM) => {
          fc.pre(a !== b);
          const req = { from: attach[a], to: attach[b], allowRide, carrying, tetherLengthM };
          const fast = findRoute(c, doc.settings, { ...req, mode: 'fastest' });
          const fewest = findRoute(c, doc.settings, { ...req, mode: 'fewest-swaps' });
          const balanced = findRoute(c, doc.settings, { ...req, mode: 'balanced' });
          expect(fewest.feasible).toBe(fast.feasible);
          expect(balanced.feasible).toBe(fast.feasible);
          if (!fast.feasible || !fewest.feasible || !balanced.feasible) return;
          for (const r of [fast, fewest, balanced]) checkRoute(r, allowRide);
          expect(fewest.swapCount).toBeLessThanOrEqual(fast.swapCount);
          expect(balanced.totalSeconds).toBeLessThanOrEqual(fast.totalSeconds + 1e-6);
          expect(balanced.totalSeconds).toBeLessThanOrEqual(fewest.totalSeconds + 1e-6);
          expect(fast.travelSeconds).toBeLessThanOrEqual(balanced.travelSeconds + 1e-6);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('extra attach points never add swaps or cost; more tether out never takes fewer; nothing out is a fresh clip', () => {
    const cost = (r: RouteResult, mode: RouteMode) =>
      !r.feasible
        ? Infinity
        : mode === 'fewest-swaps'
          ? r.swapCount
          : mode === 'balanced'
            ? r.totalSeconds
            : r.travelSeconds;
    fc.assert(
      fc.property(
        fc.nat({ max: attach.length - 1 }),
        fc.nat({ max: attach.length - 1 }),
        fc.nat({ max: attach.length - 1 }),
        fc.array(fc.nat({ max: doc.nodes.length - 1 }), { maxLength: 30 }),
        fc.integer({ min: 15, max: 40 }),
        fc.tuple(fc.integer({ min: 0, max: 99 }), fc.integer({ min: 0, max: 99 })),
        (a, b, z, extraPicks, tetherLengthM, [p, q]) => {
          fc.pre(a !== b);
          const req = { from: attach[a], to: attach[b], tetherLengthM };
          const extraAttach = [...new Set(extraPicks.map((i) => doc.nodes[i].key))];
          const [lo, hi] = [Math.min(p, q), Math.max(p, q)].map((v) => (v / 100) * tetherLengthM);
          for (const mode of ['fastest', 'fewest-swaps', 'balanced'] as RouteMode[]) {
            const fresh = findRoute(c, doc.settings, { ...req, mode });
            const withExtra = findRoute(c, doc.settings, { ...req, mode, extraAttach });
            if (mode !== 'fastest')
              expect(cost(withExtra, mode)).toBeLessThanOrEqual(cost(fresh, mode) + 1e-6);
            // nothing out, clipped at the start or at another attach point: the fresh route's cost
            for (const startAnchor of [attach[a], attach[z]]) {
              const held = findRoute(
                c,
                doc.settings,
                { ...req, mode, startAnchor, startPaidOutM: 0 },
                { strategy: 'label-search' },
              );
              expect(held.feasible).toBe(fresh.feasible);
              if (held.feasible && fresh.feasible) {
                expect(cost(held, mode)).toBeCloseTo(cost(fresh, mode), 6);
                if (mode === 'fewest-swaps') expect(held.swapCount).toBe(fresh.swapCount);
                if (held.swapCount === 0)
                  expect(held.tetherAtEnd).toEqual({ anchor: startAnchor, paidOutM: held.lengthM });
              }
            }
            // the same anchor with more out: never cheaper
            const start = { startAnchor: attach[z] };
            const less = findRoute(c, doc.settings, { ...req, ...start, mode, startPaidOutM: lo });
            const more = findRoute(c, doc.settings, { ...req, ...start, mode, startPaidOutM: hi });
            expect(cost(more, mode)).toBeGreaterThanOrEqual(cost(less, mode) - 1e-6);
            for (const r of [withExtra, less, more])
              if (r.feasible) expect(r.maxPaidOutM).toBeLessThanOrEqual(tetherLengthM + 1e-9);
          }
        },
      ),
      { numRuns: 40 },
    );
  });
});
