import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fromGraphColumns, type GraphColumns } from '@shared/compute/graph-columns';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { parseStationDocument, type StationDocumentInput } from '@shared/schemas/station';
import type { StationGraph } from '@shared/schemas/station-edits';
import { buildStationDocument, FIXTURE_KEYS, stationDocumentFile } from '../factories/station-document';
import { postStationDocument, stationGraph } from '../setup/stations';
import { makeTestAppAs, type TestAgent, type TestApp } from '../setup/test-app';

/**
 * A station document as an outside tool writes it, every part of the format present: settings, a
 * truss segment, an anchor, a socket and a junction joined by a handrail, a keep-out and a caution.
 */
const OUTSIDE_EXAMPLE = {
  format: 'tetherwise.station',
  version: 1,
  name: 'Design example',
  orbit: { altitudeKm: 410, betaDeg: 20 },
  settings: {
    tetherLengthM: 25.9,
    speedsMps: { handrail: 0.1, hop: 0.1, ride: 0.05 },
    hopSeconds: 30,
    swapSeconds: 90,
    carryFactor: 1.5,
    reach: { standOffM: 1.0, radiusM: 0.7 },
  },
  segments: [{ key: 'PB3', label: 'Port bay 3', kind: 'truss', center: [0, 0, 0], size: [5, 3, 3] }],
  nodes: [
    { key: 'PB3-A07', kind: 'anchor', label: 'Anchor 7', position: [1, 2, 3] },
    { key: 'PB3-S1', kind: 'socket', position: [1, 2, 3], normal: [0, 0, 1] },
    { key: 'PB3-J02', kind: 'junction', position: [4, 2, 3] },
  ],
  edges: [{ from: 'PB3-A07', to: 'PB3-J02', kind: 'handrail' }],
  hazards: [
    { key: 'RAD-1', kind: 'keep-out', shape: 'sphere', center: [0, 0, 0], radiusM: 2 },
    { key: 'ANT-1', kind: 'caution', shape: 'box', min: [0, 0, 0], max: [1, 1, 1] },
  ],
};

let t: TestApp;
let engineer: TestAgent;

beforeAll(async () => {
  ({ t, agent: engineer } = await makeTestAppAs('engineer'));
});
afterAll(() => t.close());

const importDoc = (doc: unknown, agent = engineer) =>
  postStationDocument(agent, doc, 'station.tetherwise.json');
const graphOf = (id: number) => stationGraph(engineer, id);

/** The model part of a graph, independent of row order and database ids. */
function comparable(g: Pick<StationGraph, 'nodes' | 'edges' | 'hazards' | 'segments'>) {
  const byJson = <T>(xs: T[]) => xs.map((x) => JSON.stringify(x)).sort();
  return {
    nodes: byJson(g.nodes),
    edges: byJson(g.edges.map(({ id: _id, ...e }) => e)),
    hazards: byJson(g.hazards),
    segments: byJson(g.segments),
  };
}

describe('POST /api/stations/import', () => {
  it('imports the design example: 201 with the station and its counts', async () => {
    const res = await importDoc(OUTSIDE_EXAMPLE);
    expect(res.status).toBe(201);
    expect(res.body.station).toMatchObject({ name: 'Design example', version: 1 });
    expect(typeof res.body.station.id).toBe('number');
    expect(res.body.counts).toEqual({ nodes: 3, edges: 1, hazards: 2, segments: 1 });

    const list = await (await t.agent('viewer')).get('/api/stations');
    expect(list.status).toBe(200);
    expect(list.body.map((s: { id: number }) => s.id)).toContain(res.body.station.id);

    const g = await graphOf(res.body.station.id);
    expect(g.station).toMatchObject({
      id: res.body.station.id,
      name: 'Design example',
      version: 1,
      orbit: { altitudeKm: 410, betaDeg: 20 },
    });
    expect(g.station.settings.reach).toMatchObject({ standOffM: 1, radiusM: 0.7 });
    expect(g.nodes.find((n) => n.key === 'PB3-S1')).toEqual({
      key: 'PB3-S1',
      kind: 'socket',
      position: [1, 2, 3],
      normal: [0, 0, 1],
    });
    // no length given: derived from the positions [1,2,3] → [4,2,3]
    expect(g.edges).toEqual([
      {
        id: expect.any(Number),
        from: 'PB3-A07',
        to: 'PB3-J02',
        kind: 'handrail',
        lengthM: 3,
        lengthGiven: false,
        closed: false,
      },
    ]);
  });

  it('fills the optional parts with their defaults', async () => {
    const minimal = {
      format: 'tetherwise.station',
      version: 1,
      name: 'Bare',
      nodes: [{ key: 'A', kind: 'airlock', position: [0, 0, 0] }],
      edges: [],
    };
    const res = await importDoc(minimal);
    expect(res.status).toBe(201);
    expect(res.body.counts).toEqual({ nodes: 1, edges: 0, hazards: 0, segments: 0 });
    expect(res.body.station.orbit).toEqual({ altitudeKm: 410, betaDeg: 20 });
    expect(res.body.station.settings.tetherLengthM).toBe(25.9);
  });

  it('refuses a viewer, a planner and a trainer (403) and anyone signed out (401)', async () => {
    for (const role of ['viewer', 'planner', 'trainer'] as const) {
      expect((await importDoc(OUTSIDE_EXAMPLE, await t.agent(role))).status).toBe(403);
    }
    const anon = await t
      .anonymous()
      .post('/api/stations/import')
      .attach('file', stationDocumentFile(OUTSIDE_EXAMPLE), 'x.json');
    expect(anon.status).toBe(401);
  });

  it('needs the file in the multipart field "file"', async () => {
    const res = await engineer.post('/api/stations/import').field('version', '1');
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([{ path: 'file', message: 'required' }]);
  });
});

describe('GET /api/stations/:id/export', () => {
  it('sends the station document as an attachment; edges keep lengthM only where it was given', async () => {
    const imported = await importDoc(buildStationDocument({ name: 'Export Me' }));
    const res = await engineer.get(`/api/stations/${imported.body.station.id}/export`);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toBe('attachment; filename="Export-Me.tetherwise.json"');
    const parsed = parseStationDocument(res.body);
    expect(parsed.ok).toBe(true);
    const given = res.body.edges.filter((e: { lengthM?: number }) => e.lengthM !== undefined);
    expect(given).toEqual([
      { from: FIXTURE_KEYS.junction, to: FIXTURE_KEYS.anchorFar, kind: 'handrail', lengthM: 3.2 },
    ]);
    expect(res.body.edges.find((e: { closed?: boolean }) => e.closed)).toMatchObject({
      from: FIXTURE_KEYS.socket,
      to: FIXTURE_KEYS.worksite,
    });
  });

  it('404 for a station that does not exist', async () => {
    expect((await engineer.get('/api/stations/999999/export')).status).toBe(404);
    expect((await engineer.get('/api/stations/999999/graph')).status).toBe(404);
  });

  it('a generated truss station round-trips: export → re-import → the same graph', async () => {
    const doc = generateTrussStation({ nodes: 300, seed: 7 });
    const first = await importDoc(doc);
    expect(first.status).toBe(201);
    expect(first.body.counts.nodes).toBe(doc.nodes.length);
    const exported = await engineer.get(`/api/stations/${first.body.station.id}/export`);
    const second = await importDoc(exported.body);
    expect(second.status).toBe(201);
    expect(comparable(await graphOf(second.body.station.id))).toEqual(
      comparable(await graphOf(first.body.station.id)),
    );
  });
});

// ── property: any valid document survives import → export → import ──────────────────────────────

const coord = fc.double({ min: -500, max: 500, noNaN: true, noDefaultInfinity: true }).map((v) => v + 0);
const vec = fc.tuple(coord, coord, coord);
const unitNormal = fc
  .tuple(
    fc.double({ min: -1, max: 1, noNaN: true }),
    fc.double({ min: -1, max: 1, noNaN: true }),
    fc.double({ min: -1, max: 1, noNaN: true }),
  )
  .filter(([x, y, z]) => Math.hypot(x, y, z) > 0.1)
  .map(([x, y, z]) => {
    const l = Math.hypot(x, y, z);
    return [x / l, y / l, z / l] as [number, number, number];
  });
const label = fc.option(fc.string({ maxLength: 20 }), { nil: undefined });

const documentArb: fc.Arbitrary<StationDocumentInput> = fc
  .record({
    nodeCount: fc.integer({ min: 2, max: 25 }),
    nodeSpecs: fc.array(
      fc.record({
        kind: fc.constantFrom('airlock', 'junction', 'anchor', 'socket', 'worksite'),
        position: vec,
        normal: unitNormal,
        withNormal: fc.boolean(),
        label,
        notes: label,
      }),
      { minLength: 25, maxLength: 25 },
    ),
    edgeSpecs: fc.array(
      fc.record({
        a: fc.nat(),
        b: fc.nat(),
        kind: fc.constantFrom('handrail', 'hop', 'ride'),
        lengthM: fc.option(fc.double({ min: 0, max: 100, noNaN: true }), { nil: undefined }),
        closed: fc.option(fc.constant(true), { nil: undefined }),
        label,
      }),
      { maxLength: 40 },
    ),
    hazards: fc.array(
      fc.oneof(
        fc.record({
          kind: fc.constantFrom('keep-out', 'caution'),
          shape: fc.constant('sphere'),
          center: vec,
          radiusM: fc.double({ min: 0.1, max: 20, noNaN: true }),
        }),
        fc.record({
          kind: fc.constantFrom('keep-out', 'caution'),
          shape: fc.constant('box'),
          min: vec,
          size: fc.tuple(
            fc.integer({ min: 1, max: 9 }),
            fc.integer({ min: 1, max: 9 }),
            fc.integer({ min: 1, max: 9 }),
          ),
        }),
      ),
      { maxLength: 4 },
    ),
    segments: fc.array(
      fc.record({
        kind: fc.constantFrom('truss', 'module', 'platform'),
        center: vec,
        rotated: fc.option(vec, { nil: undefined }),
      }),
      { maxLength: 4 },
    ),
  })
  .map(({ nodeCount, nodeSpecs, edgeSpecs, hazards, segments }) => {
    const nodes = nodeSpecs.slice(0, nodeCount).map((s, i) => ({
      key: `N${i}`,
      kind: s.kind,
      position: s.position,
      ...(s.kind === 'socket' || s.withNormal ? { normal: s.normal } : {}),
      ...(s.label !== undefined ? { label: s.label } : {}),
      ...(s.notes !== undefined ? { notes: s.notes } : {}),
    }));
    const seen = new Set<string>();
    const edges = edgeSpecs.flatMap((e) => {
      const from = `N${e.a % nodeCount}`;
      const to = `N${e.b % nodeCount}`;
      const pair = [from, to].sort().join('|') + e.kind;
      if (from === to || seen.has(pair)) return [];
      seen.add(pair);
      return [
        {
          from,
          to,
          kind: e.kind,
          ...(e.lengthM !== undefined ? { lengthM: e.lengthM } : {}),
          ...(e.closed ? { closed: true } : {}),
          ...(e.label !== undefined ? { label: e.label } : {}),
        },
      ];
    });
    return {
      format: 'tetherwise.station' as const,
      version: 1 as const,
      name: 'Generated',
      nodes,
      edges,
      hazards: hazards.map((h, i) =>
        h.shape === 'sphere'
          ? { key: `H${i}`, kind: h.kind, shape: 'sphere' as const, center: h.center, radiusM: h.radiusM }
          : {
              key: `H${i}`,
              kind: h.kind,
              shape: 'box' as const,
              min: h.min,
              max: h.min.map((m, j) => m + h.size[j]) as [number, number, number],
            },
      ),
      segments: segments.map((s, i) => ({
        key: `S${i}`,
        kind: s.kind,
        center: s.center,
        size: [3, 3, 5] as [number, number, number],
        ...(s.rotated ? { rotationDeg: s.rotated } : {}),
      })),
    };
  });

describe('GET /api/stations/:id/graph/columns', () => {
  it("reads back to the graph endpoint's answer, gzipped once and sent as the same bytes; a version asked is that version", async () => {
    const doc = generateTrussStation({ nodes: 2000, seed: 11 });
    const { body } = await importDoc(doc);
    const id = (body.station as { id: number }).id;
    const graph = await graphOf(id);
    const res = await engineer.get(`/api/stations/${id}/graph/columns`).set('accept-encoding', 'gzip');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('gzip');
    const columns = res.body as GraphColumns;
    expect(fromGraphColumns(columns)).toEqual(graph);
    expect(JSON.stringify(columns).length).toBeLessThan(JSON.stringify(graph).length / 2);
    const again = await engineer.get(`/api/stations/${id}/graph/columns`).set('accept-encoding', 'gzip');
    expect(again.body).toEqual(columns);

    const first = await engineer.get(`/api/stations/${id}/graph/columns?version=1`);
    expect(first.status).toBe(200);
    expect(fromGraphColumns(first.body as GraphColumns)).toEqual(graph);
    expect((await engineer.get(`/api/stations/${id}/graph/columns?version=99`)).status).toBe(404);
    expect((await engineer.get('/api/stations/9999/graph/columns')).status).toBe(404);
  });
});

describe('export → re-import keeps the graph (property)', () => {
  it('for generated documents: the stored model equals the document, and its export re-imports to the same graph', async () => {
    await fc.assert(
      fc.asyncProperty(documentArb, async (doc) => {
        const parsed = parseStationDocument(doc);
        if (!parsed.ok)
          throw new Error(`generator made an invalid document: ${JSON.stringify(parsed.problems)}`);
        const first = await importDoc(doc);
        expect(first.status).toBe(201);
        const g1 = await graphOf(first.body.station.id);
        expect(comparable({ ...g1, edges: [] })).toEqual(comparable({ ...parsed.doc, edges: [] }));
        expect(g1.edges.map((e) => ({ ...e, lengthM: e.lengthGiven ? e.lengthM : undefined }))).toHaveLength(
          parsed.doc.edges.length,
        );
        for (const e of parsed.doc.edges) {
          const stored = g1.edges.find((x) => x.from === e.from && x.to === e.to && x.kind === e.kind)!;
          expect(stored.lengthGiven).toBe(e.lengthM !== undefined);
          if (e.lengthM !== undefined) expect(stored.lengthM).toBe(e.lengthM);
          expect(stored.closed).toBe(e.closed ?? false);
        }
        const exported = await engineer.get(`/api/stations/${first.body.station.id}/export`);
        const second = await importDoc(exported.body);
        expect(second.status).toBe(201);
        expect(comparable(await graphOf(second.body.station.id))).toEqual(comparable(g1));
      }),
      { numRuns: 25 },
    );
  });
});

describe('PUT /api/stations/:id/import', () => {
  it('replaces the model, bumps the version, and refuses a stale version with 409', async () => {
    const created = await importDoc(buildStationDocument({ name: 'Replace Me' }));
    const id = created.body.station.id;
    const replaced = await engineer
      .put(`/api/stations/${id}/import`)
      .field('version', '1')
      .attach('file', stationDocumentFile(OUTSIDE_EXAMPLE), 'x.json');
    expect(replaced.status).toBe(200);
    expect(replaced.body.station).toMatchObject({ id, name: 'Design example', version: 2 });
    expect(replaced.body.counts).toEqual({ nodes: 3, edges: 1, hazards: 2, segments: 1 });

    const stale = await engineer
      .put(`/api/stations/${id}/import?version=1`)
      .attach('file', stationDocumentFile(buildStationDocument()), 'x.json');
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('CONFLICT');
    expect(stale.body.error.message).toContain('version 2');
    expect(stale.body.error.message).toContain('Mei Hartmann');
    expect((await graphOf(id)).nodes.map((n) => n.key).sort()).toEqual(['PB3-A07', 'PB3-J02', 'PB3-S1']);

    // without a version the latest model is replaced
    const latest = await engineer
      .put(`/api/stations/${id}/import`)
      .attach('file', stationDocumentFile(buildStationDocument({ name: 'Again' })), 'x.json');
    expect(latest.status).toBe(200);
    expect(latest.body.station.version).toBe(3);
  });

  it('a bad replacement leaves the old model and version untouched', async () => {
    const created = await importDoc(buildStationDocument({ name: 'Keep Me' }));
    const id = created.body.station.id;
    const before = await graphOf(id);
    const bad = { ...OUTSIDE_EXAMPLE, edges: [{ from: 'PB3-A07', to: 'NOPE', kind: 'handrail' }] };
    const res = await engineer
      .put(`/api/stations/${id}/import?version=1`)
      .attach('file', stationDocumentFile(bad), 'x.json');
    expect(res.status).toBe(400);
    expect(res.body.error.details).toContainEqual({
      path: 'edges[0].to',
      message: 'unknown node key "NOPE"',
    });
    const after = await graphOf(id);
    expect(after.station.version).toBe(1);
    expect(comparable(after)).toEqual(comparable(before));
  });
});

describe('importing as a new station beside one of the same name', () => {
  it('a dry run names the stations of that name and writes nothing; a given name is the new station’s', async () => {
    const name = `Same name ${Date.now()}`;
    const first = await postStationDocument(engineer, buildStationDocument({ name }));
    expect(first.status).toBe(201);
    const count = (await engineer.get('/api/stations')).body.length;

    const preview = await engineer
      .post('/api/stations/import?dryRun=1')
      .attach('file', stationDocumentFile(buildStationDocument({ name })), 'station.json');
    expect(preview.status, JSON.stringify(preview.body)).toBe(200);
    expect(preview.body).toMatchObject({
      dryRun: true,
      name,
      sameName: [{ id: first.body.station.id, name, version: 1 }],
    });
    expect(preview.body.counts.nodes).toBe(buildStationDocument().nodes.length);
    expect((await engineer.get('/api/stations')).body.length).toBe(count);

    const renamed = await engineer
      .post('/api/stations/import')
      .field('name', `${name} (2)`)
      .attach('file', stationDocumentFile(buildStationDocument({ name })), 'station.json');
    expect(renamed.status).toBe(201);
    expect(renamed.body.station.name).toBe(`${name} (2)`);
    const none = await engineer
      .post('/api/stations/import?dryRun=1')
      .field('name', `${name} (3)`)
      .attach('file', stationDocumentFile(buildStationDocument({ name })), 'station.json');
    expect(none.body.sameName).toEqual([]);
    const blank = await engineer
      .post('/api/stations/import')
      .field('name', '  ')
      .attach('file', stationDocumentFile(buildStationDocument({ name })), 'station.json');
    expect(blank.status).toBe(400);
  });
});
