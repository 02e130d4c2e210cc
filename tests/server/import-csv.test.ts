import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildStationDocument, FIXTURE_KEYS } from '../factories/station-document';
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

const csv = (...lines: string[]) => Buffer.from(lines.join('\n') + '\n');

describe('POST /api/stations/:id/import-csv', () => {
  it('upserts nodes by key and adds edges, bumps the version and writes the audit', async () => {
    const id = await newStation();
    const nodes = csv(
      'key,kind,label,x,y,z,nx,ny,nz,notes',
      `${FIXTURE_KEYS.junction},anchor,Moved stanchion,5,0.5,1.5,,,,now an anchor`,
      'CSV-A1,anchor,New anchor,11,0,1.5,,,,',
      'CSV-S1,socket,"Socket, fore",11,1.5,0,0,1,0,',
    );
    const edges = csv(
      'from,to,kind,lengthM,closed',
      `${FIXTURE_KEYS.anchorFar},CSV-A1,handrail,3.1,`,
      'CSV-A1,CSV-S1,hop,,yes',
      `${FIXTURE_KEYS.anchorNear},${FIXTURE_KEYS.junction},handrail,,true`,
    );
    // the check (a dry run) tells what the merge adds and changes, and writes nothing
    const dry = await engineer
      .post(`/api/stations/${id}/import-csv?dryRun=1`)
      .field('version', '1')
      .attach('nodes', nodes, 'nodes.csv')
      .attach('edges', edges, 'edges.csv');
    expect(dry.status).toBe(200);
    expect(dry.body).toMatchObject({
      dryRun: true,
      added: { nodes: 2, edges: 2 },
      updated: { nodes: 1, edges: 1 },
      affectedPlans: [],
    });
    expect((await graph(id)).station.version).toBe(1);

    const res = await engineer
      .post(`/api/stations/${id}/import-csv`)
      .field('version', '1')
      .attach('nodes', nodes, 'nodes.csv')
      .attach('edges', edges, 'edges.csv');
    expect(res.status).toBe(200);
    expect(res.body.station.version).toBe(2);
    expect(res.body.added).toEqual({ nodes: 2, edges: 2 });
    expect(res.body.updated).toEqual({ nodes: 1, edges: 1 });

    const g = await graph(id);
    expect(g.nodes).toHaveLength(buildStationDocument().nodes.length + 2);
    expect(g.nodes.find((n) => n.key === FIXTURE_KEYS.junction)).toEqual({
      key: FIXTURE_KEYS.junction,
      kind: 'anchor',
      label: 'Moved stanchion',
      position: [5, 0.5, 1.5],
      notes: 'now an anchor',
    });
    expect(g.nodes.find((n) => n.key === 'CSV-S1')).toMatchObject({
      label: 'Socket, fore',
      normal: [0, 1, 0],
    });
    expect(g.edges.find((e) => e.from === 'CSV-A1' && e.to === 'CSV-S1')).toMatchObject({
      kind: 'hop',
      closed: true,
      lengthGiven: false,
      lengthM: Math.hypot(1.5, 1.5),
    });
    expect(
      g.edges.find((e) => e.from === FIXTURE_KEYS.anchorNear && e.to === FIXTURE_KEYS.junction),
    ).toMatchObject({ closed: true });
    expect(
      g.edges.filter(
        (e) =>
          [e.from, e.to].sort().join() === [FIXTURE_KEYS.anchorNear, FIXTURE_KEYS.junction].sort().join(),
      ),
    ).toHaveLength(1);

    const audit = await engineer.get(`/api/stations/${id}/audit`);
    expect(audit.body.items[0]).toMatchObject({
      action: 'station.import-csv',
      versionAfter: 2,
      user: { name: 'Mei Hartmann' },
    });
  });

  it('reports a bad line by line and column and writes nothing', async () => {
    const id = await newStation();
    const before = await graph(id);
    const nodes = csv(
      'key,kind,x,y,z,nx,ny,nz',
      'OK-1,anchor,1,2,3,,,',
      'OK-2,anchor,1,2,3,,,',
      'OK-3,anchor,1,2,3,,,',
      'OK-4,anchor,1,2,3,,,',
      'OK-5,anchor,1,2,3,,,',
      'BAD-1,anchor,not-a-number,2,3,,,',
      'BAD-2,socket,1,2,3,,,',
      'BAD-3,hatch,1,2,3,,,',
    );
    const edges = csv('from,to,kind', 'OK-1,NOWHERE,handrail');
    const res = await engineer
      .post(`/api/stations/${id}/import-csv`)
      .field('version', '1')
      .attach('nodes', nodes, 'nodes.csv')
      .attach('edges', edges, 'edges.csv');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('nodes.csv line 7, column x: must be a finite number');
    expect(res.body.error.details).toEqual(
      expect.arrayContaining([
        { path: 'nodes.csv line 7, column x', message: 'must be a finite number' },
        { path: 'nodes.csv line 8, column nx', message: 'a socket needs a unit normal' },
        expect.objectContaining({ path: 'nodes.csv line 9, column kind' }),
      ]),
    );
    const after = await graph(id);
    expect(after.station.version).toBe(1);
    expect(after.nodes).toEqual(before.nodes);
    expect(after.edges).toEqual(before.edges);
  });

  it('an edge to a key that is in neither the station nor the file: reported by line, nothing written', async () => {
    const id = await newStation();
    const nodes = csv('key,kind,x,y,z', 'NEW-1,anchor,1,2,3');
    const edges = csv('from,to,kind,lengthM', 'NEW-1,AL-1,handrail,2', 'NEW-1,GHOST,handrail,1');
    const res = await engineer
      .post(`/api/stations/${id}/import-csv?version=1`)
      .attach('nodes', nodes, 'nodes.csv')
      .attach('edges', edges, 'edges.csv');
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { path: 'edges.csv line 3, column to', message: 'unknown node key "GHOST"' },
    ]);
    expect((await graph(id)).nodes.some((n) => n.key === 'NEW-1')).toBe(false);
  });

  it('names every problem of the files in one answer: bad cells, a repeated key and an unknown end together', async () => {
    const id = await newStation();
    const nodes = csv('key,kind,x,y,z', 'TWO-1,anchor,1,2,3', 'TWO-1,anchor,4,5,6', 'TWO-2,anchor,oops,2,3');
    // TWO-2 did not read: an edge to it is not also called unknown; GHOST is
    const edges = csv('from,to,kind', 'TWO-1,TWO-2,handrail', 'TWO-1,GHOST,handrail', 'AL-1,TWO-1,teleport');
    const dry = await engineer
      .post(`/api/stations/${id}/import-csv?version=1&dryRun=1`)
      .attach('nodes', nodes, 'nodes.csv')
      .attach('edges', edges, 'edges.csv');
    expect(dry.status).toBe(400);
    expect(dry.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(
      [
        'nodes.csv line 4, column x',
        'edges.csv line 4, column kind',
        'nodes.csv line 3, column key',
        'edges.csv line 3, column to',
      ].sort(),
    );
    expect((await graph(id)).station.version).toBe(1);
  });

  it('counts lines from the text, so a quoted field over two lines does not shift later reports', async () => {
    const id = await newStation();
    const nodes = csv(
      'key,kind,x,y,z,notes',
      'Q-1,anchor,1,2,3,"first line',
      'second line"',
      'Q-2,anchor,1,2,oops,',
    );
    const res = await engineer
      .post(`/api/stations/${id}/import-csv?version=1`)
      .attach('nodes', nodes, 'nodes.csv');
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { path: 'nodes.csv line 4, column z', message: 'must be a finite number' },
    ]);
  });

  it('an unknown column, a stale version, a missing file and a viewer are refused', async () => {
    const id = await newStation();
    const unknown = await engineer
      .post(`/api/stations/${id}/import-csv?version=1`)
      .attach('nodes', csv('key,kind,x,y,z,colour', 'U-1,anchor,1,2,3,red'), 'nodes.csv');
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details[0].path).toBe('nodes.csv line 1, column colour');

    const stale = await engineer
      .post(`/api/stations/${id}/import-csv?version=7`)
      .attach('nodes', csv('key,kind,x,y,z', 'U-1,anchor,1,2,3'), 'nodes.csv');
    expect(stale.status).toBe(409);

    expect((await engineer.post(`/api/stations/${id}/import-csv?version=1`).field('x', '1')).status).toBe(
      400,
    );
    const viewer = await t.agent('viewer');
    expect(
      (
        await viewer
          .post(`/api/stations/${id}/import-csv?version=1`)
          .attach('nodes', csv('key,kind,x,y,z', 'U-1,anchor,1,2,3'), 'nodes.csv')
      ).status,
    ).toBe(403);
    expect((await graph(id)).station.version).toBe(1);
  });
});
