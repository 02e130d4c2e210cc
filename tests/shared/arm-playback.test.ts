import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { armTipAtTime } from '@shared/compute/arm';
import { computeTimeline } from '@shared/compute/day/timeline';
import type { DayPlan } from '@shared/compute/day/types';
import { planPlaybackOf } from '@shared/compute/plan-playback';
import { sampleTrack } from '@shared/compute/walkthrough';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask } from '../factories/day';
import { armLineDocument, restraintOnArm } from '../factories/day-arm';

/** The arm line station (see the factory): A1 (8, 0, 0) → WX (8, 6, 8) is 10 m, 100 s of travel + 30 s settle. */
const engine = dayEngine(armLineDocument());
const plan = (over: Partial<DayPlan>) =>
  buildDayPlan({ egressSeconds: 0, ingressSeconds: 0, manifest: [restraintOnArm], ...over });
const run = (p: DayPlan) => computeTimeline(p, engine.station, engine.route);
const nodes = armLineDocument().nodes;

describe('where the arm tip is through the day (worked by hand)', () => {
  const t = run(
    plan({ tasks: [dayTask('Off the truss', 'WX', 'EV1', 600, { arm: { key: 'ARM-1', ingress: K.a1 } })] }),
  );
  const [lane] = t.arms;

  it('at the first ingress before any move, half-way at half the travel, still while settling', () => {
    // moves: A1→WX over 200–300 s (settled 330 s), WX→A1 over 930–1030 s (settled 1060 s)
    expect(armTipAtTime(lane, 0)).toEqual([8, 0, 0]);
    expect(armTipAtTime(lane, 200)).toEqual([8, 0, 0]);
    expect(armTipAtTime(lane, 250)).toEqual([8, 3, 4]);
    expect(armTipAtTime(lane, 300)).toEqual([8, 6, 8]);
    expect(armTipAtTime(lane, 315)).toEqual([8, 6, 8]);
    expect(armTipAtTime(lane, 600)).toEqual([8, 6, 8]);
    expect(armTipAtTime(lane, 980)).toEqual([8, 3, 4]);
    expect(armTipAtTime(lane, 5000)).toEqual([8, 0, 0]);
  });

  it('an arm the day never moves has no tip to draw', () => {
    expect(armTipAtTime({ startPoint: null, blocks: [] }, 100)).toBeNull();
  });

  it('the lane carries the shell, to draw it', () => {
    expect([lane.reachM, lane.minReachM]).toEqual([20, 1]);
  });

  it('in playback the rider rides on the tip, tethered to the arm, and clips back at the egress', () => {
    const p = planPlaybackOf(t, { tasks: [], crew: crewOf() }, K.airlock, nodes);
    expect(p.arms?.map((a) => a.key)).toEqual(['ARM-1']);
    const track = p.crews.EV1;
    for (const at of [200, 250, 299, 300, 315, 330, 600, 930, 980, 1060]) {
      const s = sampleTrack(track, at).position;
      const tip = armTipAtTime(lane, at)!;
      for (let k = 0; k < 3; k++) expect(s[k]).toBeCloseTo(tip[k], 9);
    }
    expect(sampleTrack(track, 600).anchorKey).toBe('ARM-1');
    expect(sampleTrack(track, 1200).anchorKey).toBe(K.a1);
    const ride = track.steps.find((s) => s.type === 'arm-ride')!;
    expect([ride.fromKey, ride.nodeKey]).toEqual([K.a1, 'WX']);
  });
});

function crewOf() {
  return {
    EV1: { name: 'A', tetherLengthM: 25 },
    EV2: { name: 'B', tetherLengthM: 25 },
  } as Parameters<typeof planPlaybackOf>[1]['crew'];
}

describe('the rider is where the arm tip is, whatever the plan (fast-check)', () => {
  const SITES = ['WX', K.w1, K.w2, K.w3];
  const INGRESS = [K.a1, K.a2, K.a3];
  const task = fc.record({
    site: fc.constantFrom(...SITES),
    crew: fc.constantFrom('EV1' as const, 'EV2' as const),
    ingress: fc.constantFrom(...INGRESS),
    onArm: fc.boolean(),
    minutes: fc.integer({ min: 1, max: 30 }),
  });
  it('during every ride of every session, sampled at its start, middle and end', () => {
    fc.assert(
      fc.property(fc.array(task, { minLength: 1, maxLength: 6 }), (spec) => {
        const t = run(
          plan({
            tasks: spec.map((s, i) =>
              dayTask(
                `T${i}`,
                s.site,
                s.crew,
                s.minutes * 60,
                s.onArm ? { arm: { key: 'ARM-1', ingress: s.ingress } } : {},
              ),
            ),
          }),
        );
        const p = planPlaybackOf(t, { tasks: [], crew: crewOf() }, K.airlock, nodes);
        const lane = t.arms[0];
        for (const m of ['EV1', 'EV2'] as const) {
          for (const b of t.crew[m].blocks.filter((x) => x.type === 'arm-ride')) {
            for (const at of [b.start, (b.start + b.end) / 2, b.end]) {
              const rider = sampleTrack(p.crews[m], at).position;
              const tip = armTipAtTime(lane, at)!;
              for (let k = 0; k < 3; k++) expect(rider[k]).toBeCloseTo(tip[k], 6);
            }
          }
        }
      }),
      { numRuns: 60 },
    );
  });
});
