import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '@shared/errors';
import type { RouteMode, RouteRequest } from '@shared/schemas/route';
import { getCompiledStation } from '../../server/modules/compute/compiled-cache';
import { routeOn } from '../../server/modules/compute/compute.service';
import { RoutePool, type RouteJob } from '../../server/modules/compute/route-pool';
import { defaultRouteWorkers } from '../../server/lib/env';
import { HttpError } from '../../server/lib/http-error';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { importStation } from '../setup/stations';
import { makeTestApp, type TestApp } from '../setup/test-app';

// Route computations on worker threads (ROUTE_WORKERS > 0) answer exactly what the main thread does.

let t: TestApp;
let stationId: number;
let keys: string[];

beforeAll(async () => {
  t = await makeTestApp({ seedDemo: true, routeWorkers: 2, routeInlineNodes: 0 });
  const viewer = await t.agent('viewer');
  stationId = (await viewer.get('/api/stations')).body[0].id;
  keys = (await viewer.get(`/api/stations/${stationId}/graph`)).body.nodes.map((n: { key: string }) => n.key);
});
afterAll(() => t.close());

const pool = () => t.ctx.routePool!;

/** The main thread's answer for the station's current version, as the JSON text res.json would send. */
const onMainThread = (request: RouteRequest) =>
  JSON.stringify(routeOn(getCompiledStation(t.ctx, stationId), request));
const feasible = async (answer: Promise<string>) =>
  (JSON.parse(await answer) as { feasible: boolean }).feasible;

async function route(body: unknown) {
  return (await t.agent('viewer')).post(`/api/stations/${stationId}/routes`).send(body as object);
}

function randomRequests(count: number, seed: number): RouteRequest[] {
  let s = seed;
  const next = () => ((s = (s * 1103515245 + 12345) & 0x7fffffff), s);
  const modes = ['fastest', 'fewest-swaps', 'balanced'] as const;
  return Array.from({ length: count }, () => {
    const request: RouteRequest = {
      from: keys[next() % keys.length],
      to: keys[next() % keys.length],
      mode: modes[next() % 3],
    };
    if (next() % 4 === 0) request.tetherLengthM = 5 + (next() % 300) / 10;
    if (next() % 5 === 0) request.carrying = true;
    if (next() % 5 === 0) request.allowRide = true;
    if (next() % 3 === 0) {
      // a start state on a node made an attach point for the query
      request.extraAttach = [keys[next() % keys.length], keys[next() % keys.length]];
      request.startAnchor = request.extraAttach[next() % 2];
      request.startPaidOutM = ((next() % 100) / 100) * (request.tetherLengthM ?? 25.9);
    }
    return request;
  });
}

describe('route worker pool', () => {
  it('defaults to one worker per core beyond the main thread, at most two', () => {
    expect([1, 2, 3, 4, 16].map((cores) => defaultRouteWorkers(cores))).toEqual([0, 1, 2, 2, 2]);
  });

  it('answers random demo-station queries in every mode exactly as the main thread does', async () => {
    const requests = randomRequests(150, 7);
    expect(new Set(requests.map((r) => r.mode)).size).toBe(3);
    for (let i = 0; i < requests.length; i += 10) {
      const batch = requests.slice(i, i + 10);
      const answers = await Promise.all(batch.map((r) => route(r)));
      answers.forEach((res, j) => {
        expect(res.status, JSON.stringify(batch[j])).toBe(200);
        expect(res.type).toBe('application/json');
        expect(res.text, JSON.stringify(batch[j])).toBe(onMainThread(batch[j]));
      });
    }
    const stats = pool().stats();
    expect(stats.every((s) => s.alive)).toBe(true);
    expect(stats.reduce((n, s) => n + s.answered, 0)).toBeGreaterThanOrEqual(150);
  });

  it('keeps a station on one worker while the load allows (sequential queries compile it once); app.close() stops the workers', async () => {
    const other = await makeTestApp({ seedDemo: true, routeWorkers: 2, routeInlineNodes: 0 });
    try {
      const viewer = await other.agent('viewer');
      const id = (await viewer.get('/api/stations')).body[0].id;
      for (const r of randomRequests(20, 3))
        expect((await viewer.post(`/api/stations/${id}/routes`).send(r)).status).toBe(200);
      const stats = other.ctx.routePool!.stats();
      expect(stats.reduce((n, s) => n + s.compiles, 0)).toBe(1);
      // the worker that answered reports the clip graphs it keeps, within the configured budget
      const busy = stats.find((s) => s.answered > 0)!;
      expect(busy.clip.budgetBytes).toBe(other.ctx.config.routeClipMemoryMb * 2 ** 20);
      expect(busy.clip.graphs).toBeGreaterThan(0);
      expect(busy.clip.bytes).toBeGreaterThan(0);
      expect(busy.clip.bytes).toBeLessThanOrEqual(busy.clip.budgetBytes);
      const seen = (await (await other.agent('admin')).get('/api/compute/stats')).body;
      expect(seen.routeWorkers[busy.slot].clip).toEqual(busy.clip);
      expect(seen.mainThreadClip.budgetBytes).toBe(busy.clip.budgetBytes);
      expect(stats.filter((s) => s.answered > 0)).toHaveLength(1);
    } finally {
      await other.close();
    }
    expect(other.ctx.routePool!.stats().every((s) => !s.alive)).toBe(true);
  });

  it('answers fastest routes on a small station on the main thread once it holds the index, exactly as the pool does', async () => {
    const inline = await makeTestApp({ seedDemo: true, routeWorkers: 1 });
    try {
      const viewer = await inline.agent('viewer');
      const id = (await viewer.get('/api/stations')).body[0].id;
      const requests = randomRequests(40, 11).filter((r) => r.mode === 'fastest');
      // the first query may go to the pool; the main thread then compiles the station after it
      expect((await viewer.post(`/api/stations/${id}/routes`).send(requests[0])).status).toBe(200);
      const answered = () => inline.ctx.routePool!.stats().reduce((n, s) => n + s.answered, 0);
      await new Promise((r) => setImmediate(r));
      expect(getCompiledStation(inline.ctx, id).isCompiled).toBe(true);
      const before = answered();
      for (const r of requests) {
        const res = await viewer.post(`/api/stations/${id}/routes`).send(r);
        expect(res.status).toBe(200);
        expect(res.text).toBe(JSON.stringify(routeOn(getCompiledStation(inline.ctx, id), r)));
        expect(res.text).toBe(
          await pool().route({
            station: `other#${id}`,
            version: 1,
            doc: getCompiledStation(inline.ctx, id).doc,
            request: r,
          }),
        );
      }
      expect(answered()).toBe(before);
      // an exact mode without a clip graph on the main thread still goes to the pool
      const exact = randomRequests(40, 12).find((r) => r.mode === 'balanced' && !r.extraAttach)!;
      expect((await viewer.post(`/api/stations/${id}/routes`).send(exact)).status).toBe(200);
      expect(answered()).toBe(before + 1);
    } finally {
      await inline.close();
    }
  });

  it('sees an edit at once: the next route after closing an edge uses the new version on every worker', async () => {
    const engineer = await t.agent('engineer');
    const request: RouteRequest = { from: keys[0], to: keys[keys.length - 1], mode: 'fastest' };
    const before = await route(request);
    expect(before.body.feasible).toBe(true);
    const graph = (await engineer.get(`/api/stations/${stationId}/graph`)).body;
    const [a, b] = before.body.nodes;
    const edge = graph.edges.find(
      (e: { from: string; to: string }) => (e.from === a && e.to === b) || (e.from === b && e.to === a),
    );
    const patch = await engineer
      .patch(`/api/stations/${stationId}/edges/${edge.id}`)
      .send({ version: graph.station.version, edge: { closed: true } });
    expect(patch.status, JSON.stringify(patch.body)).toBe(200);

    const expected = onMainThread(request);
    expect(expected).not.toBe(before.text);
    // in parallel, so both workers answer for the new version
    const after = await Promise.all(Array.from({ length: 12 }, () => route(request)));
    for (const res of after) expect(res.text).toBe(expected);
  });

  it('still answers 404 for an unknown node and 400 for a bad body, in the error shape', async () => {
    const unknown = await route({ from: 'NO-SUCH-NODE', to: keys[0], mode: 'fastest' });
    expect(unknown.status).toBe(404);
    expect(ErrorBodySchema.parse(unknown.body).error.code).toBe('NOT_FOUND');
    const bad = await route({ from: keys[0], to: keys[1], mode: 'shortest', tetherLengthM: -1 });
    expect(bad.status).toBe(400);
    expect(ErrorBodySchema.parse(bad.body).error.code).toBe('VALIDATION_FAILED');
  });

  it('answers 50 parallel requests, each as the main thread would', async () => {
    const requests = randomRequests(50, 11);
    const answers = await Promise.all(requests.map((r) => route(r)));
    answers.forEach((res, i) => {
      expect(res.status).toBe(200);
      expect(res.text).toBe(onMainThread(requests[i]));
    });
  });
});

describe('route worker pool limits and failures', () => {
  const toSocket = (mode: RouteMode): RouteRequest => ({ from: K.airlock, to: K.socket, mode });

  it('refuses queries over the queue bound with 503, Retry-After and the error shape', async () => {
    // a fresh pool: its worker is still starting, so the burst waits and the bound is reached
    const small = await makeTestApp({ routeWorkers: 1, routeQueueLimit: 2, routeInlineNodes: 0 });
    try {
      const engineer = await small.agent('engineer');
      const imported = await importStation(engineer);
      const viewer = await small.agent('viewer');
      const post = () => viewer.post(`/api/stations/${imported.id}/routes`).send(toSocket('fastest'));
      const answers = await Promise.all(Array.from({ length: 12 }, post));
      const refused = answers.filter((r) => r.status === 503);
      expect(answers.every((r) => r.status === 200 || r.status === 503)).toBe(true);
      expect(refused.length).toBeGreaterThan(0);
      expect(answers.filter((r) => r.status === 200).length).toBeGreaterThan(0);
      for (const r of refused) {
        expect(ErrorBodySchema.parse(r.body).error.code).toBe('UNAVAILABLE');
        expect(r.headers['retry-after']).toBe('1');
      }
      // once the burst is answered, the next one goes through
      expect((await post()).status).toBe(200);
    } finally {
      await small.close();
    }
  });

  const job = (request: RouteRequest, version = 1, station = 'test#1'): RouteJob => ({
    station,
    version,
    doc: buildStationDocument() as RouteJob['doc'],
    request,
  });

  /** A pool of its own for one test, closed after it. */
  async function withPool(use: (p: RoutePool) => Promise<void>, size = 1) {
    const p = new RoutePool({ size, queueLimit: 100, logger: t.ctx.logger });
    try {
      await use(p);
    } finally {
      await p.close();
    }
  }

  const waitUntil = async (ok: () => boolean, what: string) => {
    for (let i = 0; i < 100 && !ok(); i++) await new Promise((r) => setTimeout(r, 50));
    if (!ok()) throw new Error(`timed out waiting: ${what}`);
  };

  it('a worker that stops fails its queries with 503 rather than hanging, and is replaced at once', () =>
    withPool(async (p) => {
      await p.route(job(toSocket('fastest')));
      // a larger station: compiling it keeps the worker busy while it is stopped
      const doc = generateTrussStation({ nodes: 3000, seed: 5 });
      const anchors = doc.nodes.filter((n) => n.kind === 'anchor').map((n) => n.key);
      const jobs = anchors.slice(0, 5).map((from, i) => {
        const request: RouteRequest = { from, to: anchors[anchors.length - 1 - i], mode: 'balanced' };
        return p.route({ station: 'test#big', version: 1, doc, request });
      });
      await p.terminateWorker(0);
      const settled = await Promise.allSettled(jobs);
      const rejected = settled.filter((s): s is PromiseRejectedResult => s.status === 'rejected');
      expect(rejected.length).toBeGreaterThan(0);
      for (const s of rejected) {
        expect(s.reason).toBeInstanceOf(HttpError);
        expect(s.reason).toMatchObject({ code: 'UNAVAILABLE', status: 503 });
      }
      expect(p.stats()[0]).toMatchObject({ alive: true, restarts: 1, inFlight: 0 });
      expect(await feasible(p.route(job(toSocket('balanced'))))).toBe(true);
    }));

  it('a worker that stops before it has started is replaced after a short delay; meanwhile queries get 503', () =>
    withPool(async (p) => {
      const first = p.route(job(toSocket('fastest')));
      await p.terminateWorker(0);
      await expect(first).rejects.toMatchObject({ code: 'UNAVAILABLE' });
      expect(p.stats()[0].alive).toBe(false);
      await expect(p.route(job(toSocket('fastest')))).rejects.toMatchObject({ code: 'UNAVAILABLE' });
      await waitUntil(() => p.stats()[0].alive, 'the replacement worker');
      expect(await feasible(p.route(job(toSocket('fastest'))))).toBe(true);
    }));

  it('an error thrown in a worker comes back as that error (the API turns it into 500); the worker goes on', () =>
    withPool(async (p) => {
      const broken = job(toSocket('fastest'), 2);
      broken.doc = { ...broken.doc, edges: [{ ...broken.doc.edges[0], to: 'NOT-A-NODE' }] };
      await expect(p.route(broken)).rejects.toThrow(/names an unknown node/);
      // the main thread took the version as sent; the worker, holding nothing, asks for the document again
      expect(await feasible(p.route(job(toSocket('fastest'), 2)))).toBe(true);
      expect(p.stats()[0]).toMatchObject({ restarts: 0, compiles: 1 });
    }));

  it('a worker keeps four stations, least recently used out first', () =>
    withPool(async (p) => {
      const request = toSocket('fewest-swaps');
      const first = await p.route(job(request));
      expect(JSON.parse(first)).toMatchObject({ feasible: true, mode: 'fewest-swaps' });
      for (let i = 2; i <= 5; i++) await p.route(job(request, 1, `test#${i}`));
      expect(p.stats()[0].compiles).toBe(5);
      expect(await p.route(job(request))).toBe(first);
      expect(p.stats()[0].compiles).toBe(6);
      await p.route(job(request, 1, 'test#5'));
      expect(p.stats()[0].compiles).toBe(6);
    }));

  it('close() stops every worker and fails what was still waiting', async () => {
    const p = new RoutePool({ size: 2, queueLimit: 100, logger: t.ctx.logger });
    await p.route(job(toSocket('fastest')));
    const waiting = expect(p.route(job(toSocket('balanced')))).rejects.toMatchObject({ code: 'UNAVAILABLE' });
    await p.close();
    await waiting;
    expect(p.stats().every((s) => !s.alive)).toBe(true);
    await expect(p.route(job(toSocket('fastest')))).rejects.toMatchObject({ code: 'UNAVAILABLE' });
  });
});
