// Live streams under route load, for `npm run bench:load`: the same fixed batch of route requests on
// one server with no `GET /api/events` stream open, with many signed-in streams that read what they
// are sent, with as many that never read a byte, and with none again; a plan edit is told to every
// stream every few routes. Figures and ratios to the first phase, measured in the same run.
import http from 'node:http';
import net from 'node:net';
import os from 'node:os';
import fs from 'node:fs';
import { openEventStream, type OpenStream } from '../tests/setup/event-stream';
import { signIn, timedRequest, type Server } from './serve';

const STREAMS = Number(process.env.LOAD_STREAMS ?? 200);
const ROUTES = Number(process.env.LOAD_STREAM_ROUTES ?? 600);
const IN_FLIGHT = Number(process.env.LOAD_CONNECTIONS ?? 10);
/** a plan edit (one change to every stream) after this many routes are sent */
const EDIT_EVERY = 50;

interface Phase {
  name: string;
  streams: number;
  routeMs: number[];
  /** the server's resident memory (every thread), MiB: before the batch and the most seen during it */
  rssBefore: number;
  rssMax: number;
  /** the main thread's heap after the batch, MiB */
  heapAfter: number;
  /** bytes the server held unsent for the streams after the batch, all together */
  heldBytes: number;
  dropped: number;
  /** ms from sending an edit to its change arriving, over every reading stream and edit */
  deliveryMs: number[];
  /** the edits' own round trips, ms */
  editMs: number[];
  /** changes a reading stream never got */
  missed: number;
  edits: number;
}

const rssMiB = (pid: number) =>
  Number(/VmRSS:\s+(\d+)/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? 0) / 1024;

const quantile = (values: number[], q: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? NaN;
};

interface ServerStats {
  routeWorkers: { clipBuilds: number }[];
  events: { clients: number; bufferedBytes: number; dropped: number };
  memory: { rss: number; heapUsed: number };
}

/** A signed-in `GET /api/events` that is sent and then never read: the socket's buffers fill and stay full. */
async function deadStream(base: string, cookie: string): Promise<net.Socket> {
  const url = new URL(base);
  const socket = net.connect(Number(url.port), url.hostname);
  await new Promise((resolve, reject) => socket.once('connect', resolve).once('error', reject));
  socket.pause();
  socket.write(
    `GET /api/events HTTP/1.1\r\nHost: ${url.host}\r\nAccept: text/event-stream\r\nCookie: ${cookie}\r\n\r\n`,
  );
  return socket;
}

/**
 * Measures the phases on `server` with `routeBodies` sent to `routeUrl`; `streamCookie` opens the
 * streams (the server must allow that many for one person: the bench servers do).
 */
export async function measureStreams(server: Server, routeUrl: string, routeBodies: string[]) {
  const { base } = server;
  const pid = server.process.pid!;
  const planner = await signIn(base, 'planner@example.org');
  const viewer = await signIn(base, 'viewer@example.org');
  const admin = await signIn(base, 'admin@example.org');
  const stats = async () =>
    (await (await fetch(`${base}/api/compute/stats`, { headers: { cookie: admin } })).json()) as ServerStats;
  const plans = (await (await fetch(`${base}/api/plans`, { headers: { cookie: planner } })).json()) as {
    id: number;
    status: string;
    version: number;
  }[];
  const draft = plans.find((p) => p.status === 'draft');
  if (!draft) throw new Error('no draft plan seeded to edit');
  let version = draft.version;
  const planId = draft.id;

  const agent = new http.Agent({ keepAlive: true, maxSockets: IN_FLIGHT });
  const routeHeaders = { cookie: planner, 'content-type': 'application/json', 'accept-encoding': 'gzip' };

  async function batch(name: string, reading: OpenStream[], open: number, routes = ROUTES): Promise<Phase> {
    await new Promise((r) => setTimeout(r, 2000));
    const rssBefore = rssMiB(pid);
    let rssMax = rssBefore;
    const sampler = setInterval(() => (rssMax = Math.max(rssMax, rssMiB(pid))), 100);
    const routeMs: number[] = [];
    const sent: { version: number; at: number }[] = [];
    const editMs: number[] = [];
    // edits one after another, so each has the version the last one made
    let edits = Promise.resolve();
    const edit = () => {
      edits = edits.then(async () => {
        const at = Date.now();
        const res = await fetch(`${base}/api/plans/${planId}`, {
          method: 'PATCH',
          headers: { cookie: planner, 'content-type': 'application/json' },
          body: JSON.stringify({ version, title: `Streams bench ${version + 1}` }),
        });
        if (res.status !== 200) throw new Error(`plan edit: ${res.status} ${await res.text()}`);
        version = ((await res.json()) as { version: number }).version;
        editMs.push(Date.now() - at);
        sent.push({ version, at });
      });
    };
    let next = 0;
    const worker = async () => {
      while (next < routes) {
        const i = next++;
        if (i % EDIT_EVERY === 0) edit();
        const r = await timedRequest(
          agent,
          routeUrl,
          'POST',
          routeHeaders,
          routeBodies[i % routeBodies.length],
        );
        if (r.status !== 200) throw new Error(`route: ${r.status} ${r.body.toString().slice(0, 200)}`);
        routeMs.push(r.ms);
      }
    };
    await Promise.all(Array.from({ length: IN_FLIGHT }, worker));
    await edits;
    clearInterval(sampler);
    // every reading stream should have every change: wait for the last, a few seconds at most
    const last = sent.at(-1)!.version;
    const isLast = (m: { event: string; data: string }) =>
      m.event === 'change' && (JSON.parse(m.data) as { version?: number }).version === last;
    await Promise.all(reading.map((s) => s.next(isLast, 10_000).catch(() => null)));
    const after = await stats();
    const deliveryMs: number[] = [];
    let missed = 0;
    for (const s of reading) {
      const arrived = new Map<number, number>();
      for (const m of s.messages) {
        if (m.event !== 'change') continue;
        const c = JSON.parse(m.data) as { id: number; version?: number };
        if (c.id === planId && c.version !== undefined) arrived.set(c.version, s.openedAt + m.at);
      }
      for (const e of sent) {
        const at = arrived.get(e.version);
        if (at === undefined) missed++;
        else deliveryMs.push(at - e.at);
      }
    }
    return {
      name,
      streams: open,
      routeMs,
      rssBefore,
      rssMax,
      heapAfter: after.memory.heapUsed / 2 ** 20,
      heldBytes: after.events.bufferedBytes,
      dropped: after.events.dropped,
      deliveryMs,
      editMs,
      missed,
      edits: sent.length,
    };
  }

  const waitForClients = async (n: number) => {
    for (let i = 0; i < 300 && (await stats()).events.clients !== n; i++)
      await new Promise((r) => setTimeout(r, 100));
    const { clients } = (await stats()).events;
    if (clients !== n) throw new Error(`${clients} streams open on the server, expected ${n}`);
  };

  /** the server's memory now, MiB, once it has had a moment to settle */
  const memory = async () => {
    await new Promise((r) => setTimeout(r, 2000));
    const { memory: m } = await stats();
    return { rss: rssMiB(pid), heap: m.heapUsed / 2 ** 20 };
  };
  const phases: Phase[] = [];
  const load = os.loadavg()[0];
  // warm the route path and the edits, not counted: until the station's clip graph, built off the
  // request path, is in use (before, exact routes take the slower search and the build takes a core)
  const warmed = performance.now();
  for (let i = 0; i < 20; i++) {
    await batch('warm-up', [], 0, ROUTES / 6);
    if ((await stats()).routeWorkers.reduce((n, w) => n + w.clipBuilds, 0) > 0 && i > 0) break;
  }
  console.log(`streams bench: route path warmed in ${((performance.now() - warmed) / 1000).toFixed(0)} s`);
  phases.push(await batch('no streams (reference)', [], 0));

  const beforeOpen = await memory();
  const reading: OpenStream[] = [];
  for (let i = 0; i < STREAMS; i += 20)
    reading.push(
      ...(await Promise.all(
        Array.from({ length: Math.min(20, STREAMS - i) }, () => openEventStream(base, viewer)),
      )),
    );
  if (reading.some((s) => s.status !== 200))
    throw new Error(`a stream was refused: ${reading.find((s) => s.status !== 200)!.status}`);
  await Promise.all(reading.map((s) => s.next((m) => m.event === 'hello', 10_000)));
  await waitForClients(STREAMS);
  const opened = await memory();
  phases.push(await batch(`${STREAMS} streams reading`, reading, STREAMS));
  for (const s of reading) s.close();
  await waitForClients(0);
  phases.push(await batch('no streams (reference)', [], 0));

  const dead: net.Socket[] = [];
  for (let i = 0; i < STREAMS; i++) dead.push(await deadStream(base, viewer));
  await waitForClients(STREAMS);
  phases.push(await batch(`${STREAMS} streams never read`, [], STREAMS));
  for (const s of dead) s.destroy();
  await waitForClients(0);

  phases.push(await batch('no streams (reference)', [], 0));
  agent.destroy();
  return { phases, load, loadAfter: os.loadavg()[0], opening: { before: beforeOpen, after: opened } };
}

const ms = (v: number) => (Number.isNaN(v) ? '—' : `${v.toFixed(1)} ms`);

export function printStreams({
  phases,
  load,
  loadAfter,
  opening,
}: Awaited<ReturnType<typeof measureStreams>>) {
  // the reference: every batch with no stream open, pooled (they bracket the others in time)
  const reference = phases.filter((p) => p.streams === 0).flatMap((p) => p.routeMs);
  const ref50 = quantile(reference, 0.5);
  const ref95 = quantile(reference, 0.95);
  console.log(
    `\nLive streams (GET /api/events, signed in) while ${ROUTES} routes run, ${IN_FLIGHT} at a time, ` +
      `a plan edit told to every stream each ${EDIT_EVERY} routes; load average ${load.toFixed(1)} → ${loadAfter.toFixed(1)} ` +
      `(${os.cpus().length} cores); × is to the batches with no stream, pooled (p50 ${ms(ref50)}, p95 ${ms(ref95)})`,
  );
  const cols = [
    'route p50',
    'p95',
    'p50 ×',
    'p95 ×',
    'RSS max',
    'heap',
    'held',
    'edit rtt',
    'change p50',
    'max',
    'missed',
  ];
  console.log('batch'.padEnd(28), ...cols.map((c) => c.padStart(10)));
  for (const p of phases) {
    const p50 = quantile(p.routeMs, 0.5);
    const p95 = quantile(p.routeMs, 0.95);
    const told = p.deliveryMs.length > 0;
    console.log(
      p.name.padEnd(28),
      ...[
        ms(p50),
        ms(p95),
        (p50 / ref50).toFixed(2),
        (p95 / ref95).toFixed(2),
        `${p.rssMax.toFixed(0)} MiB`,
        `${p.heapAfter.toFixed(0)} MiB`,
        `${p.heldBytes} B`,
        ms(quantile(p.editMs, 0.5)),
        told ? ms(quantile(p.deliveryMs, 0.5)) : '—',
        told ? ms(Math.max(...p.deliveryMs)) : '—',
        told ? String(p.missed) : '—',
      ].map((c) => c.padStart(10)),
    );
  }
  console.log(
    'RSS max: the server process (every thread) during the batch; heap: its main thread after it, garbage ' +
      'not yet collected included; held: bytes the server keeps unsent for the streams; edit: its round trip; ' +
      'told: from sending an edit to its change arriving on a reading stream, every stream and edit',
  );
  const { before, after } = opening;
  const rss = after.rss - before.rss;
  const heap = after.heap - before.heap;
  console.log(
    `Opening ${STREAMS} reading streams, the server at rest: RSS ${before.rss.toFixed(0)} → ${after.rss.toFixed(0)} MiB ` +
      `(${((rss * 1024) / STREAMS).toFixed(0)} KiB a stream), main-thread heap ${before.heap.toFixed(1)} → ${after.heap.toFixed(1)} MiB ` +
      `(${((heap * 1024) / STREAMS).toFixed(0)} KiB a stream); streams dropped for falling behind: ${phases.at(-1)!.dropped}`,
  );
}
