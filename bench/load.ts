// `npm run bench:load`: the real server in its own process on loopback, driven by autocannon.
// Bounded: each run has a fixed duration; the whole thing stops itself in about two and a half minutes.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import { generateTrussStation } from '../shared/compute/truss-generator';

const RUN_SECONDS = Number(process.env.LOAD_RUN_SECONDS ?? 10);
const SOAK_SECONDS = Number(process.env.LOAD_SOAK_SECONDS ?? 60);
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 10);
const PASSWORD = 'tetherwise-demo';

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as net.AddressInfo).port;
      srv.close(() => resolve(port));
    });
    srv.on('error', reject);
  });
}

function rssMiB(pid: number): number {
  const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  const kb = Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0);
  return kb / 1024;
}

async function signIn(base: string, email: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in ${email}: ${res.status}`);
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

interface Row {
  name: string;
  rps: number;
  p50: number;
  p99: number;
  errors: number;
  non2xx: number;
  requests: number;
}

async function run(name: string, opts: autocannon.Options): Promise<Row> {
  const result = await autocannon({ connections: CONNECTIONS, duration: RUN_SECONDS, ...opts });
  return {
    name,
    rps: result.requests.average,
    p50: result.latency.p50,
    p99: result.latency.p99,
    errors: result.errors + result.timeouts,
    non2xx: result.non2xx,
    requests: result.requests.total,
  };
}

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

async function main() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tetherwise-load-'));
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    env: {
      ...process.env,
      PORT: String(port),
      DATABASE_URL: path.join(dir, 'load.db'),
      DATA_DIR: dir,
      SEED_DEMO: '1',
      LOG_LEVEL: 'warn',
      // the limiters would turn a load test into a rate-limit test
      API_REQUESTS_PER_MINUTE: '100000000',
      SIGN_IN_ATTEMPTS: '100000000',
    },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  const stop = () => server.kill('SIGTERM');
  process.on('exit', stop);
  try {
    for (let i = 0; i < 200; i++) {
      try {
        if ((await fetch(`${base}/api/health`)).ok) break;
      } catch {
        /* not up yet */
      }
      await new Promise((r) => setTimeout(r, 100));
    }
    const planner = await signIn(base, 'planner@example.org');
    const engineer = await signIn(base, 'engineer@example.org');
    const stations = (await (await fetch(`${base}/api/stations`, { headers: { cookie: planner } })).json()) as { id: number; name: string }[];
    const demo = stations[0];
    if (!demo) throw new Error('no demo station seeded');

    // a 10k-node generated truss, imported through the API like any document
    const big = generateTrussStation({ nodes: 10_000, seed: 42 });
    const form = new FormData();
    form.append('file', new Blob([JSON.stringify(big)], { type: 'application/json' }), 'big.tetherwise.json');
    const imported = await fetch(`${base}/api/stations/import`, { method: 'POST', headers: { cookie: engineer }, body: form });
    if (imported.status !== 201) throw new Error(`import of the 10k station: ${imported.status} ${await imported.text()}`);
    const bigId = ((await imported.json()) as { station: { id: number } }).station.id;

    const attachKeys = async (id: number) => {
      const graph = (await (await fetch(`${base}/api/stations/${id}/graph`, { headers: { cookie: planner } })).json()) as {
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

    // warm the compiled-station cache of both stations
    for (const [id, bodies] of [[demo.id, demoBodies], [bigId, bigBodies]] as const) {
      await fetch(`${base}/api/stations/${id}/routes`, { method: 'POST', headers: { cookie: planner, 'content-type': 'application/json' }, body: bodies[0] });
    }

    const rows: Row[] = [];
    rows.push(await run('GET /api/health (reference)', { url: `${base}/api/health` }));
    rows.push(await run(`POST routes — ${demo.name}`, routeOpts(demo.id, demoBodies)));
    rows.push(await run('POST routes — 10k-node truss', routeOpts(bigId, bigBodies)));
    rows.push(await run(`GET graph — ${demo.name}`, { url: `${base}/api/stations/${demo.id}/graph`, headers: { cookie: planner } }));
    rows.push(
      await run('POST sign-in (bcrypt cost 10)', {
        url: `${base}/api/auth/sign-in`,
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email: 'viewer@example.org', password: PASSWORD }),
      }),
    );

    const before = rssMiB(server.pid!);
    const soak = await autocannon({ ...routeOpts(bigId, bigBodies), connections: CONNECTIONS, duration: SOAK_SECONDS });
    const after = rssMiB(server.pid!);

    const ref = rows[0].rps;
    console.log(`\nLoad on loopback: ${os.cpus()[0]?.model} ×${os.cpus().length}, ${CONNECTIONS} connections, ${RUN_SECONDS} s each`);
    console.log('endpoint'.padEnd(36), 'req/s'.padStart(9), 'p50 ms'.padStart(8), 'p99 ms'.padStart(8), 'errors'.padStart(7), 'non-2xx'.padStart(8), '÷health'.padStart(8));
    for (const r of rows) {
      console.log(
        r.name.padEnd(36),
        r.rps.toFixed(0).padStart(9),
        r.p50.toFixed(1).padStart(8),
        r.p99.toFixed(1).padStart(8),
        String(r.errors).padStart(7),
        String(r.non2xx).padStart(8),
        (r.rps / ref).toFixed(3).padStart(8),
      );
    }
    console.log(
      `\nSoak ${SOAK_SECONDS} s of routes on the 10k station: ${soak.requests.average.toFixed(0)} req/s, p99 ${soak.latency.p99} ms, ` +
        `errors ${soak.errors + soak.timeouts}, non-2xx ${soak.non2xx}; server RSS ${before.toFixed(0)} MiB before → ${after.toFixed(0)} MiB after`,
    );
    const bad = rows.some((r) => r.errors > 0 || r.non2xx > 0) || soak.errors > 0 || soak.non2xx > 0;
    console.log(bad ? 'FAIL: some requests failed' : 'PASS: zero errors');
    process.exitCode = bad ? 1 : 0;
  } finally {
    stop();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

await main();
