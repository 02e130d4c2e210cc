import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computeTimeline } from '@shared/compute/day/timeline';
import { planFootprint } from '@shared/compute/plan-touches';
import { notesOnDay, notesOnSteps, type NodeNote } from '@shared/compute/station-notes';
import { planWalkthrough } from '@shared/compute/walkthrough';
import type { Vec3 } from '@shared/schemas/station';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask, lineStationDocument } from '../factories/day';

const doc = lineStationDocument();
const { station, route } = dayEngine(doc);
const positions = new Map(doc.nodes.map((n) => [n.key, n.position as Vec3]));
const position = (k: string) => positions.get(k)!;
const note = (id: number, nodeKey: string): NodeNote => ({ id, nodeKey, title: `note ${id}`, body: '' });

describe('station notes on a plan’s day (the line station, worked by hand)', () => {
  // EV1 works at W3 (out past W1, A2, S2, A3), EV2 at W1 from the airlock
  const plan = buildDayPlan({
    tasks: [dayTask('far panel', K.w3, 'EV1', 600), dayTask('near panel', K.w1, 'EV2', 300)],
  });
  const day = computeTimeline(plan, station, route);
  const notes = [note(1, K.w1), note(2, K.w2), note(3, K.a3), note(4, K.airlock)];
  const listed = notesOnDay(notes, day, plan.tasks, K.airlock);

  it('lists a note where the day passes through or uses its node, never one it does not touch', () => {
    expect(listed.map((n) => n.id).sort()).toEqual([1, 3, 4]);
  });

  it('names each block at the node: the airlock at egress, W1 on EV1’s way out and EV2’s work', () => {
    const airlock = listed.find((n) => n.id === 4)!;
    expect(airlock.places[0]).toMatchObject({ crew: 'EV1', type: 'egress', start: 0, use: 'airlock' });
    expect(airlock.places.filter((p) => p.type === 'egress').map((p) => p.crew)).toEqual(['EV1', 'EV2']);

    const w1 = listed.find((n) => n.id === 1)!;
    expect(w1.places).toContainEqual(
      expect.objectContaining({ crew: 'EV1', type: 'translate', taskIndex: 0, use: 'route' }),
    );
    expect(w1.places).toContainEqual(
      expect.objectContaining({ crew: 'EV2', type: 'work', taskIndex: 1, use: 'worksite' }),
    );
    // A3 is only on EV1's way to W3 and back
    const a3 = listed.find((n) => n.id === 3)!;
    expect(new Set(a3.places.map((p) => p.crew))).toEqual(new Set(['EV1']));
  });

  it('orders notes by when the day first meets them, and each note’s places in time', () => {
    expect(listed[0].id).toBe(4); // the airlock, at egress
    for (const n of listed)
      for (let i = 1; i < n.places.length; i++)
        expect(n.places[i].start).toBeGreaterThanOrEqual(n.places[i - 1].start);
    const firsts = listed.map((n) => n.places[0].start);
    expect([...firsts].sort((a, b) => a - b)).toEqual(firsts);
  });

  it('each place points at a block of that crew member with its times', () => {
    for (const n of listed)
      for (const p of n.places) {
        const b = day.crew[p.crew].blocks[p.block];
        expect([b.type, b.start, b.end]).toEqual([p.type, p.start, p.end]);
      }
  });

  it('a walkthrough of the day shows the same notes, on the steps at the node', () => {
    const walk = planWalkthrough(day, plan.tasks, K.airlock, position);
    const steps = [...walk.crews.EV1.steps, ...walk.crews.EV2.steps];
    const onSteps = notesOnSteps(notes, steps);
    expect(new Set(onSteps.map((n) => n.id))).toEqual(new Set([1, 3, 4]));
    const ev2Work = walk.crews.EV2.steps.find((s) => s.type === 'work')!;
    expect(onSteps.filter((n) => n.steps.includes(ev2Work.id)).map((n) => n.id)).toEqual([1]);
    // EV1's translate out to W3 passes W1 and A3 on the way
    const ev1Out = walk.crews.EV1.steps.find((s) => s.type === 'translate' && s.via?.includes(K.w1));
    expect(ev1Out).toBeDefined();
    expect(onSteps.find((n) => n.id === 1)!.steps).toContain(ev1Out!.id);
    const ev1Steps = new Map(walk.crews.EV1.steps.map((s) => [s.id, s]));
    for (const id of onSteps.find((n) => n.id === 3)!.steps) {
      const s = ev1Steps.get(id)!;
      expect([s.fromKey, ...(s.via ?? []), s.nodeKey, s.clipKey, s.releaseKey]).toContain(K.a3);
    }
  });
});

// Random plans: a note is on the day exactly when its node is in the plan's footprint (the nodes its
// routes, worksites and sockets use, the same set change control reads), and the walkthrough agrees.
describe('station notes (fast-check, random plans on the line station)', () => {
  const sites = [K.w1, K.w2, K.w3];
  const planArb = fc
    .record({
      tether: fc.constantFrom(12, 20),
      mode: fc.constantFrom('fastest' as const, 'fewest-swaps' as const, 'balanced' as const),
      tasks: fc.array(
        fc.record({
          site: fc.constantFrom(...sites),
          crew: fc.constantFrom('EV1' as const, 'EV2' as const, 'both' as const),
          socket: fc.boolean(),
        }),
        { minLength: 1, maxLength: 5 },
      ),
    })
    .map(({ tether, mode, tasks }) =>
      buildDayPlan({
        crew: { EV1: { name: 'A', tetherLengthM: tether }, EV2: { name: 'B', tetherLengthM: tether } },
        routeMode: mode,
        tasks: tasks.map((t, i) =>
          dayTask(
            `task ${i + 1}`,
            t.site,
            t.crew,
            300,
            t.socket && t.site === K.w2 && t.crew !== 'both' ? { socket: K.s2 } : {},
          ),
        ),
      }),
    );
  const everyNode = doc.nodes.map((n, i) => note(i + 1, n.key));

  it('lists the notes at the footprint’s nodes, and the walkthrough’s steps name the same', () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const day = computeTimeline(plan, station, route);
        const listed = notesOnDay(everyNode, day, plan.tasks, K.airlock);
        const footprint = planFootprint({ ...plan, manifest: [] }, day).nodes;
        expect(new Set(listed.map((n) => n.nodeKey))).toEqual(new Set([...footprint.keys(), K.airlock]));
        const walk = planWalkthrough(day, plan.tasks, K.airlock, position);
        const onSteps = notesOnSteps(everyNode, [...walk.crews.EV1.steps, ...walk.crews.EV2.steps]);
        expect(new Set(onSteps.map((n) => n.id))).toEqual(new Set(listed.map((n) => n.id)));
      }),
      { numRuns: 60 },
    );
  });
});
