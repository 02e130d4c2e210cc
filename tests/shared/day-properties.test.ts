import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { computeTimeline, placeDay } from '@shared/compute/day/timeline';
import { fromWire, toWire, type WireTimeline } from '@shared/compute/day/wire';
import { planWalkthrough, sampleTrack } from '@shared/compute/walkthrough';
import type { DayPlan, DayRouteFn, DayRouteRequest, Timeline } from '@shared/compute/day/types';
import { ITEM_ACTIONS, MANIFEST_KINDS } from '@shared/schemas/plan';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask, lineStationDocument } from '../factories/day';

const doc = lineStationDocument();
const { station, route } = dayEngine(doc);
const ATTACH = new Set(
  doc.nodes.filter((n) => n.kind === 'anchor' || n.kind === 'airlock').map((n) => n.key),
);
const NODES = doc.nodes.map((n) => n.key);
const SITES = [K.w1, K.w2, K.w3];
const ITEMS = ['fr-a', 'fr-b', 'anchor', 'big', 'driver', 'bag'];
const KIND_OF: Record<string, (typeof MANIFEST_KINDS)[number]> = {
  'fr-a': 'foot-restraint',
  'fr-b': 'foot-restraint',
  anchor: 'tether-anchor',
  big: 'large-item',
  driver: 'tool',
  bag: 'bag',
};

/** Random plans on the line station, valid or not: the day must stay whole whatever they ask. */
const planArb: fc.Arbitrary<DayPlan> = fc
  .record({
    tether: fc.constantFrom(12, 14, 20),
    mode: fc.constantFrom('fastest' as const, 'fewest-swaps' as const, 'balanced' as const),
    carriers: fc.array(fc.constantFrom('EV1' as const, 'EV2' as const, undefined), {
      minLength: ITEMS.length,
      maxLength: ITEMS.length,
    }),
    tasks: fc.array(
      fc.record({
        site: fc.constantFrom(...SITES),
        crew: fc.constantFrom('EV1' as const, 'EV2' as const, 'both' as const),
        duration: fc.integer({ min: 60, max: 1800 }),
        socket: fc.boolean(),
        tool: fc.boolean(),
        actions: fc.array(
          fc.record({
            do: fc.constantFrom(...ITEM_ACTIONS),
            item: fc.constantFrom(...ITEMS),
            by: fc.constantFrom('EV1' as const, 'EV2' as const),
            at: fc.option(fc.constantFrom(...NODES), { nil: undefined }),
          }),
          { maxLength: 3 },
        ),
      }),
      { maxLength: 7 },
    ),
  })
  .map(({ tether, mode, carriers, tasks }) =>
    buildDayPlan({
      crew: { EV1: { name: 'A', tetherLengthM: tether }, EV2: { name: 'B', tetherLengthM: tether } },
      routeMode: mode,
      manifest: ITEMS.map((key, i) => ({
        key,
        name: key,
        kind: KIND_OF[key],
        startsAt: 'airlock',
        ...(carriers[i] ? { carriedBy: carriers[i] } : {}),
      })),
      tasks: tasks.map((t, i) =>
        dayTask(`task ${i + 1}`, t.site, t.crew, t.duration, {
          ...(t.socket && t.site === K.w2
            ? t.crew === 'both'
              ? { sockets: { EV1: K.s2 } }
              : { socket: K.s2 }
            : {}),
          tools: t.tool ? ['driver'] : [],
          actions: t.actions
            .filter((a) => t.crew === 'both' || a.do !== 'hand-over')
            .map((a) => ({
              do: a.do,
              item: a.item,
              by: t.crew === 'both' ? a.by : t.crew,
              ...(a.do === 'hand-over'
                ? {}
                : { at: a.at ?? (KIND_OF[a.item] === 'foot-restraint' ? K.s2 : t.site) }),
            })),
        }),
      ),
    }),
  );

const EPS = 1e-6;

function checkTiling(t: Timeline) {
  for (const track of t.equipment) {
    const s = track.states;
    expect(s.length).toBeGreaterThan(0);
    expect(s[0].start).toBe(0);
    expect(s[s.length - 1].end).toBe(t.endSeconds);
    for (let i = 0; i < s.length; i++) {
      expect(s[i].end).toBeGreaterThanOrEqual(s[i].start);
      if (i > 0) {
        expect(s[i].start).toBe(s[i - 1].end);
        expect(s[i].where).not.toEqual(s[i - 1].where);
      }
    }
  }
}

/** Where a portable anchor is installed at time t, from the equipment states. */
function anchorsAt(t: Timeline, when: number): Set<string> {
  const out = new Set<string>();
  for (const track of t.equipment) {
    if (track.kind !== 'tether-anchor') continue;
    for (const s of track.states) {
      if (s.where.kind === 'installed' && s.start <= when + EPS && when <= s.end + EPS) out.add(s.where.node);
    }
  }
  return out;
}

describe('the continuous day (fast-check, random plans on the line station)', () => {
  it('every item is in exactly one place at every instant: its states tile the day without gaps or overlaps', () => {
    fc.assert(
      fc.property(planArb, (plan) => checkTiling(computeTimeline(plan, station, route))),
      { numRuns: 150 },
    );
  });

  it("a crew member's paid-out length never exceeds their tether at any instant of the day", () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const t = computeTimeline(plan, station, route);
        const position = (key: string) => doc.nodes.find((n) => n.key === key)!.position;
        const walk = planWalkthrough(t, plan.tasks, K.airlock, position);
        for (const m of ['EV1', 'EV2'] as const) {
          const tether = plan.crew[m].tetherLengthM;
          for (const b of t.crew[m].blocks) {
            if (b.tetherAtEnd) expect(b.tetherAtEnd.paidOutM).toBeLessThanOrEqual(tether + EPS);
          }
          const track = walk.crews[m];
          for (let k = 0; k <= 200; k++) {
            const s = sampleTrack(track, (track.endSeconds * k) / 200);
            expect(s.paidOutM).toBeLessThanOrEqual(tether + EPS);
          }
        }
      }),
      { numRuns: 100 },
    );
  });

  it('swaps happen only at attach points: the station’s, or a portable anchor installed at that moment', () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const t = computeTimeline(plan, station, route);
        for (const m of ['EV1', 'EV2'] as const) {
          for (const b of t.crew[m].blocks) {
            if (b.type !== 'swap') continue;
            const ok = ATTACH.has(b.swapNode!) || anchorsAt(t, b.start).has(b.swapNode!);
            expect(ok, `${m} swaps at ${b.swapNode} at ${b.start}`).toBe(true);
          }
        }
      }),
      { numRuns: 150 },
    );
  });

  it('a route taken with portable anchors installed never has more swaps than the same request without them (fewest swaps)', () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        // the real engine, with each request the day makes recorded
        const asked: DayRouteRequest[] = [];
        const recording: DayRouteFn = (request) => {
          asked.push(request);
          return route(request);
        };
        computeTimeline({ ...plan, routeMode: 'fewest-swaps' }, station, recording);
        for (const request of asked) {
          if (request.extraAttach.length === 0 || !ATTACH.has(request.startAnchor)) continue;
          const withAnchors = route(request);
          const without = route({ ...request, extraAttach: [] });
          if (without.feasible) {
            expect(withAnchors.feasible).toBe(true);
            if (withAnchors.feasible) expect(withAnchors.swapCount).toBeLessThanOrEqual(without.swapCount);
          }
        }
      }),
      { numRuns: 100 },
    );
  });

  it('each lane is contiguous from 0, and a task for both starts its work at the same moment in both lanes', () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const t = computeTimeline(plan, station, route);
        for (const m of ['EV1', 'EV2'] as const) {
          const blocks = t.crew[m].blocks;
          let at = 0;
          for (const b of blocks) {
            expect(b.start).toBeCloseTo(at, 9);
            expect(b.end).toBeGreaterThanOrEqual(b.start);
            at = b.end;
          }
          expect(t.crew[m].totalSeconds).toBeCloseTo(at, 9);
        }
        plan.tasks.forEach((task, i) => {
          if (task.crew !== 'both') return;
          const starts = (['EV1', 'EV2'] as const).map(
            (m) => t.crew[m].blocks.find((b) => b.type === 'work' && b.taskIndex === i)!.start,
          );
          expect(starts[0]).toBe(starts[1]);
        });
      }),
      { numRuns: 150 },
    );
  });
});

describe('the timeline on the wire', () => {
  it('gives back every route leg by leg (ends, kind, start along the route), to the millimetre and the hundredth second, and every block exactly', () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const t = computeTimeline(plan, station, route);
        const wire = toWire(t);
        // every translate and swap block travels as its route's one block
        for (const m of ['EV1', 'EV2'] as const) {
          expect(wire.crew[m].blocks.filter((b) => b.type === 'translate' || b.type === 'swap')).toEqual([]);
        }
        const back = fromWire(JSON.parse(JSON.stringify(wire)) as WireTimeline);
        expect(back.routes.length).toBe(t.routes.length);
        back.routes.forEach((r, i) => {
          const legs = t.routes[i].legs;
          expect(r.legs.length).toBe(legs.length);
          r.legs.forEach((l, k) => {
            expect([l.from, l.to, l.kind]).toEqual([legs[k].from, legs[k].to, legs[k].kind]);
            expect(Math.abs(l.lengthM - legs[k].lengthM)).toBeLessThanOrEqual(5e-4 + 1e-12);
            expect(Math.abs(l.seconds - legs[k].seconds)).toBeLessThanOrEqual(5e-3 + 1e-12);
            expect(Math.abs(l.startM - legs[k].startM)).toBeLessThanOrEqual(5e-4 * (k + 1) + 1e-9);
          });
        });
        expect({ ...back, routes: [] }).toEqual({ ...t, routes: [] });
      }),
      { numRuns: 50 },
    );
  });

  it('the day placed task by task, copied and extended at any point, is the day computed on the whole order', () => {
    const withLinks = fc
      .tuple(
        planArb,
        fc.array(fc.tuple(fc.nat(20), fc.nat(20)), { maxLength: 4 }),
        fc.array(fc.boolean(), { minLength: 8, maxLength: 8 }),
        fc.array(fc.nat(1000), { minLength: 8, maxLength: 8 }),
        fc.nat(8),
      )
      .map(([plan, links, eclipse, keys, branchAt]) => {
        const n = plan.tasks.length;
        const tasks = plan.tasks.map((t, i) => ({
          ...t,
          id: i + 1,
          eclipseOnly: eclipse[i],
          // any links, also to tasks later in the order: the day warns and leaves them out
          after: links.filter(([a]) => n > 0 && a % n === i).map(([, b]) => (b % n) + 1),
        }));
        // a random order of the tasks
        const order = tasks.map((_, i) => i).sort((a, b) => keys[a] - keys[b] || a - b);
        return { plan: { ...plan, tasks }, order, branchAt: Math.min(branchAt, n) };
      });
    const sorted = (t: Timeline) => ({
      ...t,
      // placed task by task, a link to a task not placed yet cannot name its place in the order
      warnings: t.warnings
        .map((w) => JSON.stringify(w.code === 'after-out-of-order' ? { ...w, message: '' } : w))
        .sort(),
      reach: t.reach.map((r) => JSON.stringify(r)).sort(),
    });
    fc.assert(
      fc.property(withLinks, ({ plan, order, branchAt }) => {
        const whole = computeTimeline({ ...plan, tasks: order.map((i) => plan.tasks[i]) }, station, route);
        const day = placeDay(plan, station, route);
        order.slice(0, branchAt).forEach((i) => day.place(i));
        // a copy taken part way and extended to the end leaves the original as it was
        const copy = day.copy();
        order.slice(branchAt).forEach((i) => copy.place(i));
        order.slice(branchAt).forEach((i) => day.place(i));
        expect(sorted(copy.finish())).toEqual(sorted(whole));
        expect(sorted(day.finish())).toEqual(sorted(whole));
      }),
      { numRuns: 150 },
    );
  });
});
