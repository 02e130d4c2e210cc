// Station edits at 10k nodes as the editor makes them: the real server in its own process on
// loopback (bench/serve.ts), a generated 10k-node station imported, each kind of edit made again and
// again on one kept-alive connection, each answer's version carried into the next edit. Target: the
// median of every kind at most 50 ms. References measured in the same run: GET /api/health on the
// same connection, the whole model's check (parseStationDocument) in this process, which every edit
// used to run, and its graph rules alone (checkStationGraphRules), which every edit ran until they
// were checked on what the edit changes.
import http from 'node:http';
import { checkStationGraphRules, parseStationDocument } from '../shared/schemas/station';
import { median, serverWithStation, timedRequest } from './serve';

const TARGET_MS = 50;
const WARM = 3;
const REPS = Number(process.env.BENCH_EDIT_REPS ?? 11);

export async function run(): Promise<boolean> {
  const { server, engineer, doc, stationId } = await serverWithStation({});
  const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  let version = 0;
  const base = `${server.base}/api/stations/${stationId}`;
  const call = async (method: string, path: string, body?: unknown) => {
    const r = await timedRequest(
      agent,
      `${base}${path}`,
      method,
      { cookie: engineer, 'content-type': 'application/json' },
      body === undefined ? undefined : JSON.stringify(body),
    );
    if (r.status >= 300) throw new Error(`${method} ${path}: ${r.status}`);
    return r;
  };
  try {
    const station = await timedRequest(agent, `${base}/graph`, 'GET', { cookie: engineer });
    version = (JSON.parse(station.body.toString()) as { station: { version: number } }).station.version;
    const node = doc.nodes[500];
    const [a, b] = [doc.nodes[10].key, doc.nodes[4000].key];
    // one round makes each kind once, in this order: what one adds the next removes, so every round
    // starts from the same model
    const kinds: [string, (i: number) => ReturnType<typeof call>][] = [
      [
        'node move',
        (i) =>
          call('PATCH', `/nodes/${node.key}`, {
            version,
            node: { position: [node.position[0], node.position[1], node.position[2] + (i % 2) * 0.1] },
          }),
      ],
      ['node note', (i) => call('PATCH', `/nodes/${node.key}`, { version, node: { notes: `checked ${i}` } })],
      [
        'node add',
        (i) =>
          call('POST', '/nodes', {
            version,
            node: { key: `BENCH-${i}`, kind: 'anchor', position: [0, 0, 60 + i] },
          }),
      ],
      ['node delete', (i) => call('DELETE', `/nodes/BENCH-${i}?version=${version}`)],
      [
        'edge add',
        (i) =>
          call('POST', '/edges', { version, edge: { from: a, to: b, kind: 'hop', label: `bench ${i}` } }),
      ],
      ['edge close', (i) => call('PATCH', `/edges/${lastEdge}`, { version, edge: { closed: i % 2 === 0 } })],
      ['edge remove', () => call('DELETE', `/edges/${lastEdge}?version=${version}`)],
      [
        'hazard add',
        (i) =>
          call('POST', '/hazards', {
            version,
            hazard: { key: `BH-${i}`, kind: 'caution', shape: 'sphere', center: [0, 0, 80], radiusM: 1 },
          }),
      ],
      [
        'segment move',
        (i) =>
          call('PATCH', `/segments/${doc.segments[0].key}`, {
            version,
            segment: {
              center: [
                doc.segments[0].center[0],
                doc.segments[0].center[1],
                doc.segments[0].center[2] + (i % 2) * 0.1,
              ],
            },
          }),
      ],
      [
        'arm set',
        (i) =>
          call('PATCH', '', {
            version,
            arms: [
              {
                key: 'BENCH-ARM',
                baseNode: node.key,
                reachM: 17.6 + (i % 2),
                tipSpeedMps: 0.05,
                settleSeconds: 60,
              },
            ],
          }),
      ],
      ['settings', (i) => call('PATCH', '', { version, settings: { swapSeconds: 90 + (i % 2) } })],
    ];
    let lastEdge = 0;
    const rows: [string, number][] = [];
    const health: number[] = [];
    const times = new Map<string, number[]>(kinds.map(([k]) => [k, []]));
    for (let i = 0; i < WARM + REPS; i++) {
      for (const [kind, edit] of kinds) {
        const r = await edit(i);
        const answer = JSON.parse(r.body.toString()) as { version: number; edge?: { id: number } };
        version = answer.version;
        if (answer.edge) lastEdge = answer.edge.id;
        if (i >= WARM) times.get(kind)!.push(r.ms);
      }
      health.push((await timedRequest(agent, `${server.base}/api/health`, 'GET', {})).ms);
    }
    for (const [kind] of kinds) rows.push([kind, median(times.get(kind)!)]);
    const t0 = performance.now();
    for (let i = 0; i < 3; i++) parseStationDocument(doc);
    const fullMs = (performance.now() - t0) / 3;
    const t1 = performance.now();
    for (let i = 0; i < 3; i++) checkStationGraphRules(doc);
    const rulesMs = (performance.now() - t1) / 3;
    console.log(
      `median of ${REPS} edits each after ${WARM} rounds to warm up; ${doc.nodes.length} nodes, ${doc.edges.length} edges`,
    );
    console.log(
      `references: GET /api/health ${median(health).toFixed(2)} ms; the whole model's check in process ${fullMs.toFixed(1)} ms, ` +
        `its graph rules alone ${rulesMs.toFixed(1)} ms`,
    );
    let ok = true;
    for (const [kind, ms] of rows) {
      const met = ms <= TARGET_MS;
      ok &&= met;
      console.log(
        kind.padEnd(14),
        `${ms.toFixed(1)} ms`.padStart(10),
        `${(ms / median(health)).toFixed(1)}× health`.padStart(14),
        met ? 'PASS' : `FAIL (> ${TARGET_MS} ms)`,
      );
    }
    return ok;
  } finally {
    agent.destroy();
    await server.stop();
  }
}
