import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { RouteFeasible } from '@shared/schemas/route';
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
});
