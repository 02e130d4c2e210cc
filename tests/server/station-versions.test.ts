import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { replayStationChanges, type StationChange } from '@shared/compute/station-changes';
import type { StationDocument } from '@shared/schemas/station';
import { buildStationDocument, FIXTURE_KEYS as K, stationDocumentFile } from '../factories/station-document';
import { importStation } from '../setup/stations';
import { makeTestApp, type TestAgent, type TestApp } from '../setup/test-app';

/** small, so a short history passes several stored snapshots */
const SNAPSHOT_EVERY = 4;
let t: TestApp;
let engineer: TestAgent;
beforeAll(async () => {
  t = await makeTestApp({ stationSnapshotEvery: SNAPSHOT_EVERY });
  engineer = await t.agent('engineer');
});
afterAll(() => t.close());

const newStation = async (doc?: unknown): Promise<number> => (await importStation(engineer, doc)).id;

const exported = async (id: number): Promise<StationDocument> =>
  (await engineer.get(`/api/stations/${id}/export`)).body;

/** One write of any kind the station takes, chosen from a few numbers. */
type Op = { kind: number; a: number; b: number; x: number };
const opArb: fc.Arbitrary<Op> = fc.record({
  kind: fc.integer({ min: 0, max: 13 }),
  a: fc.nat(40),
  b: fc.nat(40),
  x: fc.integer({ min: -9, max: 9 }),
});

/** Runs one write against the station; answers whether the station took it (a refusal is fine). */
async function write(id: number, version: number, op: Op, n: number): Promise<boolean> {
  const doc = await exported(id);
  const node = doc.nodes[op.a % Math.max(doc.nodes.length, 1)];
  const other = doc.nodes[op.b % Math.max(doc.nodes.length, 1)];
  const graph = (await engineer.get(`/api/stations/${id}/graph`)).body;
  const edge = graph.edges[op.a % Math.max(graph.edges.length, 1)];
  const hazard = doc.hazards[op.a % Math.max(doc.hazards.length, 1)];
  const segment = doc.segments[op.a % Math.max(doc.segments.length, 1)];
  const base = `/api/stations/${id}`;
  const q = `?version=${version}`;
  let res;
  switch (op.kind) {
    case 0:
      res = await engineer
        .post(`${base}/nodes`)
        .send({ version, node: { key: `N-${n}`, kind: 'anchor', position: [op.x, op.b, 1] } });
      break;
    case 1:
      if (!node) return false;
      res = await engineer
        .patch(`${base}/nodes/${node.key}`)
        .send({ version, node: { position: [op.x, 1, 2], label: op.b % 2 ? `moved ${n}` : null } });
      break;
    case 2:
      if (!node) return false;
      res = await engineer.delete(`${base}/nodes/${node.key}${q}`);
      break;
    case 3:
      if (!node || !other) return false;
      res = await engineer
        .post(`${base}/edges`)
        .send({ version, edge: { from: node.key, to: other.key, kind: op.x > 0 ? 'hop' : 'handrail' } });
      break;
    case 4:
      if (!edge) return false;
      res = await engineer
        .patch(`${base}/edges/${edge.id}`)
        .send({ version, edge: { closed: !edge.closed } });
      break;
    case 5:
      // new ends: the edge is replaced in place
      if (!edge || !other) return false;
      res = await engineer.patch(`${base}/edges/${edge.id}`).send({ version, edge: { to: other.key } });
      break;
    case 6:
      if (!edge) return false;
      res = await engineer.delete(`${base}/edges/${edge.id}${q}`);
      break;
    case 7:
      res = await engineer.post(`${base}/hazards`).send({
        version,
        hazard: { key: `H-${n}`, kind: 'caution', shape: 'sphere', center: [op.x, 0, 0], radiusM: 1 + op.b },
      });
      break;
    case 8:
      if (!hazard) return false;
      res =
        op.b % 2
          ? await engineer.delete(`${base}/hazards/${hazard.key}${q}`)
          : await engineer
              .patch(`${base}/hazards/${hazard.key}`)
              .send({ version, hazard: { label: `h ${n}` } });
      break;
    case 9:
      if (!segment || op.b % 3 === 0) {
        res = await engineer.post(`${base}/segments`).send({
          version,
          segment: { key: `SEG-${n}`, kind: 'platform', center: [op.x, 0, 0], size: [1, 2, 3] },
        });
      } else
        res =
          op.b % 3 === 1
            ? await engineer.delete(`${base}/segments/${segment.key}${q}`)
            : await engineer
                .patch(`${base}/segments/${segment.key}`)
                .send({ version, segment: { rotationDeg: [0, 0, op.x * 10] } });
      break;
    case 10:
      res = await engineer.patch(base).send({
        version,
        ...(op.b % 2 ? { name: `Station ${n}` } : {}),
        orbit: { betaDeg: op.x * 5 },
        settings: { tetherLengthM: 10 + op.b, speedsMps: { hop: 0.05 + op.a / 100 } },
      });
      break;
    case 11: {
      // a replace import of the model with the node list turned round and one node fewer
      const next = { ...doc, nodes: [...doc.nodes].reverse() };
      const dropped = next.nodes.find((nd) => ![K.airlock].includes(nd.key as typeof K.airlock));
      if (dropped && op.b % 2) {
        next.nodes = next.nodes.filter((nd) => nd !== dropped);
        next.edges = next.edges.filter((e) => e.from !== dropped.key && e.to !== dropped.key);
      }
      res = await engineer
        .put(`${base}/import`)
        .field('version', String(version))
        .attach('file', stationDocumentFile(next), 's.json');
      break;
    }
    case 12: {
      const csv = ['key,kind,label,x,y,z,nx,ny,nz,notes', `CSV-${n},junction,From a table,${op.x},2,2,,,,`];
      if (node)
        csv.push(
          `${node.key},${node.kind === 'socket' ? 'socket' : 'junction'},Updated,1,1,1,${node.kind === 'socket' ? '0,0,1' : ',,'},`,
        );
      res = await engineer
        .post(`${base}/import-csv`)
        .field('version', String(version))
        .attach('nodes', Buffer.from(csv.join('\n')), 'nodes.csv');
      break;
    }
    default:
      if (!node) return false;
      res = await engineer
        .post(`${base}/socket-plan/accept`)
        .send({ version, sockets: [{ position: [op.x, 3, 3], normal: [0, 0, 1] }] });
      break;
  }
  return res.status < 300;
}

/** Every version the station has had, as its export said right after the write that made it. */
async function runHistory(ops: Op[]) {
  const id = await newStation();
  const seen = new Map<number, StationDocument>([[1, await exported(id)]]);
  let version = 1;
  for (const [n, op] of ops.entries()) {
    if (await write(id, version, op, n)) {
      version++;
      seen.set(version, await exported(id));
    }
  }
  return { id, seen, version };
}

async function keptChanges(id: number, upTo: number): Promise<StationChange[]> {
  const changes: StationChange[] = [];
  for (let v = 1; v <= upTo; v++) {
    const res = await engineer.get(`/api/stations/${id}/versions/${v}`);
    expect(res.status).toBe(200);
    changes.push(res.body.change);
  }
  return changes;
}

describe('station versions are kept: every write stores what it changed', () => {
  it('replaying the stored changes from version 1 rebuilds every later version exactly (property)', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(opArb, { minLength: 1, maxLength: 10 }), async (ops) => {
        const { id, seen, version } = await runHistory(ops);
        const changes = await keptChanges(id, version);
        for (const [v, doc] of seen)
          expect(replayStationChanges(changes.slice(0, v)), `version ${v}`).toEqual(doc);
      }),
      { numRuns: 8 },
    );
  });

  it('a long history reads back every version through the graph endpoint, past the stored snapshots', async () => {
    const ops = Array.from({ length: 3 * SNAPSHOT_EVERY + 2 }, (_, i) => ({
      kind: [0, 1, 3, 4, 7, 10, 9, 12][i % 8],
      a: i * 7,
      b: i * 3,
      x: (i % 17) - 8,
    }));
    const { id, seen, version } = await runHistory(ops);
    expect(version).toBeGreaterThan(2 * SNAPSHOT_EVERY + 1);
    const snapshots = t.ctx.sqlite
      .prepare('select count(*) n from station_versions where station_id = ? and snapshot_json is not null')
      .get(id) as { n: number };
    expect(snapshots.n).toBeGreaterThanOrEqual(2);
    const changes = await keptChanges(id, version);
    for (const [v, doc] of seen) {
      expect(replayStationChanges(changes.slice(0, v))).toEqual(doc);
      const g = (await engineer.get(`/api/stations/${id}/graph?version=${v}`)).body;
      expect(g.station).toMatchObject({
        id,
        version: v,
        name: doc.name,
        orbit: doc.orbit,
        settings: doc.settings,
      });
      expect({ nodes: g.nodes, hazards: g.hazards, segments: g.segments }).toEqual({
        nodes: doc.nodes,
        hazards: doc.hazards,
        segments: doc.segments,
      });
      expect(g.edges.map((e: { from: string; to: string; kind: string }) => [e.from, e.to, e.kind])).toEqual(
        doc.edges.map((e) => [e.from, e.to, e.kind]),
      );
    }
  });

  it('lists the versions newest first with who made each and what it changed', async () => {
    const id = await newStation();
    await engineer
      .post(`/api/stations/${id}/nodes`)
      .send({ version: 1, node: { key: 'NEW-1', kind: 'anchor', position: [1, 1, 1] } });
    const res = await engineer.get(`/api/stations/${id}/versions`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ stationId: id, currentVersion: 2, firstKeptVersion: 1, total: 2 });
    expect(res.body.items[0]).toMatchObject({
      version: 2,
      action: 'node.create',
      user: { name: expect.any(String) },
      summary: ['1 node added'],
    });
    expect(res.body.items[1]).toMatchObject({ version: 1, action: 'station.import' });
    expect((await engineer.get(`/api/stations/${id}/graph?version=9`)).status).toBe(404);
    expect((await engineer.get(`/api/stations/${id}/graph?version=zero`)).status).toBe(400);
    expect((await engineer.get(`/api/stations/${id}/versions/3`)).status).toBe(404);
  });

  it('a refused write keeps no version', async () => {
    const id = await newStation();
    const stale = await engineer
      .post(`/api/stations/${id}/nodes`)
      .send({ version: 7, node: { key: 'X', kind: 'anchor', position: [0, 0, 0] } });
    expect(stale.status).toBe(409);
    const bad = await engineer.put(`/api/stations/${id}/import`).attach(
      'file',
      stationDocumentFile({
        ...buildStationDocument(),
        nodes: [],
        edges: [{ from: 'A', to: 'B', kind: 'hop' }],
      }),
      's.json',
    );
    expect(bad.status).toBe(400);
    expect((await engineer.get(`/api/stations/${id}/versions`)).body.total).toBe(1);
  });
});

describe('deleting a station', () => {
  it('a station that plans use is refused with 409 naming them; an unused one goes', async () => {
    const used = await newStation();
    const planner = await t.agent('planner');
    const plan = await planner.post('/api/plans').send({
      title: 'Keeps the station',
      stationId: used,
      date: '2031-01-01',
      crew: { EV1: { name: 'A' }, EV2: { name: 'B' } },
    });
    expect(plan.status).toBe(201);
    const refused = await engineer.delete(`/api/stations/${used}?version=1`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toContain('Keeps the station');
    expect(refused.body.error.details).toEqual([
      { path: `plans.${plan.body.id}`, message: 'Keeps the station (draft)' },
    ]);
    expect((await engineer.get(`/api/stations/${used}`)).status).toBe(200);

    const unused = await newStation();
    expect((await engineer.delete(`/api/stations/${unused}?version=5`)).status).toBe(409);
    expect((await (await t.agent('planner')).delete(`/api/stations/${unused}?version=1`)).status).toBe(403);
    expect((await engineer.delete(`/api/stations/${unused}?version=1`)).status).toBe(204);
    expect((await engineer.get(`/api/stations/${unused}`)).status).toBe(404);
    expect((await engineer.get(`/api/stations/${unused}/versions`)).status).toBe(404);
  });
});
