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
    expect(Array.isArray(res.body.routes[0].legs[0])).toBe(true);
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
