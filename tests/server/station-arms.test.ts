import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { postStationDocument, stationGraph } from '../setup/stations';
import { makeTestAppAs, type TestAgent, type TestApp } from '../setup/test-app';

let t: TestApp;
let engineer: TestAgent;

beforeAll(async () => {
  ({ t, agent: engineer } = await makeTestAppAs('engineer'));
});
afterAll(() => t.close());

const arm = {
  key: 'ARM-1',
  label: 'Test arm',
  baseNode: K.junction,
  reachM: 12,
  minReachM: 1,
  tipSpeedMps: 0.05,
  settleSeconds: 60,
};

const newStation = (doc: unknown = buildStationDocument({ arms: [arm] })) =>
  postStationDocument(engineer, doc);
const graph = (id: number) => stationGraph(engineer, id);
const csv = (...lines: string[]) => Buffer.from(lines.join('\n') + '\n');

describe('station arms', () => {
  it('import, graph and export carry the arms; the export re-imports to the same arms', async () => {
    const res = await newStation();
    expect(res.status).toBe(201);
    const id = res.body.station.id as number;
    expect((await graph(id)).arms).toEqual([arm]);
    const exported = (await engineer.get(`/api/stations/${id}/export`)).body;
    expect(exported.arms).toEqual([arm]);
    const again = await newStation(exported);
    expect((await graph(again.body.station.id)).arms).toEqual([arm]);
  });

  it('a bad arm is a 400 naming its path, and nothing is written', async () => {
    const before = (await engineer.get('/api/stations')).body.length;
    const res = await newStation(
      buildStationDocument({ arms: [{ ...arm, baseNode: 'NOWHERE', minReachM: 20, tipSpeedMps: 0 }] }),
    );
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['arms[0].minReachM', 'arms[0].tipSpeedMps']));
    const base = await newStation(buildStationDocument({ arms: [{ ...arm, baseNode: 'NOWHERE' }] }));
    expect(base.status).toBe(400);
    expect(base.body.error.details).toEqual([
      { path: 'arms[0].baseNode', message: 'unknown node key "NOWHERE"' },
    ]);
    expect((await engineer.get('/api/stations')).body.length).toBe(before);
  });

  it('the edit mode replaces the arms (checked against the nodes) and keeps the base node from being deleted', async () => {
    const id = (await newStation()).body.station.id as number;
    const moved = { ...arm, baseNode: K.anchorFar, reachM: 15 };
    const bad = await engineer
      .patch(`/api/stations/${id}`)
      .send({ version: 1, arms: [{ ...moved, baseNode: 'X' }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('body.arms[0].baseNode');
    const badSchema = await engineer
      .patch(`/api/stations/${id}`)
      .send({ version: 1, arms: [{ ...moved, minReachM: 15 }] });
    expect(badSchema.status).toBe(400);
    expect(badSchema.body.error.details[0].path).toBe('body.arms[0].minReachM');
    const ok = await engineer.patch(`/api/stations/${id}`).send({ version: 1, arms: [moved] });
    expect(ok.status).toBe(200);
    expect((await graph(id)).arms).toEqual([moved]);
    // the version before keeps its arms
    expect((await engineer.get(`/api/stations/${id}/graph?version=1`)).body.arms).toEqual([arm]);
    const del = await engineer.delete(`/api/stations/${id}/nodes/${K.anchorFar}?version=2`);
    expect(del.status).toBe(409);
    expect(del.body.error.message).toContain('ARM-1');
    // a new node may not take an arm's key
    const clash = await engineer
      .post(`/api/stations/${id}/nodes`)
      .send({ version: 2, node: { key: 'ARM-1', kind: 'junction', position: [1, 1, 1] } });
    expect(clash.status).toBe(400);
  });

  it('CSV: an arms table upserts by key; a bad row names file, line and column', async () => {
    const id = (await newStation()).body.station.id as number;
    const ok = await engineer
      .post(`/api/stations/${id}/import-csv?version=1`)
      .attach(
        'arms',
        csv(
          'key,label,baseNode,reachM,minReachM,tipSpeedMps,settleSeconds',
          `ARM-1,Test arm,${K.junction},14,1,0.05,45`,
          `ARM-2,,${K.airlock},8,,0.1,30`,
        ),
        'arms.csv',
      );
    expect(ok.status).toBe(200);
    expect((await graph(id)).arms).toEqual([
      { ...arm, reachM: 14, settleSeconds: 45 },
      { key: 'ARM-2', baseNode: K.airlock, reachM: 8, tipSpeedMps: 0.1, settleSeconds: 30 },
    ]);
    const bad = await engineer
      .post(`/api/stations/${id}/import-csv`)
      .attach(
        'arms',
        csv(
          'key,baseNode,reachM,minReachM,tipSpeedMps,settleSeconds',
          'ARM-3,NOPE,5,,0.1,30',
          'ARM-4,AL-1,5,6,0.1,30',
        ),
        'arms.csv',
      );
    expect(bad.status).toBe(400);
    expect(bad.body.error.details).toEqual(
      expect.arrayContaining([
        { path: 'arms.csv line 3, column minReachM', message: 'minimum reach must be below the reach (5 m)' },
      ]),
    );
    const badBase = await engineer
      .post(`/api/stations/${id}/import-csv`)
      .attach(
        'arms',
        csv('key,baseNode,reachM,tipSpeedMps,settleSeconds', 'ARM-3,NOPE,5,0.1,30'),
        'arms.csv',
      );
    expect(badBase.status).toBe(400);
    expect(badBase.body.error.details).toEqual([
      { path: 'arms.csv line 2, column baseNode', message: 'unknown node key "NOPE"' },
    ]);
    expect((await graph(id)).arms).toHaveLength(2);
  });
});
