import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { MAX_TASKS } from '@shared/schemas/plan';
import { stationDocumentFile } from '../factories/station-document';
import { makeTestApp, type TestApp } from '../setup/test-app';

/**
 * A plan of the most tasks a plan may have, on a 10k-node station: its timeline and both exports are
 * computed on the worker pool, so the server keeps answering while they run, and the timeline's JSON
 * carries each route once.
 */
let t: TestApp;
let server: http.Server;
let base: string;
let cookie: string;
let planId: number;

beforeAll(async () => {
  t = await makeTestApp({ routeWorkers: 1 });
  const doc = generateTrussStation({ nodes: 10_000, seed: 42 });
  const engineer = await t.agent('engineer');
  const imported = await engineer
    .post('/api/stations/import')
    .attach('file', stationDocumentFile({ ...doc, name: 'Big truss' }), 'big.json');
  expect(imported.status, JSON.stringify(imported.body)).toBe(201);
  const worksites = doc.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);
  const planner = await t.agent('planner');
  const created = await planner.post('/api/plans').send({
    title: 'Long day',
    stationId: imported.body.station.id,
    date: '2031-01-01',
    crew: { EV1: { name: 'A', tetherLengthM: 25.9 }, EV2: { name: 'B', tetherLengthM: 25.9 } },
    timeLimitSeconds: 24 * 3600,
    tasks: Array.from({ length: MAX_TASKS }, (_, i) => ({
      title: `Task ${i + 1}`,
      worksite: worksites[(i * 7) % worksites.length],
      crew: (['EV1', 'EV2', 'both'] as const)[i % 3],
      durationSeconds: 120,
    })),
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  planId = created.body.id;
  // the viewer's requests go over a real socket, so the health samples queue behind the work if it blocks
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const signIn = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: t.ctx.config.publicOrigin },
    body: JSON.stringify({ email: 'viewer@example.org', password: 'tetherwise-demo' }),
  });
  cookie = signIn.headers.get('set-cookie')!.split(';')[0];
}, 120_000);
afterAll(async () => {
  await new Promise((resolve) => server?.close(resolve));
  await t.close();
});

async function timed(path: string) {
  const t0 = performance.now();
  const res = await fetch(`${base}${path}`, { headers: { cookie } });
  const body = Buffer.from(await res.arrayBuffer());
  return { status: res.status, ms: performance.now() - t0, bytes: body.length, body };
}

describe('a long plan on a large station', () => {
  it('timeline, CSV and PDF at once: /api/health answers under 250 ms throughout', async () => {
    const samples: number[] = [];
    let done = false;
    const sampler = (async () => {
      while (!done) {
        samples.push((await timed('/api/health')).ms);
        await new Promise((r) => setTimeout(r, 25));
      }
    })();
    const [timeline, csv, pdf] = await Promise.all([
      timed(`/api/plans/${planId}/timeline`),
      timed(`/api/plans/${planId}/export.csv`),
      timed(`/api/plans/${planId}/export.pdf`),
    ]);
    done = true;
    await sampler;
    expect([timeline.status, csv.status, pdf.status]).toEqual([200, 200, 200]);
    expect(samples.length).toBeGreaterThan(3);
    expect(Math.max(...samples), samples.map((s) => s.toFixed(0)).join(' ')).toBeLessThan(250);
    expect(pdf.body.subarray(0, 5).toString()).toBe('%PDF-');
  }, 120_000);

  it('the timeline lists each route once: blocks point into it, and the answer stays small', async () => {
    const res = await timed(`/api/plans/${planId}/timeline`);
    const tl = JSON.parse(res.body.toString());
    const translates = [...tl.crew.EV1.blocks, ...tl.crew.EV2.blocks].filter(
      (b: { type: string }) => b.type === 'translate',
    );
    expect(translates.length).toBeGreaterThan(tl.routes.length);
    for (const b of translates) {
      expect(b.route).toBeUndefined();
      expect(tl.routes[b.routeIndex]).toBeDefined();
    }
    expect(res.bytes).toBeLessThan(5e6);
  }, 120_000);
});
