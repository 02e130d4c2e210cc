import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { segmentIntersectsHazard } from '@shared/compute/geometry';
import type { StationGraph } from '@shared/schemas/station-edits';
import { createApp } from '../../server/app';
import { generateKestrelStation } from '../../scripts/generate-demo-station';
import { KESTREL_STATION_FILE } from '../../server/db/seed/demo-station';
import fs from 'node:fs';
import { makeTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
let g: StationGraph;

beforeAll(async () => {
  t = await makeTestApp({ seedDemo: true });
  const list = await (await t.agent('viewer')).get('/api/stations');
  const kestrel = list.body.find((s: { name: string }) => s.name === 'Kestrel Station');
  g = (await (await t.agent('viewer')).get(`/api/stations/${kestrel.id}/graph`)).body;
});
afterAll(() => t.close());

describe('the Kestrel demo station', () => {
  it('the committed JSON is what the generator makes (deterministic)', () => {
    expect(JSON.parse(fs.readFileSync(KESTREL_STATION_FILE, 'utf8'))).toEqual(generateKestrelStation());
  });

  it('is seeded once, by the admin, with several hundred nodes, and a restart does not add it again', async () => {
    expect(g.station).toMatchObject({ version: 1, updatedBy: { name: 'Ada Okafor' } });
    expect(g.nodes.length).toBeGreaterThanOrEqual(400);
    expect(g.nodes.length).toBeLessThanOrEqual(700);
    const again = await createApp({ config: { ...t.ctx.config }, seed: true });
    try {
      const stations = again.ctx.sqlite.prepare('select count(*) as n from stations').get() as { n: number };
      expect(stations.n).toBe(1);
    } finally {
      await again.close();
    }
  });

  it('has the parts the demo needs: modules, port and starboard bays, worksites with sockets, rides, an arm', () => {
    const segKeys = g.segments.map((s) => s.key);
    expect(segKeys).toEqual(
      expect.arrayContaining(['CB', 'PB1', 'PB2', 'PB3', 'PB4', 'SB1', 'SB2', 'SB3', 'SB4']),
    );
    expect(g.segments.filter((s) => s.kind === 'module').length).toBeGreaterThanOrEqual(2);
    expect(g.nodes.filter((n) => n.kind === 'airlock')).toHaveLength(1);
    expect(g.nodes.some((n) => /^PB\d-A\d\d$/.test(n.key))).toBe(true);
    const worksites = g.nodes.filter((n) => n.kind === 'worksite').map((n) => n.label);
    expect(worksites).toEqual(
      expect.arrayContaining([
        'Coolant pump module site',
        'External camera boom mount',
        'Power connector panel',
      ]),
    );
    for (const s of g.nodes.filter((n) => n.kind === 'socket'))
      expect(Math.hypot(...s.normal!)).toBeCloseTo(1, 9);
    // the core-to-starboard ride, and the arm's ride to the survey point only it reaches
    expect(g.edges.filter((e) => e.kind === 'ride')).toHaveLength(2);
    expect(g.arms.map((a) => [a.key, g.nodes.some((n) => n.key === a.baseNode)])).toEqual([['ARM-1', true]]);
    expect(g.edges.filter((e) => e.kind === 'hop').length).toBeGreaterThan(10);
  });

  it('the radiator keep-out cuts handrails and the antenna caution crosses some; the graph stays connected', () => {
    const pos = new Map(g.nodes.map((n) => [n.key, n.position]));
    const crossing = (key: string) =>
      g.edges.filter((e) =>
        segmentIntersectsHazard(
          pos.get(e.from)!,
          pos.get(e.to)!,
          g.hazards.find((h) => h.key === key)!,
        ),
      );
    const keepOut = g.hazards.find((h) => h.kind === 'keep-out')!;
    const caution = g.hazards.find((h) => h.kind === 'caution')!;
    expect(crossing(keepOut.key).filter((e) => e.kind === 'handrail').length).toBeGreaterThan(4);
    expect(crossing(caution.key).length).toBeGreaterThan(0);

    const open = g.edges.filter((e) => !crossing(keepOut.key).includes(e));
    const adj = new Map<string, string[]>();
    for (const e of open) {
      adj.set(e.from, [...(adj.get(e.from) ?? []), e.to]);
      adj.set(e.to, [...(adj.get(e.to) ?? []), e.from]);
    }
    const start = g.nodes.find((n) => n.kind === 'airlock')!.key;
    const seen = new Set([start]);
    const queue = [start];
    while (queue.length) {
      for (const m of adj.get(queue.pop()!) ?? []) {
        if (seen.has(m)) continue;
        seen.add(m);
        queue.push(m);
      }
    }
    const worksites = g.nodes.filter((n) => n.kind === 'worksite');
    expect(worksites.every((w) => seen.has(w.key))).toBe(true);
  });

  it('has one anchor gap longer than a 25.9 m tether and one between 55 ft and 85 ft (planning-interest stretches)', () => {
    const anchorGaps = (y: number, z: number) => {
      const xs = g.nodes
        .filter((n) => n.kind === 'anchor' && n.position[1] === y && n.position[2] === z)
        .map((n) => n.position[0])
        .sort((a, b) => a - b);
      return Math.max(...xs.slice(1).map((x, i) => x - xs[i]));
    };
    expect(anchorGaps(0.75, -1.5)).toBeGreaterThan(25.9);
    const fore = anchorGaps(1.5, 0.75);
    expect(fore).toBeGreaterThan(55 * 0.3048);
    expect(fore).toBeLessThan(25.9);
  });
});
