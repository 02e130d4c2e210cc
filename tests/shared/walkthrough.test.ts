import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compileStation } from '@shared/compute/compiled-station';
import { findRoute } from '@shared/compute/routes';
import { computeTimeline } from '@shared/compute/day/timeline';
import { dayStationOf } from '@shared/compute/day/station';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { describeSwap } from '@shared/compute/day/describe';
import {
  itemStateAt,
  planWalkthrough,
  routeWalkthrough,
  sampleTrack,
  stateIndexAt,
  tetherLine,
} from '@shared/compute/walkthrough';
import type { RouteFeasible } from '@shared/schemas/route';
import type { Vec3 } from '@shared/schemas/station';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask, lineStationDocument } from '../factories/day';

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

describe('plan walkthrough: the items and the tether in each step (line station, worked by hand)', () => {
  const line = lineStationDocument();
  const engine = dayEngine(line);
  const linePositions = new Map(line.nodes.map((n) => [n.key, n.position as Vec3]));
  // EV1 carries the restraint and the bag out, installs the restraint in S2, hands the bag to EV2 in a
  // task for both, takes the restraint out again; EV2 brings the bag home
  const plan = buildDayPlan({
    manifest: [
      { key: 'fr-1', name: 'Portable foot restraint', kind: 'foot-restraint', carriedBy: 'EV1' },
      { key: 'bag', name: 'Tool bag', kind: 'bag', carriedBy: 'EV1' },
    ],
    tasks: [
      dayTask('Install the restraint', K.w2, 'EV1', 300, {
        actions: [{ do: 'install', item: 'fr-1', at: K.s2 }],
      }),
      dayTask('Pass the bag', K.w2, 'both', 600, {
        sockets: { EV1: K.s2 },
        tools: ['bag'],
        actions: [{ do: 'hand-over', item: 'bag', by: 'EV1' }],
      }),
      dayTask('Take the restraint out', K.w2, 'EV1', 120, {
        actions: [{ do: 'remove', item: 'fr-1', at: K.s2 }],
      }),
    ],
  });
  const timeline = computeTimeline(plan, engine.station, engine.route);
  const walk = planWalkthrough(timeline, plan.tasks, K.airlock, (k) => linePositions.get(k)!);
  const work = (crew: 'EV1' | 'EV2', taskIndex: number) =>
    walk.crews[crew].steps.find((s) => s.type === 'work' && s.taskIndex === taskIndex)!;

  it('the day has no warnings, so every step below is what the crew will do', () => {
    expect(timeline.warnings).toEqual([]);
  });

  it('work steps say the equipment steps of that crew member, and a hand-over on both sides', () => {
    expect(work('EV1', 0).equipment).toEqual(['EV1 installs Portable foot restraint at S2']);
    expect(work('EV1', 1).equipment).toEqual(['Needs at hand: Tool bag', 'EV1 hands Tool bag to EV2']);
    expect(work('EV2', 1).equipment).toEqual(['Needs at hand: Tool bag', 'EV1 hands Tool bag to EV2']);
    expect(work('EV1', 2).equipment).toEqual(['EV1 removes Portable foot restraint from S2']);
  });

  it('egress says what each crew member carries out, ingress what they bring in', () => {
    const step = (crew: 'EV1' | 'EV2', type: 'egress' | 'ingress') =>
      walk.crews[crew].steps.find((s) => s.type === type)!;
    expect(step('EV1', 'egress').equipment).toEqual(['EV1 carries out Portable foot restraint, Tool bag']);
    expect(step('EV2', 'egress').equipment).toBeUndefined();
    expect(step('EV1', 'ingress').equipment).toEqual(['EV1 brings in Portable foot restraint']);
    expect(step('EV2', 'ingress').equipment).toEqual(['EV2 brings in Tool bag']);
  });

  it('every step states the tether: the anchor and the metres out, a swap before and after', () => {
    for (const crew of ['EV1', 'EV2'] as const) {
      const steps = walk.crews[crew].steps;
      const swap = steps.find((s) => s.type === 'swap')!;
      // the walk from the airlock swaps at A1 first (worked by hand in day-timeline.test.ts)
      expect(swap.releaseKey).toBe(K.airlock);
      expect(tetherLine(swap)).toBe(
        `Tether: ${swap.paidOutM.toFixed(1)} m out from ${K.airlock}; clipped at ${swap.clipKey} after, nothing out`,
      );
      const w = work(crew, 1);
      expect(tetherLine(w)).toBe(`Tether: clipped at ${w.anchorKey}, ${w.paidOutM.toFixed(1)} m out`);
    }
  });

  it('items are where the timeline’s equipment tracks put them at every instant', () => {
    const restraint = timeline.equipment.find((e) => e.item === 'fr-1')!;
    const installAt = work('EV1', 0).end;
    expect(itemStateAt(restraint, installAt - 1).where).toEqual({ kind: 'carried', crew: 'EV1' });
    expect(itemStateAt(restraint, installAt).where).toEqual({ kind: 'installed', node: K.s2 });
    expect(itemStateAt(restraint, timeline.endSeconds).where).toEqual({ kind: 'airlock' });
    // states tile the day: the index found for each state's own start is that state
    restraint.states.forEach((s, i) => expect(stateIndexAt(restraint, s.start)).toBe(i));
  });
});

describe('a swap back onto the attach point already clipped reads as a re-clip', () => {
  it('names one attach point, not a new hook and an old one', () => {
    expect(describeSwap('A1', 'A1')).toEqual({
      title: 'Tether re-clip at A1',
      instruction: 're-clip at A1: clip the second hook at A1 beside the first, then release the first',
    });
    expect(describeSwap('A2', 'A1').instruction).toBe(
      'clip the new hook at A2, then release the old one at A1',
    );
  });

  it('in a plan walkthrough, from the timeline’s swap block', () => {
    const at: Vec3 = [0, 0, 0];
    const timeline = {
      routes: [],
      endSeconds: 200,
      crew: {
        EV1: {
          totalSeconds: 200,
          blocks: [
            { type: 'egress' as const, start: 0, end: 100, label: 'Egress' },
            {
              type: 'swap' as const,
              start: 100,
              end: 200,
              label: 'Tether swap at AL',
              swapNode: 'AL',
              releaseNode: 'AL',
              paidOutM: 6,
            },
          ],
        },
        EV2: { totalSeconds: 0, blocks: [] },
      },
    } as unknown as Parameters<typeof planWalkthrough>[0];
    const swap = planWalkthrough(timeline, [], 'AL', () => at).crews.EV1.steps[1];
    expect(swap.title).toBe('Tether re-clip at AL');
    expect(swap.detail).toContain('Re-clip at AL');
    expect(tetherLine(swap)).toBe('Tether: 6.0 m out from AL; re-clipped there, nothing out after');
  });
});
