import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { compileStation } from '@shared/compute/compiled-station';
import { findRoute } from '@shared/compute/routes';
import { travelLowerBound } from '@shared/compute/travel-bound';
import { LINE_KEYS as K, lineStationDocument } from '../factories/day';

const doc = lineStationDocument();
const c = compileStation(doc);
const least = travelLowerBound(c, doc.settings, false);
const ATTACH = doc.nodes.filter((n) => n.kind === 'anchor' || n.kind === 'airlock').map((n) => n.key);
const NODES = doc.nodes.map((n) => n.key);

describe('the least translation time between nodes', () => {
  it('counts the swaps a tether of that length cannot avoid (worked by hand)', () => {
    // AL to W3 is 28 m of handrail at 10 s a metre: 280 s; a 12 m tether pays out at most 12 m
    // between attach points, so at least ⌈28 / 12⌉ − 1 = 2 swaps of 90 s
    expect(least(K.airlock, K.w3)).toBeCloseTo(280, 6);
    expect(least(K.airlock, K.w3, 12)).toBeCloseTo(280 + 2 * 90, 6);
    // 30 m of tether reaches all of it
    expect(least(K.airlock, K.w3, 30)).toBeCloseTo(280, 6);
  });

  it('is never more than the route from any tether state, for any tether length (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...NODES),
        fc.constantFrom(...NODES),
        fc.constantFrom(...ATTACH),
        fc.double({ min: 0, max: 0.99, noNaN: true }),
        fc.constantFrom(9, 12, 14, 20, 30),
        fc.constantFrom('fastest' as const, 'fewest-swaps' as const, 'balanced' as const),
        (from, to, anchor, share, tetherLengthM, mode) => {
          if (from === to) return;
          const r = findRoute(c, doc.settings, {
            from,
            to,
            mode,
            tetherLengthM,
            startAnchor: anchor,
            startPaidOutM: share * tetherLengthM,
          });
          if (!r.feasible) return;
          expect(least(from, to, tetherLengthM)).toBeLessThanOrEqual(r.totalSeconds + 1e-6);
        },
      ),
      { numRuns: 300 },
    );
  });
});
