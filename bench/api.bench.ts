// The API path as a browser on the same machine meets it: the real server in its own process on
// loopback (logging at `info`, as it runs by default), a generated 10k-node station imported, and
// requests on one kept-alive connection. A route answer is compared with GET /api/health measured
// in the same run, interleaved request by request so that other work on the machine weighs on both
// alike. Target: a `fastest` route's median within 1 ms of health's. The reference server sends
// every route through the worker pool (ROUTE_INLINE_NODES=0), as all routes went before.
import http from 'node:http';
import { median, serverWithStation, signIn, timedRequest, type Server } from './serve';

const WARM_PAIRS = 150;
const PAIRS = Number(process.env.BENCH_API_PAIRS ?? 600);
const TARGET_MS = 1;

interface Target {
  name: string;
  server: Server;
  agent: http.Agent;
  cookie: string;
  stationId: number;
  health: number[];
  route: number[];
  bytes: number;
}

/** One health request and one route on each target in turn, so that the machine's load weighs on all alike. */
async function measurePairs(targets: Target[], bodies: string[]) {
  for (let i = 0; i < WARM_PAIRS + PAIRS; i++) {
    for (const t of targets) {
      const a = await timedRequest(t.agent, `${t.server.base}/api/health`, 'GET', {});
      const b = await timedRequest(
        t.agent,
        `${t.server.base}/api/stations/${t.stationId}/routes`,
        'POST',
        { cookie: t.cookie, 'content-type': 'application/json', 'accept-encoding': 'gzip' },
        bodies[i % bodies.length],
      );
      if (a.status !== 200 || b.status !== 200) throw new Error(`health ${a.status}, route ${b.status}`);
      if (i < WARM_PAIRS) continue;
      t.health.push(a.ms);
      t.route.push(b.ms);
      t.bytes += b.bytes / PAIRS;
    }
  }
}

export async function run(): Promise<boolean> {
  const bodies: string[] = [];
  console.log(
    `median of ${PAIRS} interleaved pairs after ${WARM_PAIRS} to warm up; health without a cookie, ` +
      `routes signed in with gzip accepted; 10k-node generated station`,
  );
  console.log(
    'server'.padEnd(50),
    'health'.padStart(9),
    'fastest'.padStart(9),
    'difference'.padStart(11),
    'answer gz'.padStart(10),
  );
  const configs = [
    ['as configured (small queries on the main thread)', {}],
    ['reference: every route through the worker pool', { ROUTE_INLINE_NODES: '0' }],
  ] as const;
  const targets: Target[] = [];
  try {
    for (const [name, env] of configs) {
      const { server, doc, stationId } = await serverWithStation(env);
      const cookie = await signIn(server.base, 'viewer@example.org');
      const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
      targets.push({ name, server, agent, cookie, stationId, health: [], route: [], bytes: 0 });
      if (targets.length > 1) continue;
      const anchors = doc.nodes.filter((n) => n.kind === 'anchor').map((n) => n.key);
      let seed = 7;
      const next = () => (seed = (seed * 1103515245 + 12345) & 0x7fffffff);
      bodies.push(
        ...Array.from({ length: 200 }, () =>
          JSON.stringify({
            from: anchors[next() % anchors.length],
            to: anchors[next() % anchors.length],
            mode: 'fastest',
          }),
        ),
      );
    }
    await measurePairs(targets, bodies);
  } finally {
    for (const t of targets) t.agent.destroy();
    await Promise.all(targets.map((t) => t.server.stop()));
  }
  let ok = true;
  for (const t of targets) {
    const [health, route] = [median(t.health), median(t.route)];
    const diff = route - health;
    const reference = t !== targets[0];
    if (!reference) ok = diff <= TARGET_MS;
    console.log(
      t.name.padEnd(50),
      `${health.toFixed(3)} ms`.padStart(9),
      `${route.toFixed(3)} ms`.padStart(9),
      `${diff >= 0 ? '+' : ''}${diff.toFixed(3)} ms`.padStart(11),
      `${(t.bytes / 1000).toFixed(1)} kB`.padStart(10),
      reference ? '' : ok ? `PASS (≤ ${TARGET_MS} ms)` : `FAIL (> ${TARGET_MS} ms)`,
    );
  }
  return ok;
}
