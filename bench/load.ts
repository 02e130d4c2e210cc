// `npm run bench:load`: the real server in its own process on loopback, driven by autocannon: two
// servers, one computing routes on the main thread (ROUTE_WORKERS=0) and one on the worker pool
// (LOAD_POOL_WORKERS), with the same seed and the same request bodies, each row measured on one and
// then on the other; a 60 s soak on the one configured as the default; then the heaviest valid
// requests (a socket plan over 20,000 sockets, a 10,000-row CSV import, a 100k-node import, then a
// 200-task plan's timeline and exports on the 100k-node station once its clip graph is built) one at a
// time on each, with /api/health sampled meanwhile (the main-thread server keeps imports and socket
// plans on its main thread too); and on the default server, 200 live streams open while a fixed batch
// of routes runs, beside the same batch with none (bench/streams.ts). Bounded: each run has a fixed
// duration or a fixed count; the whole thing stops itself in about nine minutes plus the heavy requests
// (LOAD_*_SECONDS shorten the timed runs; LOAD_ONLY=streams measures only the streams, on the default
// server; LOAD_ONLY=heavy only the heavy requests, on both).
import fs from 'node:fs';
import os from 'node:os';
import autocannon from 'autocannon';
import { generateTrussStation } from '../shared/compute/truss-generator';
import { MAX_TASKS } from '../shared/schemas/plan';
import { defaultRouteWorkers } from '../server/lib/env';
import { bigStation } from '../tests/factories/big-station';
import { buildLongPlanInput } from '../tests/factories/plan';
import { DEMO_PASSWORD } from '../server/db/seed/demo-users';
import { signIn, startLoopbackServer, type Server } from './serve';
import { multipartBody, sampleHealthWhile, send, type HealthSample } from '../tests/setup/loopback';
import { measureStreams, printStreams } from './streams';

const RUN_SECONDS = Number(process.env.LOAD_RUN_SECONDS ?? 10);
const WARM_SECONDS = Number(process.env.LOAD_WARM_SECONDS ?? 5);
const SOAK_SECONDS = Number(process.env.LOAD_SOAK_SECONDS ?? 60);
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 10);
/** connections of the light endpoint in the mixed run: a few other users while routes are busy */
const LIGHT_CONNECTIONS = Number(process.env.LOAD_LIGHT_CONNECTIONS ?? 2);
/** pool size of the pool run; the server's default when that is not 0 */
const POOL_WORKERS = Number(process.env.LOAD_POOL_WORKERS ?? (defaultRouteWorkers() || 2));

function rssMiB(pid: number): number {
  const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  const kb = Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0);
  return kb / 1024;
}

interface Row {
  name: string;
  rps: number;
  p50: number;
  p99: number;
  /** transport errors, time-outs and non-2xx answers */
  errors: number;
}

function toRow(name: string, result: autocannon.Result): Row {
  return {
    name,
    rps: result.requests.average,
    p50: result.latency.p50,
    p99: result.latency.p99,
    errors: result.errors + result.timeouts + result.non2xx,
  };
}

const cannon = (opts: autocannon.Options) =>
  autocannon({ connections: CONNECTIONS, duration: RUN_SECONDS, ...opts });

function routeRequests(keys: string[], count: number, seed: number) {
  let s = seed;
  const next = () => ((s = (s * 1103515245 + 12345) & 0x7fffffff), s);
  const modes = ['fastest', 'fewest-swaps', 'balanced'] as const;
  return Array.from({ length: count }, () => {
    const from = keys[next() % keys.length];
    let to = keys[next() % keys.length];
    if (to === from) to = keys[(keys.indexOf(from) + 1) % keys.length];
    return JSON.stringify({ from, to, mode: modes[next() % 3] });
  });
}

function startServer(routeWorkers: number): Promise<Server> {
  // the main-thread server keeps imports and socket plans there too; the pool server takes the default
  return startLoopbackServer({
    ROUTE_WORKERS: String(routeWorkers),
    ...(routeWorkers === 0 ? { TASK_WORKERS: '0' } : {}),
  });
}

interface Scenario {
  name: string;
  /** one row, or two for the mixed run (two autocannon instances at once) */
  run(): Promise<Row[]>;
}

/** A started server with its stations imported and warmed, and the runs to measure on it. */
interface Target {
  routeWorkers: number;
  server: Server;
  scenarios: Scenario[];
  soak(): Promise<autocannon.Result>;
  /** the heaviest valid requests, one at a time, with /api/health sampled meanwhile */
  heavy(): Promise<HeavyRow[]>;
  /** routes on the 10k station with live streams open and without */
  streams(): ReturnType<typeof measureStreams>;
}

interface HeavyRow {
  name: string;
  status: number;
  ms: number;
  /** the machine's 1-minute load average as the request started */
  load: number;
  health: HealthSample[];
  /** size of the answer (bytes), where it is part of the figure */
  bytes?: number;
}

/**
 * The heaviest requests a signed-in person can make, built once for both servers: a socket plan
 * over 20,000 listed sockets of a 100k-node station, a 10,000-row CSV edge import onto it, and the
 * import of another 100k-node station.
 */
const heavyInputs = (() => {
  let made: ReturnType<typeof makeHeavyInputs> | null = null;
  return () => (made ??= makeHeavyInputs());
})();

function makeHeavyInputs() {
  const big = bigStation();
  const targets = big.socketKeys
    .filter((_, i) => i % 40 === 0)
    .map((key) => {
      const n = big.doc.nodes.find((node) => node.key === key)!;
      return [n.position[0], n.position[1], n.position[2] + 1.3];
    });
  const junctions = big.doc.nodes.filter((n) => n.kind === 'junction').map((n) => n.key);
  const rows = ['from,to,kind,lengthM'];
  for (let i = 0; i < 10_000; i++)
    rows.push(
      `${junctions[(i * 7) % junctions.length]},${junctions[(i * 7 + 3) % junctions.length]},hop,1.5`,
    );
  return {
    station: multipartBody([{ field: 'file', fileName: 'big.json', content: JSON.stringify(big.doc) }]),
    socketPlan: JSON.stringify({ targets, candidates: big.socketKeys }),
    worksites: big.doc.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key),
    csv: multipartBody([{ field: 'edges', fileName: 'edges.csv', content: rows.join('\n') }]),
    another: multipartBody([
      {
        field: 'file',
        fileName: 'another.json',
        content: JSON.stringify(generateTrussStation({ nodes: 100_000, seed: 11 })),
      },
    ]),
  };
}

async function heavyOn(
  base: string,
  { viewer, engineer, planner, admin }: Record<'viewer' | 'engineer' | 'planner' | 'admin', string>,
): Promise<HeavyRow[]> {
  const inputs = heavyInputs();
  const upload = (url: string, form: { body: Buffer; contentType: string }) =>
    send(base, 'POST', url, { cookie: engineer, 'content-type': form.contentType }, form.body);
  const imported = await upload('/api/stations/import', inputs.station);
  if (imported.status !== 201)
    throw new Error(`import of the big station: ${imported.status} ${imported.text}`);
  const id = (imported.body.station as { id: number }).id;
  const rows: HeavyRow[] = [];
  const measure = async (name: string, work: () => ReturnType<typeof send>) => {
    const load = os.loadavg()[0];
    // a health sample the server could not answer in time (Node's 408) is counted, not fatal
    const { result, samples, elapsedMs } = await sampleHealthWhile(base, work, { keepFailed: true });
    rows.push({
      name,
      status: result.status,
      ms: elapsedMs,
      load,
      health: samples,
      bytes: result.text.length,
    });
  };
  await measure(
    'idle (reference)',
    () => new Promise((r) => setTimeout(() => r({ status: 200, text: '', body: {} }), 2000)),
  );
  await measure('socket plan, 20,000 sockets', () =>
    send(
      base,
      'POST',
      `/api/stations/${id}/socket-plan`,
      { cookie: viewer, 'content-type': 'application/json' },
      inputs.socketPlan,
    ),
  );
  await measure('CSV import, 10,000 edge rows', () => upload(`/api/stations/${id}/import-csv`, inputs.csv));
  await measure('import, 100k-node station', () => upload('/api/stations/import', inputs.another));
  const worksites = inputs.worksites;
  const plan = await send(
    base,
    'POST',
    '/api/plans',
    { cookie: planner, 'content-type': 'application/json' },
    JSON.stringify(buildLongPlanInput(id, worksites)),
  );
  if (plan.status !== 201) throw new Error(`the long plan: ${plan.status} ${plan.text}`);
  const planId = (plan.body as { id: number }).id;
  const built = await clipGraphBuilt(base, admin, planner, id, worksites);
  console.log(
    `clip graph of the 100k-node station (after its CSV import) ${built.ok ? 'built' : 'NOT built'} in ${ms(built.ms)}`,
  );
  const get = (suffix: string) => send(base, 'GET', `/api/plans/${planId}/${suffix}`, { cookie: viewer }, '');
  await measure(`timeline, ${MAX_TASKS}-task plan`, () => get('timeline'));
  await measure(`CSV right after (day kept)`, () => get('export.csv'));
  await measure(`PDF (day kept)`, () => get('export.pdf'));
  await measure('timeline + CSV + PDF at once (day kept)', async () => {
    const answers = await Promise.all([get('timeline'), get('export.csv'), get('export.pdf')]);
    return answers.find((a) => a.status !== 200) ?? answers[0];
  });
  // a new version of the plan: a day not computed yet, its legs all kept
  const saved = await send(base, 'GET', `/api/plans/${planId}`, { cookie: planner }, '');
  const edited = await send(
    base,
    'PATCH',
    `/api/plans/${planId}`,
    { cookie: planner, 'content-type': 'application/json' },
    JSON.stringify({ version: (saved.body as { version: number }).version, timeLimitSeconds: 23 * 3600 }),
  );
  if (edited.status !== 200) throw new Error(`the plan's edit: ${edited.status} ${edited.text}`);
  await measure('CSV of the edited plan (legs kept)', () => get('export.csv'));
  return rows;
}

/** Clip graphs built off the request path by the threads that compute days: the main thread's, or the pool's. */
async function clipBuilds(base: string, admin: string): Promise<number> {
  const stats = (await send(base, 'GET', '/api/compute/stats', { cookie: admin }, '')).body as {
    routeWorkers: { clipBuilds: number }[];
    mainThreadClipBuilds: { built: number };
  };
  return stats.routeWorkers.reduce((n, w) => n + w.clipBuilds, stats.mainThreadClipBuilds.built);
}

/** How long a clip graph's build may take here: about a minute at 100k nodes on a quiet core. */
const CLIP_WAIT_MS = Number(process.env.LOAD_CLIP_WAIT_SECONDS ?? 900) * 1000;

/**
 * Asks one route of the station's tether (which starts its clip graph's build off the request path,
 * on the thread that will compute its days) and waits, bounded, until a build lands: the day's rows
 * then measure the day on the clip graph, as a server that has been up a while computes it.
 */
async function clipGraphBuilt(
  base: string,
  admin: string,
  planner: string,
  stationId: number,
  worksites: string[],
): Promise<{ ok: boolean; ms: number }> {
  const t0 = performance.now();
  const before = await clipBuilds(base, admin);
  const route = await send(
    base,
    'POST',
    `/api/stations/${stationId}/routes`,
    { cookie: planner, 'content-type': 'application/json' },
    JSON.stringify({ from: worksites[0], to: worksites[1], mode: 'balanced', tetherLengthM: 25.9 }),
  );
  if (route.status !== 200) throw new Error(`the route that starts the build: ${route.status} ${route.text}`);
  while (performance.now() - t0 < CLIP_WAIT_MS) {
    if ((await clipBuilds(base, admin)) > before) return { ok: true, ms: performance.now() - t0 };
    await new Promise((r) => setTimeout(r, 2000));
  }
  return { ok: false, ms: performance.now() - t0 };
}

async function prepare(routeWorkers: number): Promise<Target> {
  const server = await startServer(routeWorkers);
  const { base } = server;
  try {
    const planner = await signIn(base, 'planner@example.org');
    const engineer = await signIn(base, 'engineer@example.org');
    const stations = (await (
      await fetch(`${base}/api/stations`, { headers: { cookie: planner } })
    ).json()) as { id: number; name: string }[];
    const demo = stations[0];
    if (!demo) throw new Error('no demo station seeded');

    // a 10k-node generated truss, imported through the API like any document
    const big = generateTrussStation({ nodes: 10_000, seed: 42 });
    const form = new FormData();
    form.append('file', new Blob([JSON.stringify(big)], { type: 'application/json' }), 'big.tetherwise.json');
    const imported = await fetch(`${base}/api/stations/import`, {
      method: 'POST',
      headers: { cookie: engineer },
      body: form,
    });
    if (imported.status !== 201)
      throw new Error(`import of the 10k station: ${imported.status} ${await imported.text()}`);
    const bigId = ((await imported.json()) as { station: { id: number } }).station.id;

    const attachKeys = async (id: number) => {
      const graph = (await (
        await fetch(`${base}/api/stations/${id}/graph`, { headers: { cookie: planner } })
      ).json()) as {
        nodes: { key: string; kind: string }[];
      };
      return graph.nodes.filter((n) => n.kind === 'anchor' || n.kind === 'airlock').map((n) => n.key);
    };
    const demoBodies = routeRequests(await attachKeys(demo.id), 500, 1);
    const bigBodies = routeRequests(await attachKeys(bigId), 500, 2);
    const routeOpts = (id: number, bodies: string[]): autocannon.Options => {
      let i = 0;
      return {
        url: `${base}/api/stations/${id}/routes`,
        method: 'POST',
        headers: { cookie: planner, 'content-type': 'application/json' },
        requests: [{ setupRequest: (req) => ({ ...req, body: bodies[i++ % bodies.length] }) }],
      };
    };
    const graphOpts: autocannon.Options = {
      url: `${base}/api/stations/${demo.id}/graph`,
      headers: { cookie: planner },
    };

    // warm: compile both stations and build their clip graphs (seconds at 10k), then a short run
    // under load so that every worker the pool hands a station to has built them too
    const t0 = performance.now();
    for (const [id, bodies] of [
      [demo.id, demoBodies],
      [bigId, bigBodies],
    ] as const) {
      const res = await fetch(`${base}/api/stations/${id}/routes`, {
        method: 'POST',
        headers: { cookie: planner, 'content-type': 'application/json' },
        body: bodies[0],
      });
      if (res.status !== 200) throw new Error(`warm-up route: ${res.status} ${await res.text()}`);
      await cannon({ ...routeOpts(id, bodies), duration: WARM_SECONDS });
    }
    console.log(
      `ROUTE_WORKERS=${routeWorkers}: started and warmed in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
    );

    const one = (name: string, opts: autocannon.Options): Scenario => ({
      name,
      run: async () => [toRow(name, await cannon(opts))],
    });
    const scenarios: Scenario[] = [
      one('GET /api/health (reference)', { url: `${base}/api/health` }),
      one(`POST routes — ${demo.name}`, routeOpts(demo.id, demoBodies)),
      one('POST routes — 10k-node truss', routeOpts(bigId, bigBodies)),
      one(`GET graph — ${demo.name}`, graphOpts),
      one('POST sign-in (bcrypt cost 10)', {
        url: `${base}/api/auth/sign-in`,
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email: 'viewer@example.org', password: DEMO_PASSWORD }),
      }),
      {
        // route load on the 10k station while a few others open the demo station's graph
        name: 'mixed',
        run: async () => {
          const [routes, graph] = await Promise.all([
            cannon(routeOpts(bigId, bigBodies)),
            cannon({ ...graphOpts, connections: LIGHT_CONNECTIONS }),
          ]);
          return [
            toRow('mixed: POST routes — 10k-node truss', routes),
            toRow(`mixed: GET graph (${LIGHT_CONNECTIONS} conn.)`, graph),
          ];
        },
      },
    ];
    const viewer = await signIn(base, 'viewer@example.org');
    const admin = await signIn(base, 'admin@example.org');
    return {
      routeWorkers,
      server,
      scenarios,
      soak: () => cannon({ ...routeOpts(bigId, bigBodies), duration: SOAK_SECONDS }),
      heavy: () => heavyOn(base, { viewer, engineer, planner, admin }),
      streams: () => measureStreams(server, `${base}/api/stations/${bigId}/routes`, bigBodies),
    };
  } catch (err) {
    await server.stop();
    throw err;
  }
}

interface Measured {
  routeWorkers: number;
  rows: Row[];
  heavy: HeavyRow[];
  soak?: { row: Row; beforeMiB: number; afterMiB: number };
}

async function soakOn(target: Target): Promise<Measured['soak']> {
  const pid = target.server.process.pid!;
  const beforeMiB = rssMiB(pid);
  const row = toRow(`soak ${SOAK_SECONDS} s: routes — 10k`, await target.soak());
  return { row, beforeMiB, afterMiB: rssMiB(pid) };
}

const ms = (v: number) => (v >= 1000 ? `${(v / 1000).toFixed(2)} s` : `${v.toFixed(0)} ms`);

function printComparison(main: Measured, pool: Measured) {
  const label = (m: Measured) => (m.routeWorkers === 0 ? 'main thread' : `pool of ${m.routeWorkers}`);
  console.log(
    `\nLoad on loopback: ${os.cpus()[0]?.model} ×${os.cpus().length}, node ${process.version}, ` +
      `${CONNECTIONS} connections, ${RUN_SECONDS} s a run; left: ${label(main)}, right: ${label(pool)}`,
  );
  const cols = ['req/s', 'p50', 'p99', 'err'];
  console.log(
    'endpoint'.padEnd(40),
    ...cols.map((c) => c.padStart(8)),
    '│',
    ...cols.map((c) => c.padStart(8)),
    '│',
    'req/s ×'.padStart(8),
    'p99 ×'.padStart(7),
  );
  const cells = (r: Row) =>
    [r.rps.toFixed(0), ms(r.p50), ms(r.p99), String(r.errors)].map((c) => c.padStart(8));
  const pairs = main.rows.map((r, i) => [r, pool.rows[i]] as const);
  if (main.soak && pool.soak) pairs.push([main.soak.row, pool.soak.row]);
  for (const [a, b] of pairs) {
    console.log(
      a.name.padEnd(40),
      ...cells(a),
      '│',
      ...cells(b),
      '│',
      (b.rps / a.rps).toFixed(2).padStart(8),
      (b.p99 / Math.max(a.p99, 1)).toFixed(2).padStart(7),
    );
  }
  for (const m of [main, pool]) {
    if (!m.soak) continue;
    const { row, beforeMiB, afterMiB } = m.soak;
    console.log(
      `\nSoak (${label(m)}, the default here) ${SOAK_SECONDS} s of routes on the 10k station: ${row.rps.toFixed(0)} req/s, ` +
        `p99 ${ms(row.p99)}, errors ${row.errors}; server RSS ${beforeMiB.toFixed(0)} MiB before → ${afterMiB.toFixed(0)} MiB after`,
    );
  }
}

const quantile = (values: number[], q: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? NaN;
};

/** Each heavy request on both servers: its time, and GET /api/health's latency meanwhile. */
function printHeavy(main: Measured, pool: Measured) {
  const label = (m: Measured) => (m.routeWorkers === 0 ? 'main thread' : 'task workers');
  console.log(
    `\nHeavy requests, one at a time, /api/health sampled every 20 ms meanwhile; left: ${label(main)}, right: ${label(pool)}` +
      '; "not 200": health samples the server could not answer in time; load: 1-minute load average as each started',
  );
  const cols = ['time', 'health n', 'p50', 'p99', 'max', 'not 200', 'load'];
  console.log(
    'request'.padEnd(44),
    ...cols.map((c) => c.padStart(9)),
    '│',
    ...cols.map((c) => c.padStart(9)),
    '│',
    'max ×'.padStart(7),
  );
  const cells = (r: HeavyRow) => {
    const wall = r.health.map((h) => h.wallMs);
    return [
      ms(r.ms),
      String(wall.length),
      ms(quantile(wall, 0.5)),
      ms(quantile(wall, 0.99)),
      ms(Math.max(...wall)),
      String(r.health.filter((h) => h.status !== 200).length),
      r.load.toFixed(1),
    ].map((c) => c.padStart(9));
  };
  main.heavy.forEach((a, i) => {
    const b = pool.heavy[i];
    const maxOf = (r: HeavyRow) => Math.max(...r.health.map((h) => h.wallMs));
    console.log(
      `${a.name}${a.bytes && a.bytes > 100_000 ? `, ${(a.bytes / 1e6).toFixed(2)} MB` : ''}${a.status >= 300 || b.status >= 300 ? ` (${a.status}/${b.status})` : ''}`.padEnd(
        44,
      ),
      ...cells(a),
      '│',
      ...cells(b),
      '│',
      (maxOf(b) / Math.max(maxOf(a), 1)).toFixed(3).padStart(7),
    );
  });
}

/** The heavy requests alone, on both servers (`LOAD_ONLY=heavy`): no route load before them. */
async function heavyOnly() {
  const servers = [await startServer(0), await startServer(POOL_WORKERS)];
  try {
    const measured: Measured[] = [];
    for (const [k, server] of servers.entries()) {
      const who = async (role: string) => signIn(server.base, `${role}@example.org`);
      const cookies = {
        viewer: await who('viewer'),
        engineer: await who('engineer'),
        planner: await who('planner'),
        admin: await who('admin'),
      };
      const routeWorkers = k === 0 ? 0 : POOL_WORKERS;
      measured.push({ routeWorkers, rows: [], heavy: await heavyOn(server.base, cookies) });
    }
    printHeavy(measured[0], measured[1]);
    const failed = measured.flatMap((m) => m.heavy).filter((r) => r.status >= 300);
    process.exitCode = failed.length > 0 ? 1 : 0;
  } finally {
    await Promise.all(servers.map((s) => s.stop()));
  }
}

async function streamsOnly() {
  const target = await prepare(defaultRouteWorkers());
  try {
    printStreams(await target.streams());
  } finally {
    await target.server.stop();
  }
}

async function main() {
  const started = performance.now();
  const defaultWorkers = defaultRouteWorkers();
  // both servers run side by side and each row is measured on one, then at once on the other, so
  // that other work on the machine weighs on both alike; an idle server costs the other nothing
  const targets = [await prepare(0), await prepare(POOL_WORKERS)];
  try {
    const measured: Measured[] = targets.map((t) => ({ routeWorkers: t.routeWorkers, rows: [], heavy: [] }));
    for (let i = 0; i < targets[0].scenarios.length; i++) {
      for (const [k, t] of targets.entries()) measured[k].rows.push(...(await t.scenarios[i].run()));
    }
    const byDefault = targets.find((t) => t.routeWorkers === defaultWorkers) ?? targets[1];
    const streams = await byDefault.streams();
    for (const [k, t] of targets.entries())
      if (t.routeWorkers === defaultWorkers) measured[k].soak = await soakOn(t);
    for (const [k, t] of targets.entries()) measured[k].heavy = await t.heavy();
    printComparison(measured[0], measured[1]);
    printHeavy(measured[0], measured[1]);
    printStreams(streams);
    const all = measured.flatMap((m) => [...m.rows, ...(m.soak ? [m.soak.row] : [])]);
    const heavyFailed = measured.flatMap((m) => m.heavy).filter((r) => r.status >= 300);
    const bad = all.some((r) => r.errors > 0) || heavyFailed.length > 0;
    console.log(
      `\n${bad ? 'FAIL: some requests failed' : 'PASS: zero errors'} (${((performance.now() - started) / 1000).toFixed(0)} s in all)`,
    );
    process.exitCode = bad ? 1 : 0;
  } finally {
    await Promise.all(targets.map((t) => t.server.stop()));
  }
}

const only = process.env.LOAD_ONLY;
await (only === 'streams' ? streamsOnly() : only === 'heavy' ? heavyOnly() : main());
