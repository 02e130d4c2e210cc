import http from 'node:http';
import zlib from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { MAX_TASKS } from '@shared/schemas/plan';
import { stationDocumentFile } from '../factories/station-document';
import { buildLongPlanInput } from '../factories/plan';
import { blockedSamples, listenOnLoopback, sampleHealthWhile, signInCookie } from '../setup/loopback';
import { makeTestApp, type TestApp } from '../setup/test-app';
import { fromWire } from '@shared/compute/day/wire';

/**
 * A plan of the most tasks a plan may have, on large stations: its timeline and both exports are
 * computed on the worker pool, so the server keeps answering while they run, and the timeline's JSON
 * carries each route once.
 */
let t: TestApp;
let base: string;
let close: () => void;
let cookie: string;
let planId: number;
/** the same plan on the largest station whose first timeline (no clip graph yet) takes seconds here, not minutes */
let bigPlanId: number;
const BIG_NODES = 30_000;

/** The guard: no health sample while the day is computed may take longer than this (see blockedSamples). */
const HEALTH_LIMIT_MS = 250;

/** A generated truss imported by the engineer, and a plan of MAX_TASKS tasks over its worksites. */
async function longPlanOn(nodes: number): Promise<number> {
  const doc = generateTrussStation({ nodes, seed: 42 });
  const engineer = await t.agent('engineer');
  const imported = await engineer
    .post('/api/stations/import')
    .attach('file', stationDocumentFile({ ...doc, name: `Truss of ${nodes} nodes` }), 'big.json');
  expect(imported.status, JSON.stringify(imported.body)).toBe(201);
  const worksites = doc.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);
  const planner = await t.agent('planner');
  const created = await planner
    .post('/api/plans')
    .send(buildLongPlanInput(imported.body.station.id, worksites));
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  return created.body.id;
}

beforeAll(async () => {
  t = await makeTestApp({ routeWorkers: 1 });
  planId = await longPlanOn(10_000);
  bigPlanId = await longPlanOn(BIG_NODES);
  // real HTTP on loopback, so a health sample queues behind the work if the work blocks
  const listening = await listenOnLoopback(t.app);
  base = listening.base;
  close = () => listening.server.close();
  cookie = await signInCookie(base, 'viewer');
}, 120_000);
afterAll(async () => {
  close?.();
  await t.close();
});

async function timed(path: string) {
  const t0 = performance.now();
  const res = await fetch(`${base}${path}`, { headers: { cookie } });
  const body = Buffer.from(await res.arrayBuffer());
  return { status: res.status, ms: performance.now() - t0, bytes: body.length, body };
}

/** The raw bytes of an answer as they cross the wire, asking for gzip as browsers do. */
function gzipped(path: string): Promise<{ encoding: string | undefined; raw: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get(`${base}${path}`, { headers: { cookie, 'accept-encoding': 'gzip' }, agent: false }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () =>
          resolve({ encoding: res.headers['content-encoding'], raw: Buffer.concat(chunks) }),
        );
        res.on('error', reject);
      })
      .on('error', reject);
  });
}

describe('a long plan on a large station: its exports, series and comparisons', () => {
  // the first request sends the station to the worker; the guard below measures the steady state
  it('the timeline lists each route once: blocks point into it, and the answer stays small', async () => {
    const res = await timed(`/api/plans/${planId}/timeline`);
    const tl: ReturnType<typeof JSON.parse> = fromWire(JSON.parse(res.body.toString()));
    const translates = [...tl.crew.EV1.blocks, ...tl.crew.EV2.blocks].filter(
      (b: { type: string }) => b.type === 'translate',
    );
    expect(translates.length).toBeGreaterThan(tl.routes.length);
    for (const b of translates) {
      expect(b.route).toBeUndefined();
      expect(tl.routes[b.routeIndex]).toBeDefined();
    }
    expect(res.bytes).toBeLessThan(5e6);
    // and it crosses the wire compressed, to the same timeline
    const { encoding, raw } = await gzipped(`/api/plans/${planId}/timeline`);
    expect(encoding).toBe('gzip');
    expect(raw.length).toBeLessThan(res.bytes / 3);
    expect(fromWire(JSON.parse(zlib.gunzipSync(raw).toString()))).toEqual(tl);
  }, 120_000);

  it('timeline, CSV and PDF at once: /api/health answers under 250 ms throughout', async () => {
    const { result, samples } = await sampleHealthWhile(base, () =>
      Promise.all([
        timed(`/api/plans/${planId}/timeline`),
        timed(`/api/plans/${planId}/export.csv`),
        timed(`/api/plans/${planId}/export.pdf`),
      ]),
    );
    const [timeline, csv, pdf] = result;
    expect([timeline.status, csv.status, pdf.status]).toEqual([200, 200, 200]);
    expect(samples.length).toBeGreaterThan(3);
    const blocked = blockedSamples(samples, HEALTH_LIMIT_MS);
    expect(blocked, JSON.stringify(blocked)).toEqual([]);
    expect(pdf.body.subarray(0, 5).toString()).toBe('%PDF-');
  }, 120_000);

  it('a series of two long days, the second EVA’s timeline and a comparison of two revisions: /api/health answers under 250 ms throughout', async () => {
    const planner = await t.agent('planner');
    const copy = await planner.post(`/api/plans/${planId}/duplicate`).send({});
    expect(copy.status, JSON.stringify(copy.body)).toBe(201);
    const later = await planner
      .patch(`/api/plans/${copy.body.id}`)
      .send({ version: copy.body.version, timeLimitSeconds: 23 * 3600 });
    expect(later.status, JSON.stringify(later.body)).toBe(200);
    const made = await planner
      .post('/api/series')
      .send({ title: 'Two long days', planIds: [planId, copy.body.id] });
    expect(made.status, JSON.stringify(made.body)).toBe(201);
    const { result, samples } = await sampleHealthWhile(base, () =>
      Promise.all([
        timed(`/api/series/${made.body.id}`),
        timed(`/api/plans/${copy.body.id}/timeline`),
        timed(`/api/plans/${copy.body.id}/compare?from=${copy.body.version}&to=${later.body.version}`),
      ]),
    );
    const [series, timeline, compare] = result;
    expect([series.status, timeline.status, compare.status]).toEqual([200, 200, 200]);
    expect(JSON.parse(series.body.toString()).evas).toHaveLength(2);
    expect(JSON.parse(compare.body.toString()).settings).toEqual([
      { field: 'timeLimitSeconds', from: 24 * 3600, to: 23 * 3600 },
    ]);
    expect(samples.length).toBeGreaterThan(3);
    const blocked = blockedSamples(samples, HEALTH_LIMIT_MS);
    expect(blocked, JSON.stringify(blocked)).toEqual([]);
  }, 180_000);
});

describe('a plan cannot freeze the server: its day is computed off the request thread', () => {
  it(`a ${MAX_TASKS}-task plan on a ${BIG_NODES / 1000}k-node station: /api/health answers under ${HEALTH_LIMIT_MS} ms while its first timeline is computed`, async () => {
    // the station's first day: no clip graph yet, every leg by the label search, seconds of work
    const { result, samples } = await sampleHealthWhile(base, () =>
      timed(`/api/plans/${bigPlanId}/timeline`),
    );
    expect(result.status).toBe(200);
    const tl = fromWire(JSON.parse(result.body.toString()));
    expect(tl.routes.length).toBeGreaterThan(MAX_TASKS);
    expect(samples.length).toBeGreaterThan(3);
    const blocked = blockedSamples(samples, HEALTH_LIMIT_MS);
    expect(blocked, JSON.stringify(blocked)).toEqual([]);
  }, 120_000);
});
