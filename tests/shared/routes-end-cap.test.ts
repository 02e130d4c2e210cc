import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compileStation } from '@shared/compute/compiled-station';
import { findRoute } from '@shared/compute/routes';
import type { RouteMode, RouteRequest } from '@shared/schemas/route';
import { adjacency, exhaustive, keepOutEdges, smallStationArb } from './routes-oracle';

const MAX_EDGES = 7;
const modes: RouteMode[] = ['fastest', 'fewest-swaps', 'balanced'];

describe('a route that must arrive with tether to spare (endPaidOutMaxM)', () => {
  it('matches the exhaustive search over walks, which may pass the end, swap beyond it and come back', () => {
    fc.assert(
      fc.property(
        smallStationArb,
        fc.nat(),
        fc.nat(),
        fc.integer({ min: 0, max: 100 }).map((v) => v / 100),
        (doc, a, b, share) => {
          const n = doc.nodes.length;
          const s = a % n;
          const t = b % n;
          fc.pre(s !== t);
          const tether = doc.settings.tetherLengthM;
          const cap = share * tether;
          const adj = adjacency(doc, { blocked: keepOutEdges(doc) });
          const best = exhaustive(doc, adj, s, t, tether, MAX_EDGES, { endCapM: cap });
          const c = compileStation(doc);
          for (const mode of modes) {
            const request: RouteRequest = {
              from: doc.nodes[s].key,
              to: doc.nodes[t].key,
              mode,
              endPaidOutMaxM: cap,
            };
            for (const strategy of ['clip-graph', 'label-search'] as const) {
              const r = findRoute(c, doc.settings, request, { strategy });
              if (!r.feasible) {
                expect(best.fastest, `${mode}/${strategy}: the oracle found a walk`).toBeNull();
                continue;
              }
              expect(r.tetherAtEnd!.paidOutM).toBeLessThanOrEqual(cap + 1e-9);
              if (r.legs.length > MAX_EDGES) continue;
              if (mode === 'fastest') expect(r.travelSeconds).toBeCloseTo(best.fastest!.seconds, 6);
              if (mode === 'fewest-swaps') {
                expect(r.swapCount).toBe(best.fewestSwaps!.swaps);
                expect(r.travelSeconds).toBeCloseTo(best.fewestSwaps!.seconds, 6);
              }
              if (mode === 'balanced') expect(r.totalSeconds).toBeCloseTo(best.balanced!.total, 6);
            }
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});
