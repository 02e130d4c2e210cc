import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { compileStation } from '@shared/compute/compiled-station';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { fromWire } from '@shared/compute/day/wire';
import { stationDocumentFile } from '../factories/station-document';
import { buildLongPlanInput } from '../factories/plan';
import { makeTestApp, type TestApp } from '../setup/test-app';
import {
  BoundedMemo,
  dayCacheStats,
  forgetStation,
  setRouteMemoBounds,
  type DayCacheStats,
} from '../../server/modules/compute/day-cache';
import { getCompiledStation } from '../../server/modules/compute/compiled-cache';
import { getPlan } from '../../server/modules/plans/plans.service';
import { dayOutputOn } from '../../server/modules/plans/plan-day';

/**
 * A day's legs are computed once per station version on the thread that computes its days, and the
 * day itself once per plan version: the exports and a second read of a plan cost only their
 * formatting, and every answer is the one a computation from nothing gives. The engine is the real
 * one; what the cache saved is read from its counts (the pool's stats for a worker).
 */

// under the size at which a clip graph is built during a query, so every computation of a route is the same one
const doc = generateTrussStation({ nodes: 600, seed: 7 });
const worksites = doc.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);
const TASKS = 12;

const planBody = (stationId: number) =>
  buildLongPlanInput(stationId, worksites, { tasks: TASKS, stride: 5, durationSeconds: 300 });

/** The plan's day as a computation from nothing makes it: a station compiled afresh, so nothing is kept for it. */
async function uncached(t: TestApp, planId: number, output: 'csv' | 'timeline', forget = true) {
  const plan = getPlan(t.ctx.db, planId);
  const entry = getCompiledStation(t.ctx, plan.stationId);
  const fresh = { doc: entry.doc, compiled: compileStation(entry.doc), version: entry.version };
  const result = await dayOutputOn(fresh, plan, output);
  // nothing of it stays kept on this thread (it counts as misses only)
  if (forget) forgetStation(fresh.compiled);
  return 'text' in result ? result.text : '';
}

/** The routes of a timeline answer as legs (from, to), and its crew lanes. */
function dayOf(text: string) {
  const tl = fromWire(JSON.parse(text));
  return { routes: tl.routes, crew: tl.crew, endSeconds: tl.endSeconds, warnings: tl.warnings };
}

for (const routeWorkers of [1, 0]) {
  describe(routeWorkers ? 'days on a route worker' : 'days on the main thread', () => {
    let t: TestApp;
    let stationId: number;
    let planId: number;

    /** What the thread that computes the days keeps, as the admin's server stats show it. */
    async function kept(): Promise<DayCacheStats> {
      const stats = (await (await t.agent('admin')).get('/api/compute/stats')).body;
      if (!routeWorkers) return stats.mainThreadDayCache;
      expect(stats.routeWorkers).toHaveLength(1);
      return stats.routeWorkers[0].dayCache;
    }

    beforeAll(async () => {
      t = await makeTestApp({ routeWorkers });
      const engineer = await t.agent('engineer');
      const imported = await engineer
        .post('/api/stations/import')
        .attach('file', stationDocumentFile({ ...doc, name: 'Truss' }), 'truss.json');
      expect(imported.status, JSON.stringify(imported.body)).toBe(201);
      stationId = imported.body.station.id;
      const created = await (await t.agent('planner')).post('/api/plans').send(planBody(stationId));
      expect(created.status, JSON.stringify(created.body)).toBe(201);
      planId = created.body.id;
    }, 60_000);
    afterAll(async () => {
      await t.close();
    });

    it('the CSV and PDF right after the timeline are served from the day it computed, and equal a computation from nothing', async () => {
      const viewer = await t.agent('viewer');
      const before = await kept();
      const timeline = await viewer.get(`/api/plans/${planId}/timeline`);
      expect(timeline.status).toBe(200);
      const first = await kept();
      expect(first.timelines.misses).toBe(before.timelines.misses + 1);
      expect(first.routes.misses).toBeGreaterThan(before.routes.misses);
      // worksites repeat in the plan: its own legs repeat too
      expect(first.routes.hits).toBeGreaterThan(before.routes.hits);

      const csv = await viewer.get(`/api/plans/${planId}/export.csv`);
      const pdf = await viewer.get(`/api/plans/${planId}/export.pdf`).buffer(true);
      expect([csv.status, pdf.status]).toEqual([200, 200]);
      const after = await kept();
      expect(after.timelines.misses).toBe(first.timelines.misses);
      expect(after.timelines.hits).toBe(first.timelines.hits + 2);
      expect(after.routes.misses).toBe(first.routes.misses);
      expect(after.routes.hits).toBe(first.routes.hits);

      expect(csv.text).toBe(await uncached(t, planId, 'csv'));
      expect(dayOf(timeline.text)).toEqual(dayOf(await uncached(t, planId, 'timeline')));
    });

    it('a new plan version is a new day, its legs reused', async () => {
      const planner = await t.agent('planner');
      const plan = getPlan(t.ctx.db, planId);
      const earlier = (await (await t.agent('viewer')).get(`/api/plans/${planId}/export.csv`)).text;
      const before = await kept();
      const tasks = plan.tasks.map((task, i) => (i === 0 ? { ...task, durationSeconds: 1800 } : task));
      const edited = await planner.patch(`/api/plans/${planId}`).send({ version: plan.version, tasks });
      expect(edited.status, JSON.stringify(edited.body)).toBe(200);

      const csv = await (await t.agent('viewer')).get(`/api/plans/${planId}/export.csv`);
      const after = await kept();
      expect(after.timelines.misses).toBe(before.timelines.misses + 1);
      expect(after.routes.misses).toBe(before.routes.misses);
      expect(after.routes.hits).toBeGreaterThan(before.routes.hits);
      expect(csv.text).toBe(await uncached(t, planId, 'csv'));
      expect(csv.text).not.toBe(earlier);
    });

    it('a station edit is a new version: the day is computed again and takes the new route', async () => {
      const viewer = await t.agent('viewer');
      const engineer = await t.agent('engineer');
      const day = dayOf((await viewer.get(`/api/plans/${planId}/timeline`)).text);
      // a handrail leg in the middle of the day's longest route: closing it makes the day go round
      const longest = day.routes.reduce((a, b) => ((b.legs?.length ?? 0) > (a.legs?.length ?? 0) ? b : a));
      const leg = longest.legs![Math.floor(longest.legs!.length / 2)];
      const graph = (await viewer.get(`/api/stations/${stationId}/graph`)).body as {
        station: { version: number };
        edges: { id: number; from: string; to: string }[];
      };
      const edge = graph.edges.find(
        (e) => (e.from === leg.from && e.to === leg.to) || (e.from === leg.to && e.to === leg.from),
      )!;
      const uses = (d: ReturnType<typeof dayOf>) =>
        d.routes.some((r) =>
          r.legs?.some(
            (l) => (l.from === edge.from && l.to === edge.to) || (l.from === edge.to && l.to === edge.from),
          ),
        );
      expect(uses(day)).toBe(true);

      const before = await kept();
      const closed = await engineer
        .patch(`/api/stations/${stationId}/edges/${edge.id}`)
        .send({ version: graph.station.version, edge: { closed: true } });
      expect(closed.status, JSON.stringify(closed.body)).toBe(200);
      const now = dayOf((await viewer.get(`/api/plans/${planId}/timeline`)).text);
      const after = await kept();
      expect(uses(now)).toBe(false);
      expect(now).toEqual(dayOf(await uncached(t, planId, 'timeline')));
      expect(after.timelines.misses).toBe(before.timelines.misses + 1);
      expect(after.routes.misses).toBeGreaterThan(before.routes.misses);
      // the old version's entries are dropped with it
      expect(after.routes.entries).toBe(after.routes.misses - before.routes.misses);
    });

    if (!routeWorkers)
      it('a day computed within a small bound is the same day, and the memo stays within it', async () => {
        setRouteMemoBounds(3, 40_000);
        try {
          const bounded = await uncached(t, planId, 'csv', false);
          const { routes } = dayCacheStats();
          expect(routes.entries).toBeLessThanOrEqual(3);
          expect(routes.entries === 1 || routes.bytes <= 40_000).toBe(true);
          setRouteMemoBounds();
          expect(bounded).toBe(await uncached(t, planId, 'csv'));
        } finally {
          setRouteMemoBounds();
        }
      });
  });
}

describe('the route memo is bounded', () => {
  it('keeps the most recently used entries within its count and its bytes', () => {
    const memo = new BoundedMemo<string>(2, 100);
    memo.set('a', 'A', 10);
    memo.set('b', 'B', 10);
    expect(memo.get('a')).toBe('A');
    memo.set('c', 'C', 10);
    expect(memo.get('b')).toBeUndefined();
    expect(memo.get('a')).toBe('A');
    memo.set('d', 'D', 95);
    expect(memo.stats()).toEqual({ entries: 1, bytes: 95, budgetBytes: 100 });
    // the newest stays whatever its size
    memo.set('e', 'E', 500);
    expect(memo.get('e')).toBe('E');
    expect(memo.stats().entries).toBe(1);
  });
});
