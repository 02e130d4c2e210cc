import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildManifestItem, buildPlanInput, buildTask } from '../factories/plan';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { makeAppWithStation } from '../setup/stations';
import type { TestAgent, TestApp } from '../setup/test-app';

let t: TestApp;
let stationId: number;
let planner: TestAgent;

/** The factory station with the worksite's edge open. */
function stationDoc() {
  const doc = buildStationDocument();
  doc.edges = doc.edges.map((e) =>
    e.from === K.socket && e.to === K.worksite ? { ...e, closed: false } : e,
  );
  return doc;
}

beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(stationDoc()));
  planner = await t.agent('planner');
});
afterAll(() => t.close());

describe('plan revisions and compare', () => {
  it('keeps every revision and compares a known pair: a longer task, a new item, another route mode (worked by hand)', async () => {
    const created = await planner.post('/api/plans').send(
      buildPlanInput(stationId, {
        tasks: [
          buildTask({ title: 'Open the panel' }),
          buildTask({ title: 'Close the panel', durationSeconds: 300 }),
        ],
        manifest: [buildManifestItem({ key: 'wrench' })],
      }),
    );
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const id = created.body.id;
    const tasks = created.body.tasks.map((x: { durationSeconds: number }, i: number) =>
      i === 0 ? { ...x, durationSeconds: 1200 } : x,
    );
    const patched = await planner.patch(`/api/plans/${id}`).send({
      version: 1,
      routeMode: 'fewest-swaps',
      tasks,
      manifest: [...created.body.manifest, buildManifestItem({ key: 'bag', name: 'Tool bag', kind: 'bag' })],
    });
    expect(patched.status, JSON.stringify(patched.body)).toBe(200);

    const revisions = (await planner.get(`/api/plans/${id}/revisions`)).body;
    expect(revisions.map((r: { version: number; action: string }) => [r.version, r.action])).toEqual([
      [2, 'update'],
      [1, 'create'],
    ]);
    expect(revisions[0].user.name).toBeTruthy();

    const res = await planner.get(`/api/plans/${id}/compare?from=1&to=2`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const c = res.body;
    expect(c.settings).toEqual([{ field: 'routeMode', from: created.body.routeMode, to: 'fewest-swaps' }]);
    expect(c.tasks.added).toEqual([]);
    expect(c.tasks.removed).toEqual([]);
    expect(
      c.tasks.changed.map((x: { to: { title: string }; fields: string[] }) => [x.to.title, x.fields]),
    ).toEqual([['Open the panel', ['durationSeconds']]]);
    expect(c.tasks.reordered).toBe(false);
    expect(c.manifest.added.map((m: { key: string }) => m.key)).toEqual(['bag']);
    // ten more minutes of work for EV1, who alone works: the day ends ten minutes later for both
    // (the partner waits for the shared ingress), and the margin shrinks by as much
    expect(c.day.endSeconds.to - c.day.endSeconds.from).toBe(600);
    expect(c.day.marginSeconds.to - c.day.marginSeconds.from).toBe(-600);
    expect(c.day.crew.EV1.endSeconds.to - c.day.crew.EV1.endSeconds.from).toBe(600);
    expect(c.day.crew.EV1.swapCount.to).toBe(c.day.crew.EV1.swapCount.from);

    // the reverse says the opposite
    const back = (await planner.get(`/api/plans/${id}/compare?from=2&to=1`)).body;
    expect(back.manifest.removed.map((m: { key: string }) => m.key)).toEqual(['bag']);
    expect(back.day.endSeconds.to - back.day.endSeconds.from).toBe(-600);

    expect((await planner.get(`/api/plans/${id}/compare?from=1&to=9`)).status).toBe(404);
    expect((await planner.get(`/api/plans/${id}/compare?from=x&to=1`)).status).toBe(400);
  });

  it('a resubmitted plan tells reviewers the version they saw at the last submission', async () => {
    const created = (
      await planner.post('/api/plans').send(buildPlanInput(stationId, { title: 'Resubmitted' }))
    ).body;
    const id = created.id;
    const s1 = (await planner.post(`/api/plans/${id}/submit`).send({ version: 1 })).body;
    expect((await planner.get(`/api/plans/${id}`)).body.previousSubmissionVersion).toBeNull();
    const reviewer = await t.agent('planner2');
    const r = (
      await reviewer.post(`/api/plans/${id}/return`).send({ version: s1.version, comment: 'longer' })
    ).body;
    const e = (
      await planner.patch(`/api/plans/${id}`).send({ version: r.version, title: 'Resubmitted, longer' })
    ).body;
    const s2 = (await planner.post(`/api/plans/${id}/submit`).send({ version: e.version })).body;
    const seen = (await reviewer.get(`/api/plans/${id}`)).body;
    expect(seen.previousSubmissionVersion).toBe(s1.version);
    const since = (await reviewer.get(`/api/plans/${id}/compare?from=${s1.version}&to=${s2.version}`)).body;
    expect(since.settings).toEqual([{ field: 'title', from: 'Resubmitted', to: 'Resubmitted, longer' }]);
  });
});
