import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FIXTURE_KEYS as K } from '../factories/station-document';
import { makeAppWithStation } from '../setup/stations';
import type { TestApp } from '../setup/test-app';

let t: TestApp;
let stationId: number;

beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation());
});
afterAll(() => t.close());

const post = async (path: string, body: unknown, role: 'viewer' | 'engineer' | 'planner' = 'viewer') =>
  (await t.agent(role)).post(`/api/stations/${stationId}/${path}`).send(body as object);

// the factory socket T2-S1 sits at (9, 1.5, 0) with normal +y; default stand-off 1.0 m, reach 0.7 m
const WORK_POINT = [9, 2.5, 0];

describe('POST /api/stations/:id/reach', () => {
  it('measures from the work point p + n·h and reports the set angles', async () => {
    const res = await post('reach', { socket: K.socket, target: [9, 2.5, 0.5] });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ reachable: true, socket: K.socket, standOffM: 1, radiusM: 0.7 });
    expect(res.body.distanceM).toBeCloseTo(0.5, 12);
    expect(res.body.workPoint).toEqual(WORK_POINT);
    // straight along the socket plane's side axis (n × +x = +y × +x = −z): yaw −90°, level
    expect(res.body.yawDeg).toBeCloseTo(-90, 9);
    expect(res.body.pitchDeg).toBeCloseTo(0, 9);
    expect(res.body).toHaveProperty('yawSetDeg');
    expect(res.body).toHaveProperty('pitchSetDeg');
  });

  it('the fixture worksite is out of reach of its socket', async () => {
    const res = await post('reach', { socket: K.socket, target: [9.5, 1.6, 0.4] });
    expect(res.body.reachable).toBe(false);
    expect(res.body.distanceM).toBeCloseTo(Math.hypot(0.5, 0.9, 0.4), 12);
  });

  it('404 for an unknown socket key, 400 for a node that is not a socket, 400 for bad targets', async () => {
    const unknown = await post('reach', { socket: 'NOPE-1', target: [0, 0, 0] });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.message).toContain('NOPE-1');
    const notSocket = await post('reach', { socket: K.anchorFar, target: [0, 0, 0] });
    expect(notSocket.status).toBe(400);
    expect(notSocket.body.error.message).toContain(K.anchorFar);
    for (const target of [[0, 0], [0, 0, 'x'], [0, 0, null], 'here', [0, 0, 0, 0]]) {
      expect((await post('reach', { socket: K.socket, target })).status, JSON.stringify(target)).toBe(400);
    }
    expect((await post('reach', { socket: K.socket, target: [0, 0, 0], extra: 1 })).status).toBe(400);
  });
});

describe('POST /api/stations/:id/socket-plan', () => {
  it('picks the existing socket that reaches the targets and lists uncovered ones by index', async () => {
    const res = await post('socket-plan', {
      targets: [
        [9, 2.5, 0.5],
        [100, 100, 100],
        [9.3, 2.5, 0],
      ],
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ sockets: [K.socket], exact: true, uncovered: [1] });
    expect(res.body.assignments.map((a: { target: number }) => a.target)).toEqual([0, 2]);
  });

  it('with a grid spacing, offers a new socket on a truss face as {position, normal}', async () => {
    const res = await post('socket-plan', { targets: [[5, 2.5, 0]], gridSpacingM: 1 });
    expect(res.status).toBe(200);
    expect(res.body.uncovered).toEqual([]);
    expect(res.body.sockets).toHaveLength(1);
    const s = res.body.sockets[0];
    expect(typeof s).toBe('object');
    expect(s.normal).toEqual([0, 1, 0]);
    // on the +y face of the test truss bay (y = 1.5), within reach of the target
    expect(s.position[1]).toBeCloseTo(1.5, 12);
    const c = [s.position[0], s.position[1] + 1, s.position[2]];
    expect(Math.hypot(c[0] - 5, c[1] - 2.5, c[2])).toBeLessThanOrEqual(0.7);
  });

  it('an empty candidate list with a grid plans new sockets only; without a grid it is a 400', async () => {
    // the factory's socket reaches this target, so without the empty list it would be chosen
    const target = [9.2, 2.6, 0.1];
    const withExisting = await post('socket-plan', { targets: [target], gridSpacingM: 1 });
    expect(withExisting.status).toBe(200);
    expect(withExisting.body.sockets).toContain(K.socket);
    const gridOnly = await post('socket-plan', { targets: [target], candidates: [], gridSpacingM: 1 });
    expect(gridOnly.status).toBe(200);
    expect(gridOnly.body.sockets.length).toBeGreaterThan(0);
    for (const s of gridOnly.body.sockets) expect(typeof s).toBe('object');
    const nothing = await post('socket-plan', { targets: [target], candidates: [] });
    expect(nothing.status).toBe(400);
    expect(nothing.body.error.details[0].path).toBe('body.candidates');
  });

  it('candidate keys: unknown → 404, not a socket → 400; bad bodies → 400', async () => {
    expect((await post('socket-plan', { targets: [[9, 2.5, 0.5]], candidates: ['NOPE-2'] })).status).toBe(
      404,
    );
    expect((await post('socket-plan', { targets: [[9, 2.5, 0.5]], candidates: [K.worksite] })).status).toBe(
      400,
    );
    expect((await post('socket-plan', { targets: [] })).status).toBe(400);
    expect((await post('socket-plan', { targets: [[9, 2.5, 0.5]], gridSpacingM: 0 })).status).toBe(400);
    expect((await post('socket-plan', { targets: [[9, 2.5, 0.5]], gridSpacingM: 'NaN' })).status).toBe(400);
  });
});

describe('POST /api/stations/:id/socket-plan/accept', () => {
  it('saves the planned sockets joined by a hop to the nearest handrail node, version bumped, audited', async () => {
    const engineer = await t.agent('engineer');
    const before = (await engineer.get(`/api/stations/${stationId}/graph`)).body;
    const plan = await post('socket-plan', { targets: [[5, 2.5, 0]], gridSpacingM: 1 });
    const planned = plan.body.sockets[0];

    const denied = await post(
      'socket-plan/accept',
      { version: before.station.version, sockets: [planned] },
      'planner',
    );
    expect(denied.status).toBe(403);

    // asked first: a dry run names what would be added and writes nothing
    const preview = await post(
      `socket-plan/accept?dryRun=1`,
      { version: before.station.version, sockets: [planned] },
      'engineer',
    );
    expect(preview.status, JSON.stringify(preview.body)).toBe(200);
    expect(preview.body).toMatchObject({ dryRun: true, version: before.station.version, affectedPlans: [] });
    expect(preview.body.sockets.map((s: { key: string }) => s.key)).toEqual(['T1-S01']);
    expect((await engineer.get(`/api/stations/${stationId}`)).body.version).toBe(before.station.version);

    const res = await post(
      'socket-plan/accept',
      { version: before.station.version, sockets: [planned] },
      'engineer',
    );
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.version).toBe(before.station.version + 1);
    const [saved] = res.body.sockets;
    // named after the bay it is on, like the model's own sockets, and labelled with bay and face
    expect(saved.key).toBe('T1-S01');
    expect(saved.label).toBe('Test truss bay 1 fore foot restraint socket (planned)');
    // T1-J01 at (5, 0, 1.5) is the nearest junction or anchor on a handrail
    expect(saved.joinedTo).toBe(K.junction);
    expect(preview.body.sockets).toEqual(res.body.sockets);

    const after = (await engineer.get(`/api/stations/${stationId}/graph`)).body;
    expect(after.nodes.find((n: { key: string }) => n.key === 'T1-S01')).toMatchObject({
      kind: 'socket',
      normal: [0, 1, 0],
    });
    expect(
      after.edges.some(
        (e: { from: string; to: string; kind: string }) =>
          e.from === K.junction && e.to === 'T1-S01' && e.kind === 'hop',
      ),
    ).toBe(true);
    const audit = (await engineer.get(`/api/stations/${stationId}/audit`)).body;
    expect(JSON.stringify(audit)).toContain('sockets.accept');

    // the new socket is routable and plannable at once (the compiled cache follows the version)
    const route = await post('routes', { from: K.airlock, to: 'T1-S01', mode: 'balanced' });
    expect(route.body.feasible).toBe(true);
    const replan = await post('socket-plan', { targets: [[5, 2.5, 0]] });
    expect(replan.body.sockets).toEqual(['T1-S01']);
  });

  it('a stale version is 409 and adds nothing; a duplicate key is 400', async () => {
    const engineer = await t.agent('engineer');
    const graph = (await engineer.get(`/api/stations/${stationId}/graph`)).body;
    const stale = await post(
      'socket-plan/accept',
      { version: graph.station.version - 1, sockets: [{ position: [2, 1.5, 0], normal: [0, 1, 0] }] },
      'engineer',
    );
    expect(stale.status).toBe(409);
    const dup = await post(
      'socket-plan/accept',
      {
        version: graph.station.version,
        sockets: [{ position: [2, 1.5, 0], normal: [0, 1, 0], key: K.socket }],
      },
      'engineer',
    );
    expect(dup.status).toBe(400);
    const zero = await post(
      'socket-plan/accept',
      { version: graph.station.version, sockets: [{ position: [2, 1.5, 0], normal: [0, 0, 0] }] },
      'engineer',
    );
    expect(zero.status).toBe(400);
    const again = (await engineer.get(`/api/stations/${stationId}/graph`)).body;
    expect(again.station.version).toBe(graph.station.version);
    expect(again.nodes.length).toBe(graph.nodes.length);
  });
});
