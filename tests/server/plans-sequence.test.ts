import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fromWire } from '@shared/compute/day/wire';
import { LINE_KEYS as K, lineStationDocument } from '../factories/day';
import { makeAppWithStation } from '../setup/stations';
import type { TestAgent, TestApp } from '../setup/test-app';

let t: TestApp;
let planner: TestAgent;
let viewer: TestAgent;
let stationId: number;

const task = (title: string, worksite: string, crew: string, more: Record<string, unknown> = {}) => ({
  title,
  worksite,
  crew,
  durationSeconds: 600,
  ...more,
});

async function createPlan(tasks: unknown[]) {
  const res = await planner.post('/api/plans').send({
    title: 'Order test',
    stationId,
    date: '2031-05-02',
    crew: { EV1: { name: 'Avery', tetherLengthM: 12 }, EV2: { name: 'Brook', tetherLengthM: 12 } },
    routeMode: 'fewest-swaps',
    tasks,
  });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body;
}

beforeAll(async () => {
  // the worker pool: previews and proposals are computed off the request thread, as in production
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(lineStationDocument(), { routeWorkers: 1 }));
  planner = await t.agent('planner');
  viewer = await t.agent('viewer');
});
afterAll(() => t.close());

describe('timeline preview: any plan fields in, the timeline out, nothing saved', () => {
  it('answers the day the edited tasks would give, in the timeline’s wire format, and saves nothing', async () => {
    const plan = await createPlan([task('Near', K.w1, 'EV1'), task('Far', K.w3, 'EV1')]);
    const saved = fromWire((await planner.get(`/api/plans/${plan.id}/timeline`)).body);
    const longer = [{ ...plan.tasks[0], durationSeconds: 1800 }, plan.tasks[1]];
    const res = await viewer.post(`/api/plans/${plan.id}/timeline-preview`).send({ tasks: longer });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const preview = fromWire(res.body);
    // worked by hand: the first task's work is 20 min longer, nothing else changes
    expect(preview.endSeconds - saved.endSeconds).toBeCloseTo(1200, 6);
    expect(res.body.legTypes[res.body.routes[0].legs[0]]).toHaveLength(3);
    const after = (await planner.get(`/api/plans/${plan.id}`)).body;
    expect(after.version).toBe(plan.version);
    expect(after.tasks[0].durationSeconds).toBe(600);
  });

  it('a field the station does not have, or an order loop, is a 400 at its path; an unknown plan a 404', async () => {
    const plan = await createPlan([task('Near', K.w1, 'EV1')]);
    const bad = await planner
      .post(`/api/plans/${plan.id}/timeline-preview`)
      .send({ tasks: [task('Nowhere', 'NOPE', 'EV1')] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path)).toContain('body.tasks[0].worksite');
    const loop = await planner.post(`/api/plans/${plan.id}/timeline-preview`).send({
      tasks: [task('A', K.w1, 'EV1', { id: 1, after: [2] }), task('B', K.w3, 'EV1', { id: 2, after: [1] })],
    });
    expect(loop.status).toBe(400);
    expect(loop.body.error.details[0].path).toMatch(/^body\.tasks\[\d\]\.after\[0\]$/);
    const typo = await planner.post(`/api/plans/${plan.id}/timeline-preview`).send({ tasks: 'none' });
    expect(typo.status).toBe(400);
    const missing = await planner.post('/api/plans/999999/timeline-preview').send({});
    expect(missing.status).toBe(404);
  });
});

describe('POST /api/plans/:id/sequence: the order with the earliest day end', () => {
  it('proposes an order that keeps `after`, ends no later, and is the day the preview gives for it', async () => {
    // EV2's long job waits for EV1's short one, which the plan puts after EV1's long one
    const plan = await createPlan([
      task('Long EV1', K.w2, 'EV1', { durationSeconds: 3600 }),
      task('Short EV1', K.w1, 'EV1', { durationSeconds: 300 }),
      task('Long EV2', K.w3, 'EV2', { durationSeconds: 3600 }),
    ]);
    const [long1, short1, long2] = plan.tasks;
    const linked = await planner
      .patch(`/api/plans/${plan.id}`)
      .send({ version: plan.version, tasks: [long1, short1, { ...long2, after: [short1.id] }] });
    expect(linked.status, JSON.stringify(linked.body)).toBe(200);
    const res = await viewer.post(`/api/plans/${plan.id}/sequence`).send({});
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const body = res.body;
    expect([...body.tasks].sort()).toEqual([long1.id, short1.id, long2.id].sort());
    expect(body.tasks.indexOf(short1.id)).toBeLessThan(body.tasks.indexOf(long1.id));
    expect(body.tasks.indexOf(short1.id)).toBeLessThan(body.tasks.indexOf(long2.id));
    expect(body.exact).toBe(true);
    expect(body.explored).toBeGreaterThan(0);
    expect(body.seconds).toBeGreaterThan(0);
    // worked by hand: the short job first spares EV2 nearly the whole hour of waiting
    expect(body.currentEndSeconds - body.endSeconds).toBeGreaterThan(3000);
    expect(body.proposal.waitSeconds).toBeLessThan(body.current.waitSeconds);
    const byId = new Map(linked.body.tasks.map((x: { id: number }) => [x.id, x]));
    const preview = await viewer
      .post(`/api/plans/${plan.id}/timeline-preview`)
      .send({ tasks: body.tasks.map((id: number) => byId.get(id)) });
    expect(preview.status).toBe(200);
    expect(fromWire(preview.body).endSeconds).toBeCloseTo(body.endSeconds, 6);
    // nothing saved
    expect((await planner.get(`/api/plans/${plan.id}`)).body.version).toBe(linked.body.version);
  });

  it('a bad body is a 400 at its path, an unknown plan a 404, no session a 401', async () => {
    const plan = await createPlan([task('Near', K.w1, 'EV1')]);
    const tiny = await planner.post(`/api/plans/${plan.id}/sequence`).send({ budgetMs: 5 });
    expect(tiny.status).toBe(400);
    expect(tiny.body.error.details[0].path).toBe('body.budgetMs');
    const extra = await planner.post(`/api/plans/${plan.id}/sequence`).send({ order: [1] });
    expect(extra.status).toBe(400);
    expect(extra.body.error.code).toBe('VALIDATION_FAILED');
    const missing = await planner.post('/api/plans/999999/sequence').send({});
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('NOT_FOUND');
    const anonymous = await t.anonymous().post(`/api/plans/${plan.id}/sequence`).send({});
    expect(anonymous.status).toBe(401);
    const one = await viewer.post(`/api/plans/${plan.id}/sequence`).send({});
    expect(one.status).toBe(200);
    expect(one.body).toMatchObject({ tasks: [plan.tasks[0].id], exact: true });
    expect(one.body.endSeconds).toBe(one.body.currentEndSeconds);
  });
});
