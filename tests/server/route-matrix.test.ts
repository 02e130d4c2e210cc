import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateTrussStation, seededRandom } from '@shared/compute/truss-generator';
import { MAX_MATRIX_NODES } from '@shared/schemas/route';
import { makeAppWithStation } from '../setup/stations';
import type { TestAgent, TestApp } from '../setup/test-app';

let t: TestApp;
let viewer: TestAgent;
let stationId: number;
const doc = generateTrussStation({ nodes: 400, seed: 3 });
const worksites = doc.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);
const anchors = doc.nodes.filter((n) => n.kind === 'anchor').map((n) => n.key);

beforeAll(async () => {
  // on the worker pool, as in production
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(doc, { routeWorkers: 1 }));
  viewer = await t.agent('viewer');
});
afterAll(() => t.close());

const matrix = (body: object) => viewer.post(`/api/stations/${stationId}/route-matrix`).send(body);

describe('POST /api/stations/:id/route-matrix', () => {
  it('each cell is the single route from a fresh clip (random pairs, every mode)', async () => {
    const rand = seededRandom(11);
    const pick = (list: string[]) => list[Math.floor(rand() * list.length)];
    const nodes = [...new Set(Array.from({ length: 8 }, (_, i) => pick(i % 2 ? worksites : anchors)))];
    for (const mode of ['fastest', 'fewest-swaps', 'balanced'] as const) {
      const res = await matrix({ nodes, mode, tetherLengthM: 8 });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      expect(res.body.nodes).toEqual(nodes);
      expect(res.body.seconds).toHaveLength(nodes.length);
      for (let k = 0; k < 10; k++) {
        const i = Math.floor(rand() * nodes.length);
        const j = Math.floor(rand() * nodes.length);
        const single = await viewer
          .post(`/api/stations/${stationId}/routes`)
          .send({ from: nodes[i], to: nodes[j], mode, tetherLengthM: 8 });
        expect(single.status).toBe(200);
        if (single.body.feasible) {
          expect(res.body.seconds[i][j]).toBe(single.body.totalSeconds);
          expect(res.body.swaps[i][j]).toBe(single.body.swapCount);
        } else {
          expect(res.body.seconds[i][j]).toBeNull();
          expect(res.body.swaps[i][j]).toBeNull();
        }
      }
      // a node to itself is the single route's `same-node`: infeasible
      expect(res.body.seconds[0][0]).toBeNull();
    }
  });

  it('bad bodies are 400s at their paths, unknown nodes 404s naming them, signed out 401', async () => {
    const tooMany = await matrix({ nodes: Array(MAX_MATRIX_NODES + 1).fill(anchors[0]), mode: 'fastest' });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.code).toBe('VALIDATION_FAILED');
    expect(tooMany.body.error.details[0].path).toBe('body.nodes');
    const empty = await matrix({ nodes: [], mode: 'fastest' });
    expect(empty.status).toBe(400);
    const mode = await matrix({ nodes: [anchors[0]], mode: 'shortest' });
    expect(mode.status).toBe(400);
    expect(mode.body.error.details[0].path).toBe('body.mode');
    const unknown = await matrix({ nodes: [anchors[0], 'NOPE'], mode: 'fastest' });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.details).toEqual([{ path: 'body.nodes[1]', message: 'no node "NOPE"' }]);
    const missing = await viewer
      .post('/api/stations/999999/route-matrix')
      .send({ nodes: [anchors[0]], mode: 'fastest' });
    expect(missing.status).toBe(404);
    const anonymous = await t
      .anonymous()
      .post(`/api/stations/${stationId}/route-matrix`)
      .send({ nodes: [anchors[0]], mode: 'fastest' });
    expect(anonymous.status).toBe(401);
    expect(anonymous.body.error.code).toBe('UNAUTHENTICATED');
  });
});
