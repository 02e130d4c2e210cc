import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LINE_KEYS as K, lineStationDocument } from '../factories/day';
import { stationDocumentFile } from '../factories/station-document';
import { makeTestApp, type TestAgent, type TestApp } from '../setup/test-app';
import { fromWire } from '@shared/compute/day/wire';

let t: TestApp;
let planner: TestAgent;
let stationId: number;

const task = (title: string, worksite: string, crew: string, more: Record<string, unknown> = {}) => ({
  title,
  worksite,
  crew,
  durationSeconds: 600,
  ...more,
});

function planBody(tasks: unknown[]) {
  return {
    title: 'Order test',
    stationId,
    date: '2031-05-02',
    crew: { EV1: { name: 'Avery', tetherLengthM: 12 }, EV2: { name: 'Brook', tetherLengthM: 12 } },
    tasks,
  };
}

beforeAll(async () => {
  t = await makeTestApp({ routeWorkers: 0 });
  const res = await (
    await t.agent('engineer')
  )
    .post('/api/stations/import')
    .attach('file', stationDocumentFile(lineStationDocument()), 'line.json');
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  stationId = res.body.station.id;
  planner = await t.agent('planner');
});
afterAll(() => t.close());

describe('task order fields: after and optional', () => {
  it('a plan sent with its own ids for its tasks keeps the `after` links, rewritten to the ids it is given', async () => {
    const res = await planner
      .post('/api/plans')
      .send(
        planBody([
          task('Open', K.w1, 'EV1', { id: 1 }),
          task('Swap', K.w3, 'EV2', { id: 2, after: [1], optional: true }),
        ]),
      );
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const [open, swap] = res.body.tasks;
    expect(open.after).toEqual([]);
    expect(open.optional).toBe(false);
    expect(swap.after).toEqual([open.id]);
    expect(swap.optional).toBe(true);
  });

  it('a task keeps its id through edits and reordering, so `after` keeps naming the same task', async () => {
    const created = (
      await planner.post('/api/plans').send(planBody([task('A', K.w1, 'EV1'), task('B', K.w3, 'EV2')]))
    ).body;
    const [a, b] = created.tasks;
    const res = await planner.patch(`/api/plans/${created.id}`).send({
      version: created.version,
      tasks: [
        { ...b, after: [] },
        { ...a, title: 'A, renamed' },
        task('C', K.w2, 'both', { after: [a.id, b.id] }),
      ],
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const [b2, a2, c] = res.body.tasks;
    expect([b2.id, a2.id]).toEqual([b.id, a.id]);
    expect(c.id).not.toBe(a.id);
    expect(c.after).toEqual([a.id, b.id]);
    const timeline: ReturnType<typeof JSON.parse> = fromWire(
      (await planner.get(`/api/plans/${created.id}/timeline`)).body,
    );
    const work = (i: number) =>
      [...timeline.crew.EV1.blocks, ...timeline.crew.EV2.blocks].find(
        (x: { type: string; taskIndex?: number }) => x.type === 'work' && x.taskIndex === i,
      );
    expect(work(2).start).toBeGreaterThanOrEqual(Math.max(work(0).end, work(1).end));
  });

  it('`after` naming no task of the plan, or going round in a loop, is a 400 naming the entry by its path', async () => {
    const unknown = await planner
      .post('/api/plans')
      .send(planBody([task('A', K.w1, 'EV1', { id: 5 }), task('B', K.w3, 'EV2', { id: 6, after: [5, 99] })]));
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details).toEqual([
      { path: 'body.tasks[1].after[1]', message: 'no task of this plan has the id 99' },
    ]);

    const loop = await planner
      .post('/api/plans')
      .send(
        planBody([
          task('A', K.w1, 'EV1', { id: 5, after: [6] }),
          task('B', K.w3, 'EV2', { id: 6, after: [5] }),
        ]),
      );
    expect(loop.status).toBe(400);
    expect(loop.body.error.details).toEqual([
      {
        path: 'body.tasks[1].after[0]',
        message:
          'this makes a loop of tasks that each wait for the next: task 1 "A" → task 2 "B" → task 1 "A"',
      },
    ]);

    const twice = await planner
      .post('/api/plans')
      .send(planBody([task('A', K.w1, 'EV1', { id: 5 }), task('B', K.w3, 'EV2', { id: 5 })]));
    expect(twice.status).toBe(400);
    expect(twice.body.error.details[0].path).toBe('body.tasks[1].id');
  });
});
