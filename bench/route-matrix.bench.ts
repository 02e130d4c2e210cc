import { generateTrussStation, seededRandom } from '@shared/compute/truss-generator';
import { makeTestApp } from '../tests/setup/test-app';
import { importStation } from '../tests/setup/stations';
import { listenOnLoopback, signInCookie } from '../tests/setup/loopback';

/**
 * The route matrix through the real server on loopback (HTTP with keep-alive) on its route worker
 * pool: one call for 50 × 50 worksites on the 10k-node generated truss, beside the same 2,500 routes
 * asked one call at a time (the reference, in the same run, on the same server). Target: the matrix within 2 s. Both are
 * timed once the station's clip graph is built (the server builds it off the request path).
 */
const SIDE = 50;
const TARGET_MS = 2000;

export async function run(): Promise<boolean> {
  const t = await makeTestApp({ routeWorkers: 1 });
  try {
    const doc = generateTrussStation({ nodes: 10_000, seed: 42 });
    const station = await importStation(await t.agent('engineer'), doc);
    const admin = await t.agent('admin');
    const { base, server } = await listenOnLoopback(t.app);
    const cookie = await signInCookie(base, 'viewer');
    const post = async (path: string, body: unknown) => {
      const res = await fetch(`${base}${path}`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', cookie },
        body: JSON.stringify(body),
      });
      return { status: res.status, body: await res.json() };
    };
    const rand = seededRandom(5);
    const sites = doc.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);
    const nodes = Array.from({ length: SIDE }, () => sites[Math.floor(rand() * sites.length)]);
    const mode = 'balanced';
    // warm up: the first query starts the clip-graph build; wait until the worker uses it
    await post(`/api/stations/${station.id}/routes`, { from: nodes[0], to: nodes[1], mode });
    for (let k = 0; k < 600; k++) {
      const stats = await admin.get('/api/compute/stats');
      if (stats.body.routeWorkers.some((w: { clipBuilds: number }) => w.clipBuilds > 0)) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    await post(`/api/stations/${station.id}/route-matrix`, { nodes: nodes.slice(0, 5), mode });

    let t0 = performance.now();
    const res = await post(`/api/stations/${station.id}/route-matrix`, { nodes, mode });
    const matrixMs = performance.now() - t0;
    if (res.status !== 200)
      throw new Error(`route-matrix answered ${res.status}: ${JSON.stringify(res.body)}`);
    t0 = performance.now();
    let differ = 0;
    for (let i = 0; i < SIDE; i++) {
      for (let j = 0; j < SIDE; j++) {
        const single = await post(`/api/stations/${station.id}/routes`, {
          from: nodes[i],
          to: nodes[j],
          mode,
        });
        const seconds = single.body.feasible ? single.body.totalSeconds : null;
        if (seconds !== res.body.seconds[i][j]) differ++;
      }
    }
    const singleMs = performance.now() - t0;
    const pass = matrixMs <= TARGET_MS && differ === 0;
    console.log(
      `${SIDE} × ${SIDE} worksites, 10,000-node truss, ${mode}: matrix in one call ${(matrixMs / 1000).toFixed(2)} s ` +
        `(target ≤ ${TARGET_MS / 1000} s: ${pass ? 'PASS' : 'FAIL'}); ${SIDE * SIDE} single-route calls ` +
        `${(singleMs / 1000).toFixed(2)} s (${(singleMs / matrixMs).toFixed(1)}× the matrix); cells differing from the single route: ${differ}`,
    );
    server.close();
    return pass;
  } finally {
    await t.close();
  }
}
