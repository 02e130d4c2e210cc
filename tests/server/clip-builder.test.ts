import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { compileStation } from '@shared/compute/compiled-station';
import { excludeMaskFor, findRoute } from '@shared/compute/routes';
import { clipGraphFor, hasClipGraph } from '@shared/compute/routes-clip';
import { generateTrussStation } from '@shared/compute/truss-generator';
import type { RouteMode } from '@shared/schemas/route';
import {
  clipBuildsSettled,
  configureClipBuilds,
  routeOffPath,
  stopClipBuilds,
  type ClipBuildEvent,
} from '../../server/modules/compute/clip-builder';
import { getCompiledStation } from '../../server/modules/compute/compiled-cache';
import { warmLargeStations } from '../../server/modules/compute/compute.service';
import { makeTestApp, type TestApp } from '../setup/test-app';
import { importStation } from '../setup/stations';

// A 3,000-node truss stands in for a large station: the inline limit is lowered below it.
const doc = generateTrussStation({ nodes: 3000, seed: 11 });
const anchors = doc.nodes.filter((n) => n.kind === 'anchor').map((n) => n.key);
const events: ClipBuildEvent[] = [];

beforeAll(() => configureClipBuilds({ inlineNodes: 100, onEvent: (e) => events.push(e) }));
afterAll(async () => {
  await stopClipBuilds();
  configureClipBuilds({ inlineNodes: 20_000, onEvent: () => {} });
});

describe('clip graphs built off the request path', () => {
  it('answers at once, builds in a thread, and then answers from the handed-over clip graph', async () => {
    const c = compileStation(doc);
    const tether = doc.settings.tetherLengthM;
    const mask = excludeMaskFor(false);
    const req = { from: anchors[0], to: anchors[anchors.length - 1] };
    const first = routeOffPath(c, doc, { ...req, mode: 'fewest-swaps' });
    expect(first.feasible).toBe(true);
    expect(hasClipGraph(c.arcSeconds, tether, mask)).toBe(false);
    await clipBuildsSettled();
    expect(events.at(-1)).toMatchObject({
      ok: true,
      nodes: c.nodeCount,
      tetherLengthM: tether,
      excludeMask: mask,
    });
    expect(hasClipGraph(c.arcSeconds, tether, mask)).toBe(true);
    // with the cost landmarks for the station's swap time, and for it carrying (a swap costs the
    // same seconds, stretches the carry factor more), so neither `balanced` query builds them
    const marks = clipGraphFor(c, c.arcSeconds, tether, mask).costMarks;
    expect(marks.has(doc.settings.swapSeconds)).toBe(true);
    expect(marks.has(doc.settings.swapSeconds / doc.settings.carryFactor)).toBe(true);

    // the handed-over graph answers exactly as one built in this thread on a fresh compile
    const fresh = compileStation(doc);
    for (const mode of ['fastest', 'fewest-swaps', 'balanced'] as RouteMode[]) {
      for (let i = 0; i < 6; i++) {
        const r = {
          from: anchors[(i * 37) % anchors.length],
          to: anchors[(i * 91 + 13) % anchors.length],
          mode,
        };
        if (r.from === r.to) continue;
        const adopted = routeOffPath(c, doc, r);
        expect(JSON.stringify(adopted)).toBe(
          JSON.stringify(findRoute(fresh, doc.settings, r, { strategy: 'clip-graph' })),
        );
      }
    }
    // fewest swaps from the label search, before the build, is the same optimum
    const after = routeOffPath(c, doc, { ...req, mode: 'fewest-swaps' });
    expect(after.feasible && first.feasible && after.swapCount === first.swapCount).toBe(true);
  });

  it('runs one build at a time and builds each tether length once', async () => {
    const c = compileStation(doc);
    const before = events.length;
    const req = { from: anchors[3], to: anchors[anchors.length - 4], mode: 'balanced' as const };
    routeOffPath(c, doc, { ...req, tetherLengthM: 20 });
    routeOffPath(c, doc, { ...req, tetherLengthM: 20 });
    routeOffPath(c, doc, { ...req, tetherLengthM: 30 });
    await clipBuildsSettled();
    expect(events.slice(before).map((e) => e.tetherLengthM)).toEqual([20]);
    routeOffPath(c, doc, { ...req, tetherLengthM: 20 });
    routeOffPath(c, doc, { ...req, tetherLengthM: 30 });
    await clipBuildsSettled();
    expect(events.slice(before).map((e) => e.tetherLengthM)).toEqual([20, 30]);
  });

  it('a stopped build reports itself failed and leaves the label search answering', async () => {
    const c = compileStation(doc);
    const before = events.length;
    const req = {
      from: anchors[5],
      to: anchors[anchors.length - 6],
      mode: 'fewest-swaps' as const,
      tetherLengthM: 22,
    };
    const r = routeOffPath(c, doc, req);
    await stopClipBuilds();
    expect(events.slice(before)).toEqual([expect.objectContaining({ ok: false, tetherLengthM: 22 })]);
    expect(hasClipGraph(c.arcSeconds, 22, excludeMaskFor(false))).toBe(false);
    expect(JSON.stringify(routeOffPath(c, doc, req))).toBe(JSON.stringify(r));
    await stopClipBuilds();
  });
});

/**
 * Whether a clip graph was built off the request path by a route worker (or, without a pool, once
 * this thread's builds settle), waiting a bounded while for it.
 */
async function clipBuilt(app: TestApp, routeWorkers: number): Promise<boolean> {
  const built = async () =>
    routeWorkers
      ? app.ctx.routePool!.stats().some((s) => s.clipBuilds > 0)
      : (await clipBuildsSettled(), true);
  for (let i = 0; i < 200 && !(await built()); i++) await new Promise((r) => setTimeout(r, 50));
  return built();
}

describe('the routes endpoint on a station above the inline limit', () => {
  for (const routeWorkers of [0, 1]) {
    it(`builds the clip graph off the request path and keeps answering (${routeWorkers ? 'worker pool' : 'main thread'})`, async () => {
      const app = await makeTestApp({
        seedDemo: true,
        routeWorkers,
        routeClipInlineNodes: 100,
        routeInlineNodes: 0,
      });
      try {
        const viewer = await app.agent('viewer');
        const stationId = (await viewer.get('/api/stations')).body[0].id as number;
        const graph = (await viewer.get(`/api/stations/${stationId}/graph`)).body as {
          nodes: { key: string; kind: string }[];
        };
        const attach = graph.nodes.filter((n) => n.kind === 'anchor').map((n) => n.key);
        const body = { from: attach[0], to: attach[attach.length - 1], mode: 'fewest-swaps' };
        const first = await viewer.post(`/api/stations/${stationId}/routes`).send(body);
        expect(first.status).toBe(200);
        expect(await clipBuilt(app, routeWorkers)).toBe(true);
        if (!routeWorkers) {
          const { compiled, doc } = getCompiledStation(app.ctx, stationId);
          expect(hasClipGraph(compiled.arcSeconds, doc.settings.tetherLengthM, excludeMaskFor(false))).toBe(
            true,
          );
        }
        const again = await viewer.post(`/api/stations/${stationId}/routes`).send(body);
        expect(again.status).toBe(200);
        expect(again.body.swapCount).toBe(first.body.swapCount);
        expect(again.body.totalSeconds).toBeCloseTo(first.body.totalSeconds, 6);
      } finally {
        await app.close();
      }
    });
  }
});

describe('clip graphs warmed at start', () => {
  // above the inline limit these tests set, small enough to import and build in a moment
  const small = generateTrussStation({ nodes: 600, seed: 5 });

  it('leaves a station small enough to build its clip graph during a query alone', async () => {
    const app = await makeTestApp({ seedDemo: true, routeWorkers: 0 });
    try {
      expect(await warmLargeStations(app.ctx)).toBeNull();
    } finally {
      await app.close();
    }
  });

  for (const routeWorkers of [0, 1]) {
    it(`builds a large station's clip graph before its first query, where its routes are answered (${routeWorkers ? 'worker pool' : 'main thread'})`, async () => {
      // the demo seed computes routes (its walkthroughs), which would start a build of their own
      const app = await makeTestApp({ routeWorkers, routeClipInlineNodes: 100 });
      try {
        const stationId = (await importStation(await app.agent('engineer'), small)).id;
        expect(await warmLargeStations(app.ctx)).toBe(stationId);
        expect(await clipBuilt(app, routeWorkers)).toBe(true);
        if (routeWorkers) expect(app.ctx.routePool!.stats()[0]).toMatchObject({ compiles: 1, answered: 1 });
        else {
          const { compiled, doc } = getCompiledStation(app.ctx, stationId);
          expect(hasClipGraph(compiled.arcSeconds, doc.settings.tetherLengthM, excludeMaskFor(false))).toBe(
            true,
          );
        }
      } finally {
        await app.close();
      }
    });
  }
});
