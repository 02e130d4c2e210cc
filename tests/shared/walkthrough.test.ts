import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compileStation } from '@shared/compute/compiled-station';
import { findRoute } from '@shared/compute/routes';
import { computeTimeline } from '@shared/compute/day/timeline';
import { dayStationOf } from '@shared/compute/day/station';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { planWalkthrough, routeWalkthrough, sampleTrack } from '@shared/compute/walkthrough';
import type { RouteFeasible } from '@shared/schemas/route';
import type { Vec3 } from '@shared/schemas/station';

// Walkthrough steps come from the engine's own results; these tests compare them with those results.
const doc = generateTrussStation({ nodes: 600, seed: 7 });
const compiled = compileStation(doc);
const positions = new Map(doc.nodes.map((n) => [n.key, n.position as Vec3]));
const position = (k: string) => positions.get(k)!;
const attach = doc.nodes.filter((n) => n.kind === 'anchor' || n.kind === 'airlock').map((n) => n.key);
const airlock = doc.nodes.find((n) => n.kind === 'airlock')!.key;
const dist = (a: Vec3, b: Vec3) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

function feasibleRoute(
  from: string,
  to: string,
  mode: 'fastest' | 'fewest-swaps' | 'balanced',
  tether: number,
) {
  const r = findRoute(compiled, doc.settings, { from, to, mode, tetherLengthM: tether });
  return r.feasible ? r : null;
}

describe('route walkthrough', () => {
  it('has exactly the route’s swaps, in order, with the paid-out lengths the engine reported', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...attach),
        fc.constantFrom(...attach),
        fc.constantFrom('fastest' as const, 'fewest-swaps' as const, 'balanced' as const),
        fc.double({ min: 6, max: 30, noNaN: true }),
        (from, to, mode, tether) => {
          fc.pre(from !== to);
          const route = feasibleRoute(from, to, mode, tether);
          fc.pre(route !== null);
          const r = route as RouteFeasible;
          const track = routeWalkthrough(r, position);
          const swaps = track.steps.filter((s) => s.type === 'swap');
          expect(swaps.map((s) => s.clipKey)).toEqual(r.swaps.map((s) => s.node));
          swaps.forEach((s, i) => expect(s.paidOutM).toBeCloseTo(r.swaps[i].paidOutM, 9));
          // the hook released at each swap is the previous clip point (start, then each swap node)
          const clips = [r.nodes[0], ...r.swaps.map((s) => s.node)];
          swaps.forEach((s, i) => expect(s.releaseKey).toBe(clips[i]));
          // translate steps cover the whole route length; the track lasts the route's total time
          const translated = track.steps
            .filter((s) => s.type === 'translate')
            .reduce((a, s) => a + (s.lengthM ?? 0), 0);
          expect(translated).toBeCloseTo(r.lengthM, 6);
          expect(track.endSeconds).toBeCloseTo(r.totalSeconds, 6);
          expect(track.steps[0].type).toBe('start');
          expect(track.steps.at(-1)!.type).toBe('arrive');
          // the sampled tether never pays out more than the tether, and ends at the destination
          for (let k = 0; k <= 40; k++) {
            const sample = sampleTrack(track, (track.endSeconds * k) / 40);
            expect(sample.paidOutM).toBeLessThanOrEqual(r.tetherLengthM + 1e-6);
          }
          const end = sampleTrack(track, track.endSeconds);
          expect(dist(end.position, position(to))).toBeLessThan(1e-9);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('samples move continuously along the legs and hold still during a swap', () => {
    const r = [...attach]
      .reverse()
      .map((to) => feasibleRoute(airlock, to, 'fastest', 10))
      .find((x) => x && x.swapCount >= 2)!;
    expect(r).toBeTruthy();
    const track = routeWalkthrough(r, position);
    const swap = track.steps.find((s) => s.type === 'swap')!;
    const a = sampleTrack(track, swap.start + 1e-6);
    const b = sampleTrack(track, swap.end - 1e-6);
    expect(dist(a.position, b.position)).toBeLessThan(1e-9);
    expect(dist(a.position, position(swap.clipKey!))).toBeLessThan(1e-9);
    expect(sampleTrack(track, swap.end + 1e-3).anchorKey).toBe(swap.clipKey);
    let prev = sampleTrack(track, 0).position;
    for (let k = 1; k <= 400; k++) {
      const p = sampleTrack(track, (track.endSeconds * k) / 400).position;
      expect(dist(prev, p)).toBeLessThan(r.lengthM / 20 + 1e-9);
      prev = p;
    }
  });
});

describe('plan walkthrough', () => {
  const worksites = doc.nodes.filter((n) => n.kind === 'worksite');
  const sockets = doc.nodes.filter((n) => n.kind === 'socket');
  const tasks = [
    {
      title: 'Unbolt',
      worksite: worksites[0].key,
      crew: 'EV1' as const,
      durationSeconds: 1200,
      eclipseOnly: false,
      carrying: false,
      socket: sockets[0]?.key,
    },
    {
      title: 'Carry',
      worksite: worksites[1 % worksites.length].key,
      crew: 'both' as const,
      durationSeconds: 900,
      eclipseOnly: false,
      carrying: true,
    },
    {
      title: 'Mate',
      worksite: worksites[0].key,
      crew: 'EV2' as const,
      durationSeconds: 600,
      eclipseOnly: true,
      carrying: false,
    },
  ];
  const timeline = computeTimeline(
    {
      crew: { EV1: { name: 'A', tetherLengthM: 25.9 }, EV2: { name: 'B', tetherLengthM: 16.8 } },
      routeMode: 'balanced',
      allowRide: false,
      orbitPhaseAtStartDeg: 0,
      timeLimitSeconds: 23400,
      egressSeconds: 1800,
      ingressSeconds: 1800,
      manifest: [],
      tasks: tasks.map((t) => ({ ...t, tools: [], actions: [] })),
    },
    dayStationOf(doc, compiled)!,
    (request) => findRoute(compiled, doc.settings, request),
  );
  const walk = planWalkthrough(timeline, tasks, airlock, position);

  it('each crew member’s steps match their timeline blocks one to one, restraint blocks included', () => {
    for (const crew of ['EV1', 'EV2'] as const) {
      const blocks = timeline.crew[crew].blocks;
      const steps = walk.crews[crew].steps;
      expect(steps.map((s) => s.type)).toEqual(blocks.map((b) => b.type));
      steps.forEach((s, i) => {
        expect(s.start).toBeCloseTo(blocks[i].start, 9);
        expect(s.end).toBeCloseTo(blocks[i].end, 9);
        if (s.type === 'swap') expect(s.clipKey).toBe(blocks[i].swapNode);
      });
      expect(walk.crews[crew].endSeconds).toBeCloseTo(timeline.crew[crew].totalSeconds, 9);
    }
    const restraint = walk.crews.EV1.steps.filter((s) => s.type === 'restraint-in');
    expect(restraint.length).toBe(tasks[0].socket ? 1 : 0);
  });

  it('both crew start the shared task at the same elapsed time and end in the airlock', () => {
    const shared = (crew: 'EV1' | 'EV2') =>
      walk.crews[crew].steps.find((s) => s.type === 'work' && s.taskIndex === 1)!;
    expect(shared('EV1').start).toBeCloseTo(shared('EV2').start, 9);
    for (const crew of ['EV1', 'EV2'] as const) {
      const end = sampleTrack(walk.crews[crew], walk.endSeconds);
      expect(dist(end.position, position(airlock))).toBeLessThan(1e-9);
    }
  });
});
