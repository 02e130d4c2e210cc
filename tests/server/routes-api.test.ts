import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildStationDocument, FIXTURE_KEYS as K, stationDocumentFile } from '../factories/station-document';
import { importStation } from '../setup/stations';
import { makeTestApp, type TestApp } from '../setup/test-app';
import { cachedStationIds, getCompiledStation } from '../../server/modules/compute/compiled-cache';

let t: TestApp;
let stationId: number;

const newStation = async (doc?: unknown) => (await importStation(await t.agent('engineer'), doc)).id;

beforeAll(async () => {
  t = await makeTestApp();
  stationId = await newStation();
});
afterAll(() => t.close());

const route = async (body: unknown, id = stationId, role: 'viewer' | 'planner' = 'viewer') =>
  (await t.agent(role)).post(`/api/stations/${id}/routes`).send(body as object);

// factory lengths: AL-1 →2 m→ T1-A01 →3 m→ T1-J01 →3.2 m (given)→ T1-A02 →hop √4.5 m→ T2-A01 →1 m→ T2-S1
const HOP_M = Math.hypot(1.5, 1.5);
const TO_SOCKET_M = 2 + 3 + 3.2 + HOP_M + 1;

describe('POST /api/stations/:id/routes', () => {
  it('answers a feasible route with exactly the documented fields, times from the station settings', async () => {
    const res = await route({ from: K.airlock, to: K.socket, mode: 'fastest' });
    expect(res.status).toBe(200);
    const body = res.body;
    for (const field of [
      'feasible',
      'nodes',
      'lengthM',
      'travelSeconds',
      'swapCount',
      'swaps',
      'totalSeconds',
      'warnings',
    ]) {
      expect(body).toHaveProperty(field);
    }
    expect(body.feasible).toBe(true);
    expect(body.nodes).toEqual([
      K.airlock,
      K.anchorNear,
      K.junction,
      K.anchorFar,
      K.anchorOtherFace,
      K.socket,
    ]);
    expect(body.lengthM).toBeCloseTo(TO_SOCKET_M, 9);
    // handrail and hop at 0.1 m/s plus the 30 s hop overhead (factory uses the default settings)
    expect(body.travelSeconds).toBeCloseTo(TO_SOCKET_M / 0.1 + 30, 6);
    expect(body).toMatchObject({ swapCount: 0, swaps: [] });
    expect(body.totalSeconds).toBeCloseTo(body.travelSeconds, 9);
    expect(Array.isArray(body.warnings)).toBe(true);
  });

  it('places tether swaps for a short tether and adds their time', async () => {
    const res = await route({ from: K.airlock, to: K.socket, mode: 'fewest-swaps', tetherLengthM: 7 });
    expect(res.status).toBe(200);
    expect(res.body.feasible).toBe(true);
    expect(res.body.swapCount).toBe(2);
    expect(res.body.swaps.map((s: { node: string }) => s.node)).toEqual([K.anchorNear, K.anchorFar]);
    expect(res.body.swaps[1].atM).toBeCloseTo(8.2, 9);
    expect(res.body.swaps[1].paidOutM).toBeCloseTo(6.2, 9);
    expect(res.body.totalSeconds).toBeCloseTo(res.body.travelSeconds + 2 * 90, 6);
  });

  it('carrying slows translation by the carry factor', async () => {
    const plain = await route({ from: K.airlock, to: K.socket, mode: 'balanced' });
    const carrying = await route({ from: K.airlock, to: K.socket, mode: 'balanced', carrying: true });
    expect(carrying.body.travelSeconds).toBeCloseTo(plain.body.travelSeconds * 1.5, 6);
  });

  it('says why when there is no route: feasible false with a reason, still 200', async () => {
    // the only edge to the worksite is closed
    const closed = await route({ from: K.airlock, to: K.worksite, mode: 'balanced' });
    expect(closed.status).toBe(200);
    expect(closed.body.feasible).toBe(false);
    expect(typeof closed.body.reason).toBe('string');
    expect(closed.body.reason.length).toBeGreaterThan(10);
    const gap = await route({ from: K.airlock, to: K.socket, mode: 'fewest-swaps', tetherLengthM: 5 });
    expect(gap.body).toMatchObject({ feasible: false, reasonCode: 'anchor-gap' });
  });

  it('every signed-in role may compute; signed out is 401', async () => {
    for (const role of ['admin', 'planner', 'planner2', 'engineer', 'trainer', 'viewer'] as const) {
      const res = await (
        await t.agent(role)
      )
        .post(`/api/stations/${stationId}/routes`)
        .send({ from: K.airlock, to: K.socket, mode: 'fastest' });
      expect(res.status, role).toBe(200);
    }
    const anon = await t
      .anonymous()
      .post(`/api/stations/${stationId}/routes`)
      .send({ from: K.airlock, to: K.socket, mode: 'fastest' });
    expect(anon.status).toBe(401);
  });

  it('404 for an unknown node key, naming it; 404 for an unknown station', async () => {
    const res = await route({ from: K.airlock, to: 'NO-SUCH-KEY', mode: 'fastest' });
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('NOT_FOUND');
    expect(res.body.error.message).toContain('NO-SUCH-KEY');
    const from = await route({ from: 'GHOST-1', to: K.socket, mode: 'fastest' });
    expect(from.status).toBe(404);
    expect(from.body.error.message).toContain('GHOST-1');
    expect((await route({ from: K.airlock, to: K.socket, mode: 'fastest' }, 999_999)).status).toBe(404);
  });

  it.each([
    ['tether as a NaN-like string', { tetherLengthM: 'NaN' }],
    ['tether as a numeric string', { tetherLengthM: '25' }],
    ['negative tether', { tetherLengthM: -3 }],
    ['zero tether', { tetherLengthM: 0 }],
    ['unknown mode', { mode: 'shortest' }],
    ['extra field', { speed: 2 }],
    ['carrying not a boolean', { carrying: 'yes' }],
    ['missing to', { to: undefined }],
    ['key with spaces', { from: 'AL 1' }],
  ])('400 for a bad body: %s', async (_name, change) => {
    const body = { from: K.airlock, to: K.socket, mode: 'fastest', ...change };
    const res = await route(body);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('VALIDATION_FAILED');
    expect(res.body.error.details.length).toBeGreaterThan(0);
  });

  it('400 for a station id that is not a number', async () => {
    expect(
      (
        await (
          await t.agent('viewer')
        )
          .post('/api/stations/abc/routes')
          .send({ from: K.airlock, to: K.socket, mode: 'fastest' })
      ).status,
    ).toBe(400);
  });
});

describe('POST /api/stations/:id/routes from a tether state', () => {
  it('starts from the anchor and length already out, and answers the tether state at both ends', async () => {
    // at the junction, 3 m out from the near anchor; a 7 m tether then needs a swap at the far anchor
    const fresh = await route({ from: K.junction, to: K.socket, mode: 'fewest-swaps', tetherLengthM: 7 });
    expect(fresh.status).toBe(200);
    expect(fresh.body).toMatchObject({ feasible: true, swapCount: 0, startNotAttachable: true });
    expect(fresh.body.tetherAtStart).toEqual({ anchor: K.junction, paidOutM: 0 });
    const held = await route({
      from: K.junction,
      to: K.socket,
      mode: 'fewest-swaps',
      tetherLengthM: 7,
      startAnchor: K.anchorNear,
      startPaidOutM: 3,
    });
    expect(held.status).toBe(200);
    expect(held.body.feasible).toBe(true);
    expect(held.body.startNotAttachable).toBeUndefined();
    expect(held.body.warnings.join(' ')).not.toMatch(/not a tether attach point/);
    expect(held.body.swaps).toHaveLength(1);
    expect(held.body.swaps[0]).toMatchObject({ node: K.anchorFar });
    expect(held.body.swaps[0].atM).toBeCloseTo(3.2, 9);
    expect(held.body.swaps[0].paidOutM).toBeCloseTo(6.2, 9);
    expect(held.body.tetherAtStart).toEqual({ anchor: K.anchorNear, paidOutM: 3 });
    expect(held.body.tetherAtEnd.anchor).toBe(K.anchorFar);
    expect(held.body.tetherAtEnd.paidOutM).toBeCloseTo(HOP_M + 1, 9);
  });

  it('extra attach points count for the query: a junction bridges a gap longer than the tether', async () => {
    const body = { from: K.airlock, to: K.socket, mode: 'balanced', tetherLengthM: 5 };
    expect((await route(body)).body).toMatchObject({ feasible: false, reasonCode: 'anchor-gap' });
    const bridged = await route({ ...body, extraAttach: [K.junction] });
    expect(bridged.status).toBe(200);
    expect(bridged.body.feasible).toBe(true);
    expect(bridged.body.swaps.map((sw: { node: string }) => sw.node)).toContain(K.junction);
    // and an extra attach point may be the start anchor
    const fromIt = await route({
      ...body,
      from: K.anchorFar,
      startAnchor: K.junction,
      startPaidOutM: 3.2,
      extraAttach: [K.junction],
    });
    expect(fromIt.status).toBe(200);
    expect(fromIt.body.tetherAtStart).toEqual({ anchor: K.junction, paidOutM: 3.2 });
  });

  it.each([
    ['paid out without an anchor', { startPaidOutM: 2 }, 'body.startAnchor'],
    ['an anchor that is not an attach point', { startAnchor: K.junction }, 'body.startAnchor'],
    ['a socket as the anchor', { startAnchor: K.socket, startPaidOutM: 1 }, 'body.startAnchor'],
    [
      'paid out at the station tether',
      { startAnchor: K.anchorNear, startPaidOutM: 25.9 },
      'body.startPaidOutM',
    ],
    [
      'paid out beyond the requested tether',
      { startAnchor: K.anchorNear, startPaidOutM: 7.5, tetherLengthM: 7 },
      'body.startPaidOutM',
    ],
    ['negative paid out', { startAnchor: K.anchorNear, startPaidOutM: -1 }, 'body.startPaidOutM'],
    ['paid out as a string', { startAnchor: K.anchorNear, startPaidOutM: '2' }, 'body.startPaidOutM'],
    ['too many extra attach points', { extraAttach: Array(501).fill(K.junction) }, 'body.extraAttach'],
    ['extra attach not a list', { extraAttach: K.junction }, 'body.extraAttach'],
  ])('400 for a bad start state: %s, at %s', async (_name, change, path) => {
    const res = await route({ from: K.airlock, to: K.socket, mode: 'fastest', ...change });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('VALIDATION_FAILED');
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain(path);
  });

  it('404 for an unknown key in the start anchor or the extra attach points, naming key and path', async () => {
    const extra = await route({
      from: K.airlock,
      to: K.socket,
      mode: 'balanced',
      extraAttach: [K.junction, 'GHOST-9'],
    });
    expect(extra.status).toBe(404);
    expect(extra.body.error.code).toBe('NOT_FOUND');
    expect(extra.body.error.message).toContain('GHOST-9');
    expect(extra.body.error.details).toEqual([{ path: 'body.extraAttach.1', message: expect.any(String) }]);
    const anchor = await route({ from: K.airlock, to: K.socket, mode: 'balanced', startAnchor: 'GHOST-1' });
    expect(anchor.status).toBe(404);
    expect(anchor.body.error.details[0].path).toBe('body.startAnchor');
  });
});

describe('compiled-station cache', () => {
  it('compiles once per station version', () => {
    const a = getCompiledStation(t.ctx, stationId);
    const b = getCompiledStation(t.ctx, stationId);
    expect(b.compiled).toBe(a.compiled);
    expect(cachedStationIds(t.ctx)).toContain(stationId);
  });

  it('recompiles after an edit: opening the closed edge makes the worksite reachable', async () => {
    const before = getCompiledStation(t.ctx, stationId);
    expect((await route({ from: K.airlock, to: K.worksite, mode: 'balanced' })).body.feasible).toBe(false);

    const engineer = await t.agent('engineer');
    const graph = (await engineer.get(`/api/stations/${stationId}/graph`)).body;
    const edge = graph.edges.find(
      (e: { from: string; to: string }) => e.from === K.socket && e.to === K.worksite,
    );
    const patch = await engineer
      .patch(`/api/stations/${stationId}/edges/${edge.id}`)
      .send({ version: graph.station.version, edge: { closed: false } });
    expect(patch.status).toBe(200);

    const after = await route({ from: K.airlock, to: K.worksite, mode: 'balanced' });
    expect(after.body.feasible).toBe(true);
    expect(after.body.nodes.at(-1)).toBe(K.worksite);
    const entry = getCompiledStation(t.ctx, stationId);
    expect(entry.version).toBe(before.version + 1);
    expect(entry.compiled).not.toBe(before.compiled);
  });

  it('recompiles after a PUT import that replaces the model', async () => {
    const engineer = await t.agent('engineer');
    const version = (await engineer.get(`/api/stations/${stationId}`)).body.version;
    const doc = buildStationDocument();
    // a shorter given length on the first handrail changes the route length
    doc.edges[0] = { ...doc.edges[0], lengthM: 1 };
    const put = await engineer
      .put(`/api/stations/${stationId}/import`)
      .field('version', String(version))
      .attach('file', stationDocumentFile(doc), 'station.json');
    expect(put.status, JSON.stringify(put.body)).toBe(200);
    const res = await route({ from: K.airlock, to: K.socket, mode: 'fastest' });
    expect(res.body.lengthM).toBeCloseTo(TO_SOCKET_M - 1, 9);
  });

  it('keeps a few stations, least recently used out first; another app has its own cache', async () => {
    const ids = [stationId];
    for (let i = 0; i < 5; i++)
      ids.push(await newStation(buildStationDocument({ name: `Cache station ${i}` })));
    for (const id of ids) getCompiledStation(t.ctx, id);
    const held = cachedStationIds(t.ctx);
    expect(held.length).toBe(4);
    expect(held).toEqual(ids.slice(-4));
    const other = await makeTestApp();
    try {
      expect(cachedStationIds(other.ctx)).toEqual([]);
    } finally {
      await other.close();
    }
  });
});
