import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readStaleVersion } from '@shared/errors';
import { onStationChanged } from '../../server/modules/stations/stations.service';
import { FIXTURE_KEYS as K } from '../factories/station-document';
import { importStation, stationGraph } from '../setup/stations';
import { makeTestAppAs, type TestAgent, type TestApp } from '../setup/test-app';

let t: TestApp;
let engineer: TestAgent;

beforeAll(async () => {
  ({ t, agent: engineer } = await makeTestAppAs('engineer'));
});
afterAll(() => t.close());

const newStation = async () => (await importStation(engineer)).id;
const graph = (id: number) => stationGraph(engineer, id);
async function audit(id: number) {
  return (await engineer.get(`/api/stations/${id}/audit`)).body as {
    items: {
      action: string;
      target: string;
      before: unknown;
      after: unknown;
      versionAfter: number;
      user: { name: string };
    }[];
    total: number;
  };
}

describe('node edits', () => {
  it('create, update and delete round-trip, each bumping the version with an audit row', async () => {
    const id = await newStation();
    const node = {
      key: 'NEW-S1',
      kind: 'socket',
      label: 'New socket',
      position: [3, 1.5, 0],
      normal: [0, 1, 0],
    };
    const created = await engineer.post(`/api/stations/${id}/nodes`).send({ version: 1, node });
    expect(created.status).toBe(201);
    expect(created.body).toEqual({ version: 2, node });
    expect((await graph(id)).nodes.find((n) => n.key === 'NEW-S1')).toEqual(node);

    const updated = await engineer
      .patch(`/api/stations/${id}/nodes/NEW-S1`)
      .send({ version: 2, node: { position: [3, 1.6, 0], label: null, notes: 'moved' } });
    expect(updated.status).toBe(200);
    expect(updated.body).toEqual({
      version: 3,
      node: { key: 'NEW-S1', kind: 'socket', position: [3, 1.6, 0], normal: [0, 1, 0], notes: 'moved' },
    });

    const deleted = await engineer.delete(`/api/stations/${id}/nodes/${K.junction}?version=3`);
    expect(deleted.status).toBe(200);
    expect(deleted.body.version).toBe(4);
    expect(deleted.body.removed.removedEdges).toHaveLength(2);
    const g = await graph(id);
    expect(g.station.version).toBe(4);
    expect(g.nodes.some((n) => n.key === K.junction)).toBe(false);
    expect(g.edges.some((e) => e.from === K.junction || e.to === K.junction)).toBe(false);

    const log = await audit(id);
    expect(log.items.map((i) => [i.action, i.target, i.versionAfter])).toEqual([
      ['node.delete', K.junction, 4],
      ['node.update', 'NEW-S1', 3],
      ['node.create', 'NEW-S1', 2],
      ['station.import', 'Test Station', 1],
    ]);
    expect(log.items[0].user.name).toBe('Mei Hartmann');
    expect(log.items[0].before).toMatchObject({
      node: { key: K.junction },
      removedEdges: [{ to: K.junction }, { from: K.junction }],
    });
    expect(log.items[1].before).toMatchObject({ label: 'New socket' });
    expect(log.items[1].after).toMatchObject({ notes: 'moved' });
  });

  it('re-validates: a socket without a unit normal, a duplicate key and an unknown node are refused, nothing changes', async () => {
    const id = await newStation();
    const noNormal = await engineer
      .patch(`/api/stations/${id}/nodes/${K.socket}`)
      .send({ version: 1, node: { normal: null } });
    expect(noNormal.status).toBe(400);
    expect(noNormal.body.error.details).toEqual([
      { path: 'body.node.normal', message: 'a socket needs a unit normal' },
    ]);
    const notUnit = await engineer
      .patch(`/api/stations/${id}/nodes/${K.socket}`)
      .send({ version: 1, node: { normal: [0, 0.5, 0] } });
    expect(notUnit.status).toBe(400);
    const duplicate = await engineer
      .post(`/api/stations/${id}/nodes`)
      .send({ version: 1, node: { key: K.airlock, kind: 'anchor', position: [0, 0, 0] } });
    expect(duplicate.status).toBe(409);
    expect(
      (await engineer.patch(`/api/stations/${id}/nodes/NOPE`).send({ version: 1, node: { label: 'x' } }))
        .status,
    ).toBe(404);
    const renaming = await engineer
      .patch(`/api/stations/${id}/nodes/${K.socket}`)
      .send({ version: 1, node: { key: 'OTHER' } });
    expect(renaming.status).toBe(400);
    expect((await graph(id)).station.version).toBe(1);
    expect((await audit(id)).total).toBe(1);
  });
});

describe('edge edits', () => {
  it('connect, close/open, change length, disconnect', async () => {
    const id = await newStation();
    const connect = await engineer
      .post(`/api/stations/${id}/edges`)
      .send({ version: 1, edge: { from: K.worksite, to: K.rideEnd, kind: 'hop', lengthM: 4 } });
    expect(connect.status).toBe(201);
    const edgeId = connect.body.edge.id as number;
    expect(connect.body).toEqual({
      version: 2,
      edge: { id: edgeId, from: K.worksite, to: K.rideEnd, kind: 'hop', lengthM: 4 },
    });

    const closed = await engineer
      .patch(`/api/stations/${id}/edges/${edgeId}`)
      .send({ version: 2, edge: { closed: true } });
    expect(closed.body.edge.closed).toBe(true);
    const derived = await engineer
      .patch(`/api/stations/${id}/edges/${edgeId}`)
      .send({ version: 3, edge: { lengthM: null, closed: false } });
    expect(derived.status).toBe(200);
    const stored = (await graph(id)).edges.find((e) => e.id === edgeId)!;
    expect(stored).toMatchObject({ closed: false, lengthGiven: false });
    expect(stored.lengthM).toBeCloseTo(Math.hypot(30 - 9.5, 0 - 1.6, 1.5 - 0.4), 9);

    const gone = await engineer.delete(`/api/stations/${id}/edges/${edgeId}?version=4`);
    expect(gone.status).toBe(200);
    expect(gone.body.version).toBe(5);
    expect((await graph(id)).edges.some((e) => e.id === edgeId)).toBe(false);
    expect((await audit(id)).items.slice(0, 4).map((i) => i.action)).toEqual([
      'edge.delete',
      'edge.update',
      'edge.update',
      'edge.create',
    ]);
  });

  it('unknown ends, self-loops, negative lengths and a duplicate edge are refused', async () => {
    const id = await newStation();
    const unknown = await engineer
      .post(`/api/stations/${id}/edges`)
      .send({ version: 1, edge: { from: K.airlock, to: 'GHOST', kind: 'handrail' } });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details).toEqual([
      { path: 'body.edge.to', message: 'unknown node key "GHOST"' },
    ]);
    expect(
      (
        await engineer
          .post(`/api/stations/${id}/edges`)
          .send({ version: 1, edge: { from: K.airlock, to: K.airlock, kind: 'hop' } })
      ).status,
    ).toBe(400);
    expect(
      (
        await engineer
          .post(`/api/stations/${id}/edges`)
          .send({ version: 1, edge: { from: K.airlock, to: K.socket, kind: 'hop', lengthM: -1 } })
      ).status,
    ).toBe(400);
    // the factory's first edge is airlock → near anchor, handrail; the reverse direction is the same edge
    for (const [from, to] of [
      [K.airlock, K.anchorNear],
      [K.anchorNear, K.airlock],
    ])
      expect(
        (
          await engineer
            .post(`/api/stations/${id}/edges`)
            .send({ version: 1, edge: { from, to, kind: 'handrail' } })
        ).status,
      ).toBe(409);
    expect((await graph(id)).station.version).toBe(1);
  });
});

describe('hazard, segment and station edits', () => {
  it('hazards: create, change shape, delete', async () => {
    const id = await newStation();
    const hazard = { key: 'CAM-1', kind: 'caution', shape: 'sphere', center: [1, 1, 1], radiusM: 0.5 };
    expect((await engineer.post(`/api/stations/${id}/hazards`).send({ version: 1, hazard })).status).toBe(
      201,
    );
    const reshaped = await engineer
      .patch(`/api/stations/${id}/hazards/CAM-1`)
      .send({ version: 2, hazard: { shape: 'box', min: [0, 0, 0], max: [2, 2, 2], kind: 'keep-out' } });
    expect(reshaped.status).toBe(200);
    expect(reshaped.body.hazard).toEqual({
      key: 'CAM-1',
      kind: 'keep-out',
      shape: 'box',
      min: [0, 0, 0],
      max: [2, 2, 2],
    });
    const badBox = await engineer
      .patch(`/api/stations/${id}/hazards/CAM-1`)
      .send({ version: 3, hazard: { max: [2, 0, 2] } });
    expect(badBox.status).toBe(400);
    expect(badBox.body.error.details[0].path).toBe('body.hazard.max[1]');
    expect((await engineer.post(`/api/stations/${id}/hazards`).send({ version: 3, hazard })).status).toBe(
      409,
    );
    expect((await engineer.delete(`/api/stations/${id}/hazards/CAM-1?version=3`)).body.version).toBe(4);
    expect((await graph(id)).hazards.map((h) => h.key).sort()).toEqual([K.caution, K.keepOut].sort());
  });

  it('segments: create, update, delete', async () => {
    const id = await newStation();
    const segment = { key: 'T2', label: 'Bay 2', kind: 'truss', center: [15, 0, 0], size: [10, 3, 3] };
    expect((await engineer.post(`/api/stations/${id}/segments`).send({ version: 1, segment })).body).toEqual({
      version: 2,
      segment,
    });
    const rotated = await engineer
      .patch(`/api/stations/${id}/segments/T2`)
      .send({ version: 2, segment: { rotationDeg: [0, 0, 45], label: null } });
    expect(rotated.body.segment).toEqual({
      key: 'T2',
      kind: 'truss',
      center: [15, 0, 0],
      size: [10, 3, 3],
      rotationDeg: [0, 0, 45],
    });
    expect((await graph(id)).segments.find((s) => s.key === 'T2')).toEqual(rotated.body.segment);
    expect((await engineer.delete(`/api/stations/${id}/segments/T2?version=3`)).status).toBe(200);
    expect((await graph(id)).segments.some((s) => s.key === 'T2')).toBe(false);
  });

  it('station name, orbit and settings (nested settings merged)', async () => {
    const id = await newStation();
    const res = await engineer.patch(`/api/stations/${id}`).send({
      version: 1,
      name: 'Renamed',
      orbit: { betaDeg: 55 },
      settings: { tetherLengthM: 16.8, speedsMps: { hop: 0.2 } },
    });
    expect(res.status).toBe(200);
    expect(res.body.version).toBe(2);
    expect(res.body.station).toMatchObject({ name: 'Renamed', orbit: { altitudeKm: 410, betaDeg: 55 } });
    expect(res.body.station.settings).toMatchObject({
      tetherLengthM: 16.8,
      speedsMps: { handrail: 0.1, hop: 0.2, ride: 0.05 },
    });
    const bad = await engineer
      .patch(`/api/stations/${id}`)
      .send({ version: 2, settings: { carryFactor: 0.5 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('body.settings.carryFactor');
  });
});

describe('concurrency and permissions', () => {
  it('a stale version is refused with 409 naming the current version and who changed it; nothing is overwritten', async () => {
    const id = await newStation();
    const admin = await t.agent('admin');
    expect(
      (
        await admin
          .patch(`/api/stations/${id}/nodes/${K.anchorNear}`)
          .send({ version: 1, node: { label: 'Admin label' } })
      ).status,
    ).toBe(200);
    const stale = await engineer
      .patch(`/api/stations/${id}/nodes/${K.anchorNear}`)
      .send({ version: 1, node: { label: 'Engineer label' } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('CONFLICT');
    expect(stale.body.error.message).toMatch(/now version 2, last changed by Ada Okafor/);
    expect(readStaleVersion(stale.body.error.details)).toMatchObject({
      currentVersion: 2,
      changedBy: 'Ada Okafor',
    });
    const staleDelete = await engineer.delete(`/api/stations/${id}/nodes/${K.anchorNear}?version=1`);
    expect(staleDelete.status).toBe(409);
    const g = await graph(id);
    expect(g.nodes.find((n) => n.key === K.anchorNear)!.label).toBe('Admin label');
    expect(g.station.version).toBe(2);
    expect((await engineer.delete(`/api/stations/${id}/nodes/${K.anchorNear}`)).status).toBe(400);
  });

  it('viewer, trainer and planner get 403 on every kind of edit; engineer and admin succeed', async () => {
    const id = await newStation();
    const attempts = (agent: TestAgent, version: number) => [
      agent
        .post(`/api/stations/${id}/nodes`)
        .send({ version, node: { key: `R-${version}`, kind: 'anchor', position: [0, 0, 0] } }),
      agent.patch(`/api/stations/${id}/edges/1`).send({ version, edge: { closed: true } }),
      agent.post(`/api/stations/${id}/hazards`).send({
        version,
        hazard: { key: `HZ-${version}`, kind: 'caution', shape: 'sphere', center: [0, 0, 0], radiusM: 1 },
      }),
      agent.patch(`/api/stations/${id}`).send({ version, name: `Name ${version}` }),
      agent.delete(`/api/stations/${id}/segments/${K.segment}?version=${version}`),
    ];
    for (const role of ['viewer', 'trainer', 'planner'] as const) {
      for (const res of await Promise.all(attempts(await t.agent(role), 1))) expect(res.status).toBe(403);
    }
    expect((await graph(id)).station.version).toBe(1);
    let version = 1;
    for (const role of ['engineer', 'admin'] as const) {
      const agent = await t.agent(role);
      for (const req of [
        () =>
          agent
            .post(`/api/stations/${id}/nodes`)
            .send({ version, node: { key: `R-${role}`, kind: 'anchor', position: [0, 0, 0] } }),
        () => agent.patch(`/api/stations/${id}`).send({ version, name: `By ${role}` }),
      ]) {
        const res = await req();
        expect(res.status).toBeLessThan(300);
        version = res.body.version;
      }
    }
    expect(version).toBe(5);
    expect(
      (
        await t
          .anonymous()
          .post(`/api/stations/${id}/nodes`)
          .send({ version: 5, node: { key: 'X', kind: 'anchor', position: [0, 0, 0] } })
      ).status,
    ).toBe(401);
  });

  it('tells listeners about every committed write, with the new version', async () => {
    const id = await newStation();
    const seen: number[] = [];
    const stop = onStationChanged((c) => c.stationId === id && seen.push(c.version));
    await engineer
      .patch(`/api/stations/${id}/nodes/${K.anchorNear}`)
      .send({ version: 1, node: { label: 'a' } });
    await engineer
      .patch(`/api/stations/${id}/nodes/${K.anchorNear}`)
      .send({ version: 1, node: { label: 'stale' } });
    await engineer.patch(`/api/stations/${id}`).send({ version: 2, name: 'b' });
    stop();
    await engineer.patch(`/api/stations/${id}`).send({ version: 3, name: 'c' });
    expect(seen).toEqual([2, 3]);
  });

  it('the audit log is paged, newest first', async () => {
    const id = await newStation();
    for (let v = 1; v <= 4; v++)
      await engineer.patch(`/api/stations/${id}`).send({ version: v, name: `Name ${v}` });
    const page1 = await engineer.get(`/api/stations/${id}/audit?pageSize=2`);
    const page2 = await engineer.get(`/api/stations/${id}/audit?pageSize=2&page=2`);
    expect(page1.body.total).toBe(5);
    expect(page1.body.items.map((i: { versionAfter: number }) => i.versionAfter)).toEqual([5, 4]);
    expect(page2.body.items.map((i: { versionAfter: number }) => i.versionAfter)).toEqual([3, 2]);
    expect((await (await t.agent('viewer')).get(`/api/stations/${id}/audit`)).status).toBe(200);
  });
});
