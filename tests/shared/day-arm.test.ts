import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computeTimeline } from '@shared/compute/day/timeline';
import type { DayPlan, Timeline } from '@shared/compute/day/types';
import type { CrewMember } from '@shared/schemas/plan';
import type { StationDocumentInput } from '@shared/schemas/station';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask, lineStationDocument } from '../factories/day';
import { ARM_1, armLineDocument, restraintOnArm } from '../factories/day-arm';

/** The arm line station (see the factory), and a second, short arm ARM-2 at A3 (24, 0, 0), reach 6 m. */
const ARM = ARM_1;
const ARM2 = { key: 'ARM-2', baseNode: K.a3, reachM: 6, tipSpeedMps: 0.1, settleSeconds: 30 };
function armStation(over: Partial<StationDocumentInput> = {}) {
  return dayEngine(armLineDocument({ arms: [ARM, ARM2], ...over }));
}
const plan = (over: Partial<DayPlan>) =>
  buildDayPlan({ egressSeconds: 0, ingressSeconds: 0, manifest: [restraintOnArm], ...over });
const onArm = (ingress: string, more: object = {}) => ({ arm: { key: 'ARM-1', ingress, ...more } });
const run = (p: DayPlan, engine = armStation()) => computeTimeline(p, engine.station, engine.route);
const codes = (t: Timeline) => t.warnings.map((w) => w.code);
const span = (t: Timeline, m: CrewMember) => t.crew[m].blocks.map((b) => [b.type, b.start, b.end]);

describe('an arm session (worked by hand)', () => {
  it('translate to the ingress, get on, the arm moves, work, back to egress, get off, clip back', () => {
    const t = run(plan({ tasks: [dayTask('Off the truss', 'WX', 'EV1', 600, onArm(K.a1))] }));
    expect(t.warnings).toEqual([]);
    // AL→A1 8 m at 0.1 m/s = 80 s; on 120 s; A1→WX 10 m at 0.1 m/s = 100 s + 30 s settle; work 600 s;
    // back the same 130 s; off 120 s; A1→AL 80 s
    expect(span(t, 'EV1')).toEqual([
      ['translate', 0, 80],
      ['restraint-in', 80, 200],
      ['arm-ride', 200, 330],
      ['work', 330, 930],
      ['arm-ride', 930, 1060],
      ['restraint-out', 1060, 1180],
      ['translate', 1180, 1260],
    ]);
    const blocks = t.crew.EV1.blocks;
    expect(blocks[1].tetherAtStart).toEqual({ anchor: K.airlock, paidOutM: 8 });
    expect(blocks[1].tetherAtEnd).toEqual({ anchor: 'ARM-1', paidOutM: 0 });
    expect(blocks[5].tetherAtEnd).toEqual({ anchor: K.a1, paidOutM: 0 });
    expect(blocks[6].tetherAtStart).toEqual({ anchor: K.a1, paidOutM: 0 });
    expect(t.arms).toHaveLength(1);
    const [lane] = t.arms;
    expect(lane.key).toBe('ARM-1');
    expect(lane.startPoint).toEqual([8, 0, 0]);
    expect(lane.blocks.map((b) => [b.from, b.to, b.start, b.travelEnd, b.end, b.rider])).toEqual([
      [K.a1, 'WX', 200, 300, 330, 'EV1'],
      ['WX', K.a1, 930, 1030, 1060, 'EV1'],
    ]);
    expect(lane.sessions).toEqual([
      { rider: 'EV1', start: 80, end: 1180, ingress: K.a1, egress: K.a1, taskIndexes: [0] },
    ]);
    expect(t.endSeconds).toBe(1260);
  });

  it('consecutive arm tasks are one session; the tip goes straight from worksite to worksite', () => {
    const t = run(
      plan({
        tasks: [
          dayTask('One', 'WX', 'EV1', 600, onArm(K.a1)),
          dayTask('Two', K.w1, 'EV1', 300, onArm(K.a1, { egress: K.a3 })),
        ],
      }),
    );
    expect(t.warnings).toEqual([]);
    // WX (8,6,8) → W1 (12,0,0): √(16+36+64) = √116 m; W1 → A3 (24,0,0): 12 m = 120 + 30 s
    const moves = t.arms[0].blocks.map((b) => [b.from, b.to, b.end - b.start]);
    expect(moves[1][2]).toBeCloseTo(Math.sqrt(116) / 0.1 + 30, 9);
    expect(moves.map((m) => m.slice(0, 2))).toEqual([
      [K.a1, 'WX'],
      ['WX', K.w1],
      [K.w1, K.a3],
    ]);
    expect(moves[2][2]).toBe(150);
    expect(t.arms[0].sessions).toHaveLength(1);
    expect(t.crew.EV1.blocks.filter((b) => b.type === 'restraint-in')).toHaveLength(1);
  });

  it('warns when a point is out of the shell, the tip path crosses a keep-out, egress is no attach point', () => {
    const short = armStation({
      nodes: [...lineStationDocument().nodes, { key: 'WX', kind: 'worksite', position: [8, 6, 8] }],
      arms: [{ ...ARM, reachM: 12 }],
      hazards: [{ key: 'RAD', kind: 'keep-out', shape: 'sphere', center: [8, 3, 4], radiusM: 1 }],
    });
    const t = run(
      plan({ tasks: [dayTask('Off the truss', 'WX', 'EV1', 600, onArm(K.a1, { egress: K.w1 }))] }),
      short,
    );
    expect(codes(t).sort()).toEqual(['arm-egress-not-attach', 'arm-out-of-reach', 'arm-path-keep-out']);
    expect(t.warnings.find((w) => w.code === 'arm-out-of-reach')).toMatchObject({
      taskIndex: 0,
      crew: 'EV1',
      arm: 'ARM-1',
    });
    expect(t.warnings.find((w) => w.code === 'arm-out-of-reach')!.message).toContain(
      '0.81 m beyond its 12 m reach',
    );
  });

  it('needs the foot restraint installed on the arm when the rider gets on', () => {
    const t = run(plan({ manifest: [], tasks: [dayTask('Off the truss', 'WX', 'EV1', 600, onArm(K.a1))] }));
    expect(codes(t)).toEqual(['restraint-missing']);
    const installed = run(
      plan({
        manifest: [
          {
            key: 'afr',
            name: 'Arm foot restraint',
            kind: 'foot-restraint',
            carriedBy: 'EV1',
            leaveOutside: true,
          },
        ],
        tasks: [
          dayTask('Fit the restraint', K.w1, 'EV1', 300, {
            actions: [{ do: 'install', item: 'afr', at: 'ARM-1' }],
          }),
          dayTask('Off the truss', 'WX', 'EV1', 600, onArm(K.a1)),
        ],
      }),
    );
    expect(installed.warnings).toEqual([]);
  });

  it('one rider at a time: the later session waits for the arm, as a wait with its reason', () => {
    const t = run(
      plan({
        tasks: [
          dayTask('EV1 on the arm', 'WX', 'EV1', 600, onArm(K.a1)),
          dayTask('EV2 on the arm', 'WX', 'EV2', 300, onArm(K.a1)),
        ],
      }),
    );
    expect(codes(t)).toEqual(['arm-busy']);
    const wait = t.crew.EV2.blocks.find((b) => b.type === 'wait')!;
    expect([wait.start, wait.end]).toEqual([80, 1180]);
    expect(wait.label).toContain('EV1 rides it');
    const sessions = t.arms[0].sessions.map((s) => [s.rider, s.start, s.end]);
    expect(sessions[0]).toEqual(['EV1', 80, 1180]);
    expect(sessions[1][1]).toBe(1180);
  });

  it('a task for both hands a large item from the arm rider to the partner', () => {
    const t = run(
      plan({
        manifest: [
          restraintOnArm,
          { key: 'pump', name: 'Pump module', kind: 'large-item', carriedBy: 'EV1' },
        ],
        tasks: [
          dayTask('Hand the pump over', K.w1, 'both', 300, {
            ...onArm(K.a1, { rider: 'EV1' }),
            actions: [{ do: 'hand-over', item: 'pump', by: 'EV1' }],
          }),
        ],
      }),
    );
    expect(t.warnings).toEqual([]);
    const pump = t.equipment.find((e) => e.item === 'pump')!;
    expect(pump.states.map((s) => s.where)).toEqual([
      { kind: 'carried', crew: 'EV1' },
      { kind: 'carried', crew: 'EV2' },
      { kind: 'airlock' },
    ]);
    expect(t.crew.EV1.blocks.some((b) => b.type === 'arm-ride')).toBe(true);
    expect(t.crew.EV2.blocks.some((b) => b.type === 'arm-ride')).toBe(false);
  });
});

describe('arm sessions, whatever the plan (fast-check)', () => {
  const engine = armStation();
  const SITES = ['WX', K.w1, K.w2, K.w3];
  const INGRESS = [K.a1, K.a2, K.a3, K.w1];
  const planArb = fc
    .array(
      fc.record({
        site: fc.constantFrom(...SITES),
        crew: fc.constantFrom('EV1' as const, 'EV2' as const, 'both' as const),
        duration: fc.integer({ min: 60, max: 1200 }),
        arm: fc.option(
          fc.record({
            key: fc.constantFrom('ARM-1', 'ARM-2'),
            ingress: fc.constantFrom(...INGRESS),
            egress: fc.option(fc.constantFrom(...INGRESS), { nil: undefined }),
            rider: fc.constantFrom('EV1' as const, 'EV2' as const),
          }),
          { nil: undefined },
        ),
      }),
      { maxLength: 8 },
    )
    .map((tasks) =>
      plan({
        manifest: [restraintOnArm, { ...restraintOnArm, key: 'afr2', installedAt: 'ARM-2' }],
        tasks: tasks.map((x) =>
          dayTask(`T ${x.site}`, x.site, x.crew, x.duration, {
            ...(x.arm
              ? {
                  arm: {
                    key: x.arm.key,
                    ingress: x.arm.ingress,
                    ...(x.arm.egress ? { egress: x.arm.egress } : {}),
                    ...(x.crew === 'both' ? { rider: x.arm.rider } : {}),
                  },
                }
              : {}),
          }),
        ),
      }),
    );
  const overlap = (a: { start: number; end: number }, b: { start: number; end: number }) =>
    a.start < b.end - 1e-9 && b.start < a.end - 1e-9;

  it('an arm never carries two sessions at once, and its moves never overlap', () => {
    fc.assert(
      fc.property(planArb, (p) => {
        const t = run(p, engine);
        for (const lane of t.arms) {
          for (let i = 0; i < lane.sessions.length; i++)
            for (let j = i + 1; j < lane.sessions.length; j++)
              expect(overlap(lane.sessions[i], lane.sessions[j])).toBe(false);
          for (let i = 1; i < lane.blocks.length; i++)
            expect(lane.blocks[i].start).toBeGreaterThanOrEqual(lane.blocks[i - 1].end - 1e-9);
          for (const b of lane.blocks) {
            if (!b.rider) continue;
            // a move with a rider lies within that rider's session on this arm
            expect(
              lane.sessions.some((s) => s.rider === b.rider && s.start <= b.start && b.end <= s.end + 1e-9),
            ).toBe(true);
          }
        }
      }),
      { numRuns: 150 },
    );
  });

  it('a rider is on at most one arm at a time, and the crew lanes stay whole', () => {
    fc.assert(
      fc.property(planArb, (p) => {
        const t = run(p, engine);
        for (const m of ['EV1', 'EV2'] as const) {
          const mine = t.arms.flatMap((l) => l.sessions.filter((s) => s.rider === m));
          for (let i = 0; i < mine.length; i++)
            for (let j = i + 1; j < mine.length; j++) expect(overlap(mine[i], mine[j])).toBe(false);
          const blocks = t.crew[m].blocks;
          for (let i = 1; i < blocks.length; i++) expect(blocks[i].start).toBeCloseTo(blocks[i - 1].end, 9);
        }
      }),
      { numRuns: 150 },
    );
  });
});
