import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { onStationChanged, type StationChange } from '../../server/modules/stations/stations.service';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { postStationDocument } from '../setup/stations';
import { makeTestApp, type TestApp } from '../setup/test-app';

// Imports and socket plans on task workers (TASK_WORKERS > 0) answer exactly what the main thread does.

let pooled: TestApp;
let inline: TestApp;

beforeAll(async () => {
  [pooled, inline] = await Promise.all([makeTestApp({ taskWorkers: 1 }), makeTestApp({ taskWorkers: 0 })]);
});
afterAll(() => Promise.all([pooled.close(), inline.close()]));

async function importFixture(t: TestApp, doc: unknown = buildStationDocument()) {
  return postStationDocument(await t.agent('engineer'), doc);
}

describe('task worker pool', () => {
  it('imports and plans sockets on a worker exactly as on the main thread, and tells the main thread of the write', async () => {
    const changes: StationChange[] = [];
    const stop = onStationChanged((c) => changes.push(c));
    try {
      const [a, b] = [await importFixture(pooled), await importFixture(inline)];
      expect(a.status).toBe(201);
      expect({ ...a.body.station, createdAt: 0, updatedAt: 0 }).toEqual({
        ...b.body.station,
        createdAt: 0,
        updatedAt: 0,
      });
      const csv = async (t: TestApp, id: number) =>
        (await t.agent('engineer'))
          .post(`/api/stations/${id}/import-csv`)
          .attach('edges', Buffer.from(`from,to,kind\n${K.anchorNear},${K.anchorFar},hop\n`), 'edges.csv');
      const [ca, cb] = [await csv(pooled, a.body.station.id), await csv(inline, b.body.station.id)];
      expect(ca.status).toBe(200);
      expect(ca.body.added).toEqual(cb.body.added);
      expect(changes).toContainEqual({ stationId: a.body.station.id, version: 2 });

      const plan = async (t: TestApp, id: number, body: object) =>
        (await t.agent('viewer')).post(`/api/stations/${id}/socket-plan`).send(body);
      for (const body of [
        { targets: [[9.5, 2.5, 0.4]], gridSpacingM: 0.5 },
        { targets: [[9.5, 2.5, 0.4]], candidates: [K.socket] },
        { targets: [[9.5, 2.5, 0.4]], candidates: ['NOPE'] },
        { targets: [[9.5, 2.5, 0.4]], candidates: [K.anchorNear] },
      ]) {
        const [pa, pb] = [
          await plan(pooled, a.body.station.id, body),
          await plan(inline, b.body.station.id, body),
        ];
        expect(pa.status, JSON.stringify(body)).toBe(pb.status);
        expect(pa.body, JSON.stringify(body)).toEqual(pb.body);
      }
      const errors = await Promise.all([
        plan(pooled, a.body.station.id, { targets: [[0, 0, 0]], candidates: ['NOPE'] }),
        plan(pooled, a.body.station.id, { targets: [[0, 0, 0]], candidates: [K.anchorNear] }),
      ]);
      expect(errors.map((r) => [r.status, r.body.error.code])).toEqual([
        [404, 'NOT_FOUND'],
        [400, 'VALIDATION_FAILED'],
      ]);
    } finally {
      stop();
    }
  });

  it('a worker that stops mid-import answers 503, writes nothing, and is replaced', async () => {
    const pool = pooled.ctx.taskPool!;
    const before = (await (await pooled.agent('viewer')).get('/api/stations')).body.length;
    const big = { ...buildStationDocument(), name: 'Never lands' };
    for (let i = 0; i < 20_000; i++)
      big.nodes.push({ key: `EXTRA-${i}`, kind: 'junction', position: [i * 0.01, 0, 0] });
    const pending = importFixture(pooled, big);
    // wait until the worker has the task, then stop it
    for (let i = 0; i < 200 && !pool.stats()[0].busy; i++) await new Promise((r) => setTimeout(r, 5));
    await pool.terminateWorker(0);
    const res = await pending;
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('UNAVAILABLE');
    expect(res.headers['retry-after']).toBeDefined();
    expect((await (await pooled.agent('viewer')).get('/api/stations')).body.length).toBe(before);
    expect((await importFixture(pooled)).status).toBe(201);
    expect(pool.stats()[0]).toMatchObject({ alive: true, restarts: 1 });
  });

  it('more tasks than the queue holds: the next is 503 with Retry-After at once', async () => {
    const small = await makeTestApp({ taskWorkers: 1, taskQueueLimit: 1 });
    try {
      const [first, second] = await Promise.all([importFixture(small), importFixture(small)]);
      expect([first.status, second.status].sort()).toEqual([201, 503]);
      const refused = first.status === 503 ? first : second;
      expect(refused.body.error.message).toMatch(/busy/);
      expect(refused.headers['retry-after']).toBe('5');
    } finally {
      await small.close();
    }
  });
});
