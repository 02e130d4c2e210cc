import net from 'node:net';
import type { Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ChangeEvent, HelloEvent, PresenceEvent } from '@shared/schemas/events';
import { buildPlanInput } from '../factories/plan';
import { openEventStream, type OpenStream, type StreamMessage } from '../setup/event-stream';
import { listenOnLoopback, signInCookie } from '../setup/loopback';
import { makeAppWithStation } from '../setup/stations';
import type { TestApp } from '../setup/test-app';

let t: TestApp;
let server: Server;
let base: string;
let stationId: number;
const cookies: Record<string, string> = {};
const streams: OpenStream[] = [];

beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(undefined, { eventHeartbeatMs: 200 }));
  ({ base, server } = await listenOnLoopback(t.app));
  for (const who of ['planner', 'planner2', 'viewer', 'engineer', 'admin'])
    cookies[who] = await signInCookie(base, who);
});
afterAll(async () => {
  for (const s of streams) s.close();
  await new Promise((resolve) => server.close(resolve));
  await t.close();
});

async function stream(who: string | null, headers: Record<string, string> = {}) {
  const s = await openEventStream(base, who ? cookies[who] : null, headers);
  streams.push(s);
  return s;
}

function api(who: string, method: string, path: string, body?: unknown) {
  return fetch(`${base}/api${path}`, {
    method,
    headers: { cookie: cookies[who], 'content-type': 'application/json' },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
}

async function createPlan(title = 'Live plan') {
  const res = await api('planner', 'POST', '/plans', { ...buildPlanInput(stationId), title });
  expect(res.status).toBe(201);
  return (await res.json()) as { id: number; version: number };
}

const change = (m: StreamMessage) => JSON.parse(m.data) as ChangeEvent;
const isChange = (kind: string, id: number, version?: number) => (m: StreamMessage) =>
  m.event === 'change' &&
  change(m).kind === kind &&
  change(m).id === id &&
  (version === undefined || change(m).version === version);

describe('the live stream of changes', () => {
  it('refuses the signed-out with 401 in the one error shape, and a forged session too', async () => {
    const anonymous = await stream(null);
    expect(anonymous.status).toBe(401);
    const forged = await stream(null, { cookie: 'tw_session=not-a-token' });
    expect(forged.status).toBe(401);
    const body = await (await fetch(`${base}/api/events`)).json();
    expect(body.error.code).toBe('UNAUTHENTICATED');
  });

  it('streams uncompressed, unbuffered event-stream text even when the client accepts gzip', async () => {
    const s = await stream('viewer', { 'accept-encoding': 'gzip, deflate, br' });
    expect(s.status).toBe(200);
    expect(s.headers.get('content-type')).toMatch(/^text\/event-stream/);
    expect(s.headers.get('content-encoding')).toBeNull();
    const hello = await s.next((m) => m.event === 'hello');
    expect((JSON.parse(hello.data) as HelloEvent).connection).toMatch(/^[\w-]{8,}$/);
  });

  it("delivers a second session's edit to an open stream within a second", async () => {
    const plan = await createPlan();
    const s = await stream('viewer');
    await s.next((m) => m.event === 'hello');
    const sent = Date.now();
    const patched = await api('planner2', 'PATCH', `/plans/${plan.id}`, {
      version: plan.version,
      title: 'Live plan, retitled',
    });
    expect(patched.status).toBe(200);
    const m = await s.next(isChange('plan', plan.id, plan.version + 1), 1000);
    expect(Date.now() - sent).toBeLessThan(1000);
    expect(m.id).toMatch(/^[0-9a-f]+\.\d+$/);
  });

  it('tells station writes, deletions and run logs as they happen', async () => {
    const s = await stream('viewer');
    const station = await (await api('engineer', 'GET', `/stations/${stationId}`)).json();
    const renamed = await api('engineer', 'PATCH', `/stations/${stationId}`, {
      version: station.version,
      name: 'Renamed station',
    });
    expect(renamed.status, await renamed.clone().text()).toBe(200);
    await s.next(isChange('station', stationId, station.version + 1));
    const plan = await createPlan('Doomed plan');
    await s.next(isChange('plan', plan.id, 1));
    expect((await api('planner', 'DELETE', `/plans/${plan.id}?version=1`)).status).toBe(204);
    const gone = await s.next((m) => isChange('plan', plan.id)(m) && change(m).deleted === true);
    expect(change(gone).version).toBeUndefined();
  });

  it('sends a heartbeat comment on an idle stream', async () => {
    const s = await stream('viewer');
    const beat = await s.next((m) => m.comment !== undefined, 2000);
    expect(beat.comment).toBe('keep-alive');
  });

  it('replays what a reconnecting stream missed after its Last-Event-ID, and says reset when it cannot', async () => {
    const plan = await createPlan('Reconnect plan');
    const s = await stream('viewer');
    await s.next((m) => m.event === 'hello');
    let version = plan.version;
    const edit = async () => {
      const res = await api('planner', 'PATCH', `/plans/${plan.id}`, {
        version,
        title: `Reconnect plan v${version}`,
      });
      expect(res.status).toBe(200);
      version++;
    };
    await edit();
    const seen = await s.next(isChange('plan', plan.id, version));
    s.close();
    await edit();
    await edit();
    const again = await stream('viewer', { 'last-event-id': seen.id! });
    const replayed = await again.next(isChange('plan', plan.id, version));
    const missed = again.messages.filter((m) => m.event === 'change').map((m) => change(m).version);
    expect(missed).toEqual([version - 1, version]);
    expect(replayed.id).not.toBe(seen.id);
    const stranger = await stream('viewer', { 'last-event-id': 'deadbeef.12' });
    await stranger.next((m) => m.event === 'reset');
    expect(stranger.messages.some((m) => m.event === 'change')).toBe(false);
  });

  it('tells who else has the same plan open, and when they leave', async () => {
    const plan = await createPlan('Presence plan');
    const a = await stream('planner');
    const b = await stream('viewer');
    const conn = async (s: OpenStream) =>
      (JSON.parse((await s.next((m) => m.event === 'hello')).data) as HelloEvent).connection;
    const watch = async (who: string, connection: string, planId: number | null) => {
      const res = await api(who, 'POST', '/events/presence', { connection, planId });
      expect(res.status).toBe(200);
      return (await res.json()).presence as PresenceEvent | null;
    };
    const names = (m: StreamMessage) => (JSON.parse(m.data) as PresenceEvent).viewers.map((v) => v.name);
    const first = await watch('planner', await conn(a), plan.id);
    expect(first!.viewers).toHaveLength(1);
    await watch('viewer', await conn(b), plan.id);
    const both = await a.next((m) => m.event === 'presence' && names(m).length === 2);
    expect(new Set(JSON.parse(both.data).viewers.map((v: { role: string }) => v.role))).toEqual(
      new Set(['planner', 'viewer']),
    );
    // someone else's stream cannot be moved
    const foreign = await api('viewer', 'POST', '/events/presence', {
      connection: await conn(a),
      planId: null,
    });
    expect(foreign.status).toBe(404);
    b.close();
    const alone = await a.next(
      (m) => m.event === 'presence' && m.at > both.at && names(m).length === 1,
      2000,
    );
    expect(JSON.parse(alone.data).viewers[0].role).toBe('planner');
  });

  it("shows admins the open streams and the server's memory beside the compute stats", async () => {
    const stats = async () => {
      const res = await api('admin', 'GET', '/compute/stats');
      expect(res.status).toBe(200);
      return (await res.json()) as { events: { clients: number }; memory: { rss: number; heapUsed: number } };
    };
    const before = await stats();
    const s = await stream('viewer');
    await s.next((m) => m.event === 'hello');
    const open = await stats();
    expect(open.events.clients).toBe(before.events.clients + 1);
    expect(open.memory.heapUsed).toBeGreaterThan(0);
    expect(open.memory.rss).toBeGreaterThan(open.memory.heapUsed);
    expect((await api('viewer', 'GET', '/compute/stats')).status).toBe(403);
  });
});

describe('a slow or dead client', () => {
  it('is dropped once its bounded buffer is full; the server holds no more than the bound for it', async () => {
    for (const s of streams.splice(0)) s.close();
    const hub = t.ctx.events;
    const bound = hub.options.clientBufferBytes;
    const healthy = await stream('viewer');
    await healthy.next((m) => m.event === 'hello');
    // a client that sends its request and then never reads a byte
    const url = new URL(base);
    const dead = net.connect(Number(url.port), url.hostname);
    await new Promise((resolve) => dead.once('connect', resolve));
    dead.pause();
    dead.write(`GET /api/events HTTP/1.1\r\nHost: ${url.host}\r\nCookie: ${cookies.viewer}\r\n\r\n`);
    const clientsBefore = hub.stats().clients;
    const droppedBefore = hub.stats().dropped;
    for (let i = 0; i < 100 && hub.stats().clients === clientsBefore; i++)
      await new Promise((resolve) => setTimeout(resolve, 10));
    expect(hub.stats().clients).toBe(clientsBefore + 1);
    const readBefore = healthy.bytes();
    let peakHeld = 0;
    let batches = 0;
    // far more than the kernel's socket buffers take: the rest could only wait in the server
    while (hub.stats().dropped === droppedBefore && batches < 4000) {
      batches++;
      for (let i = 0; i < 100; i++) hub.publish({ kind: 'plan', id: 1_000_000 + i, version: batches });
      peakHeld = Math.max(peakHeld, hub.stats().maxBufferedBytes);
      await new Promise((resolve) => setImmediate(resolve));
    }
    expect(hub.stats().dropped).toBe(droppedBefore + 1);
    expect(hub.stats().clients).toBe(clientsBefore);
    // the reading client kept up and is still there
    await healthy.next((m) => m.event === 'change' && change(m).version === batches, 5000);
    const sent = healthy.bytes() - readBefore;
    // what went to each stream before the drop, against what the server ever held for the dead one
    expect(peakHeld).toBeLessThanOrEqual(bound);
    expect(sent).toBeGreaterThan(20 * bound);
    console.info(
      `slow client: ${(sent / 2 ** 20).toFixed(1)} MB sent to each stream; at most ${peakHeld} B held for the dead one (bound ${bound} B)`,
    );
    dead.destroy();
  });
});
