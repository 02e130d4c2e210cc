import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { RouteMode, RouteRequest } from '@shared/schemas/route';
import { compileStation } from '@shared/compute/compiled-station';
import { findRoute, type RouteStrategy } from '@shared/compute/routes';
import { clipGraphFor } from '@shared/compute/routes-clip';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { smallStationArb } from './routes-oracle';

const MODES: RouteMode[] = ['fastest', 'fewest-swaps', 'balanced'];

function compare(c: ReturnType<typeof compileStation>, settings: Parameters<typeof findRoute>[1], req: Omit<RouteRequest, 'mode'>) {
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

describe('clip-graph search against the label-setting search', () => {
  // the sparse zone near the far end has anchors only on dead-end stubs, so long tethers and short
  // ones take different detours there
  const doc = generateTrussStation({ nodes: 1500, seed: 11 });
  const c = compileStation(doc);
  const keys = doc.nodes.map((n) => n.key);
  const attach = doc.nodes.filter((n) => n.kind === 'anchor' || n.kind === 'airlock').map((n) => n.key);
  const sparse = doc.nodes.filter((n) => n.position[0] > 0.85 * Math.max(...doc.nodes.map((m) => m.position[0]))).map((n) => n.key);

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

  it('gives the same optimum with station settings other than the compiled ones', () => {
    const settings = { ...doc.settings, hopSeconds: 2, swapSeconds: 20, speedsMps: { handrail: 0.2, hop: 0.05, ride: 0.3 } };
    fc.assert(
      fc.property(fc.constantFrom(...attach), fc.constantFrom(...sparse, ...attach), fc.constantFrom(8, 25.9), (from, to, tetherLengthM) => {
        fc.pre(from !== to);
        compare(c, settings, { from, to, tetherLengthM });
      }),
      { numRuns: 40 },
    );
  });

  it('gives the same optimum on small random stations', () => {
    fc.assert(
      fc.property(smallStationArb, fc.nat(), fc.nat(), fc.boolean(), fc.boolean(), (small, a, b, allowRide, carrying) => {
        const n = small.nodes.length;
        fc.pre(a % n !== b % n);
        compare(compileStation(small), small.settings, { from: small.nodes[a % n].key, to: small.nodes[b % n].key, allowRide, carrying });
      }),
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
