import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { RouteFeasible, RouteLeg, RouteResult, TetherSwap } from '@shared/schemas/route';
import type { CrewMember } from '@shared/schemas/plan';
import {
  computeTimeline,
  type RouteFn,
  type Timeline,
  type TimelinePlan,
  type TimelineTask,
} from '@shared/compute/timeline';
import { orbitSummary } from '@shared/compute/orbit';
import { CreatePlanInputSchema } from '@shared/schemas/plan';

interface LineNode {
  key: string;
  x: number;
  /** an anchor or the airlock: a tether may be clipped here */
  attach: boolean;
  /** a caution hazard volume around this node */
  caution?: string;
}

const SPEED = 0.1; // m/s, planning default from memory (station settings default)
const SWAP_S = 90;
const CARRY = 1.5;

/**
 * A correct simple route engine for a station that is one straight handrail: the walk is the run
 * of nodes between the two ends, and tether swaps are placed greedily (swap at the last attach point
 * before the paid-out length would pass the tether), which is optimal for a fixed walk.
 */
function lineRoute(nodes: LineNode[]): RouteFn {
  const line = [...nodes].sort((a, b) => a.x - b.x);
  const at = new Map(line.map((n, i) => [n.key, i]));
  return (from, to, { mode, tetherLengthM, carrying }): RouteResult => {
    const a = at.get(from);
    const b = at.get(to);
    if (a === undefined || b === undefined) throw new Error(`asked to route an unknown key ${from} → ${to}`);
    if (a === b)
      return { feasible: false, mode, reason: 'start and end are the same node', reasonCode: 'same-node' };
    const step = a < b ? 1 : -1;
    const walk: LineNode[] = [];
    for (let i = a; i !== b + step; i += step) walk.push(line[i]);
    const legs: RouteLeg[] = [];
    const swaps: TetherSwap[] = [];
    let along = 0;
    let clip = 0;
    let lastAttach: { node: string; atM: number } | null = null;
    let maxPaidOutM = 0;
    for (let k = 1; k < walk.length; k++) {
      const lengthM = Math.abs(walk[k].x - walk[k - 1].x);
      legs.push({
        from: walk[k - 1].key,
        to: walk[k].key,
        kind: 'handrail',
        lengthM,
        seconds: (lengthM / SPEED) * (carrying ? CARRY : 1),
        startM: along,
      });
      along += lengthM;
      if (along - clip > tetherLengthM) {
        if (!lastAttach || lastAttach.atM <= clip || along - lastAttach.atM > tetherLengthM) {
          return {
            feasible: false,
            mode,
            reason: `anchor gap longer than the ${tetherLengthM} m tether`,
            reasonCode: 'anchor-gap',
          };
        }
        swaps.push({ node: lastAttach.node, atM: lastAttach.atM, paidOutM: lastAttach.atM - clip });
        clip = lastAttach.atM;
      }
      maxPaidOutM = Math.max(maxPaidOutM, along - clip);
      if (walk[k].attach) lastAttach = { node: walk[k].key, atM: along };
    }
    const travelSeconds = legs.reduce((s, l) => s + l.seconds, 0);
    const cautions = [...new Set(walk.flatMap((n) => (n.caution ? [n.caution] : [])))];
    const swapSeconds = swaps.length * SWAP_S;
    const route: RouteFeasible = {
      feasible: true,
      mode,
      nodes: walk.map((n) => n.key),
      legs,
      lengthM: along,
      travelSeconds,
      swapCount: swaps.length,
      swaps,
      swapSeconds,
      totalSeconds: travelSeconds + swapSeconds,
      tetherLengthM,
      maxPaidOutM,
      warnings: [
        // as the engine says it when a route leaves a node that is not an attach point
        ...(line[a].attach
          ? []
          : [
              `${from} is not a tether attach point: the route assumes the tether is clipped where the crew member starts.`,
            ]),
        ...cautions.map((h) => `The route passes through caution volume ${h}.`),
      ],
      cautionHazards: cautions,
      ...(line[a].attach ? {} : { startNotAttachable: true }),
    };
    return route;
  };
}

// airlock A, anchors J1–J3, worksites W1 and W2, on one 35 m handrail
const STATION: LineNode[] = [
  { key: 'A', x: 0, attach: true },
  { key: 'J1', x: 10, attach: true },
  { key: 'J2', x: 20, attach: true },
  { key: 'W1', x: 25, attach: false },
  { key: 'J3', x: 30, attach: true },
  { key: 'W2', x: 35, attach: false },
];
const ORBIT = { altitudeKm: 400, betaDeg: 0 };

function task(over: Partial<TimelineTask> & Pick<TimelineTask, 'worksite' | 'crew'>): TimelineTask {
  return {
    title: `work at ${over.worksite}`,
    durationSeconds: 600,
    eclipseOnly: false,
    carrying: false,
    ...over,
  };
}

function plan(tasks: TimelineTask[], over: Partial<TimelinePlan> = {}): TimelinePlan {
  return {
    crew: { EV1: { name: 'Ada', tetherLengthM: 15 }, EV2: { name: 'Ben', tetherLengthM: 15 } },
    routeMode: 'fewest-swaps',
    allowRide: false,
    orbitPhaseAtStartDeg: 0,
    timeLimitSeconds: 23400,
    egressSeconds: 1800,
    ingressSeconds: 1800,
    tasks,
    ...over,
  };
}

/** the warnings other than the plan-level note about routes leaving worksites (tested on its own) */
const notesAside = (t: Timeline) => t.warnings.filter((w) => w.code !== 'route-note');

const spans = (blocks: { type: string; start: number; end: number }[]) =>
  blocks.map((b) => [b.type, b.start, b.end]);

describe('computeTimeline, hand-worked example (tether 15 m, 0.1 m/s, 90 s swaps)', () => {
  const tasks = [
    task({ worksite: 'W1', crew: 'EV1', durationSeconds: 600 }),
    task({ worksite: 'W2', crew: 'both', durationSeconds: 1200, id: 7 }),
  ];
  const tl = computeTimeline({ plan: plan(tasks), airlockKey: 'A', orbit: ORBIT }, lineRoute(STATION));

  it('EV1: egress, translate with a swap at J1, work, translate to the shared task, work, back with two swaps, ingress', () => {
    // A→W1: 20 m from A passes 15 m, so swap at J1 (10 m paid out); 25 m − 10 m = 15 m reaches W1
    expect(spans(tl.crew.EV1.blocks)).toEqual([
      ['egress', 0, 1800],
      ['translate', 1800, 1900],
      ['swap', 1900, 1990],
      ['translate', 1990, 2140],
      ['work', 2140, 2740],
      ['translate', 2740, 2840],
      ['work', 2840, 4040],
      ['translate', 4040, 4190],
      ['swap', 4190, 4280],
      ['translate', 4280, 4380],
      ['swap', 4380, 4470],
      ['translate', 4470, 4570],
      ['ingress', 4570, 6370],
    ]);
    expect(tl.crew.EV1.blocks[2].swapNode).toBe('J1');
    expect(tl.crew.EV1.blocks[3]).toMatchObject({
      from: 'J1',
      to: 'W1',
      legStart: 1,
      legEnd: 3,
      taskIndex: 0,
    });
    expect(tl.crew.EV1.swapCount).toBe(3);
    expect(tl.crew.EV1.workSeconds).toBe(1800);
    expect(tl.crew.EV1.idleSeconds).toBe(0);
  });

  it('EV2: swaps at J1 and J2 on the way out, then waits 510 s for EV1 before the shared task', () => {
    expect(spans(tl.crew.EV2.blocks).slice(0, 8)).toEqual([
      ['egress', 0, 1800],
      ['translate', 1800, 1900],
      ['swap', 1900, 1990],
      ['translate', 1990, 2090],
      ['swap', 2090, 2180],
      ['translate', 2180, 2330],
      ['wait', 2330, 2840],
      ['work', 2840, 4040],
    ]);
    expect(tl.crew.EV2.blocks[7]).toMatchObject({ taskIndex: 1, taskId: 7 });
    expect(tl.crew.EV2.idleSeconds).toBe(510);
    expect(tl.crew.EV2.swapCount).toBe(4);
    expect(tl.crew.EV2.translateSeconds).toBe(350 + 350);
  });

  it('ends at 6370 s with 17030 s of margin to the 6 h 30 min limit and no warnings', () => {
    expect(tl.endSeconds).toBe(6370);
    expect(tl.marginSeconds).toBe(23400 - 6370);
    expect(tl.fitsTimeLimit).toBe(true);
    expect(notesAside(tl)).toEqual([]);
  });

  it('warns when the day runs past the time limit', () => {
    const over = computeTimeline(
      { plan: plan(tasks, { timeLimitSeconds: 6000 }), airlockKey: 'A', orbit: ORBIT },
      lineRoute(STATION),
    );
    expect(over.fitsTimeLimit).toBe(false);
    expect(over.marginSeconds).toBe(-370);
    expect(notesAside(over).map((w) => w.code)).toEqual(['over-time-limit']);
    expect(notesAside(over)[0].message).toContain('1:46');
  });

  it('carrying slows only the translation to that task, by the carry factor', () => {
    const carried = computeTimeline(
      { plan: plan([task({ worksite: 'J1', crew: 'EV1', carrying: true })]), airlockKey: 'A', orbit: ORBIT },
      lineRoute(STATION),
    );
    expect(spans(carried.crew.EV1.blocks).slice(0, 3)).toEqual([
      ['egress', 0, 1800],
      ['translate', 1800, 1950],
      ['work', 1950, 2550],
    ]);
    expect(carried.crew.EV1.blocks[3]).toMatchObject({ type: 'translate', start: 2550, end: 2650 });
  });
});

describe('computeTimeline warnings', () => {
  it('a route through a caution volume is listed with the task it leads to', () => {
    const station = STATION.map((n) => (n.key === 'J3' ? { ...n, caution: 'ANT-1' } : n));
    const tl = computeTimeline(
      { plan: plan([task({ worksite: 'W2', crew: 'EV2' })]), airlockKey: 'A', orbit: ORBIT },
      lineRoute(station),
    );
    expect(notesAside(tl).map((w) => [w.code, w.taskIndex, w.crew])).toEqual([
      ['route-caution', 0, 'EV2'],
      ['route-caution', undefined, 'EV2'],
    ]);
    expect(notesAside(tl)[0].message).toContain('ANT-1');
  });

  it('an unreachable worksite: the reason is shown, the crew member stays put and the work is marked', () => {
    const tasks = [task({ worksite: 'W1', crew: 'EV1' }), task({ worksite: 'J1', crew: 'EV1' })];
    const short = plan(tasks, {
      crew: { EV1: { name: 'Ada', tetherLengthM: 8 }, EV2: { name: 'Ben', tetherLengthM: 15 } },
    });
    const tl = computeTimeline({ plan: short, airlockKey: 'A', orbit: ORBIT }, lineRoute(STATION));
    expect(notesAside(tl).map((w) => [w.code, w.taskIndex, w.crew])).toEqual([
      ['route-infeasible', 0, 'EV1'],
      ['route-infeasible', 1, 'EV1'],
    ]);
    expect(notesAside(tl)[0].message).toContain('anchor gap');
    expect(spans(tl.crew.EV1.blocks)).toEqual([
      ['egress', 0, 1800],
      ['work', 1800, 2400],
      ['work', 2400, 3000],
      ['ingress', 3000, 4800],
    ]);
    expect(tl.crew.EV1.blocks.filter((b) => b.type === 'work').every((b) => b.unreached)).toBe(true);
    expect(tl.crew.EV2.blocks.map((b) => b.type)).toEqual(['egress', 'wait', 'ingress']);
  });

  it('an unknown worksite or socket is named and not routed to', () => {
    const keys = new Set(STATION.map((n) => n.key));
    const tasks = [
      task({ worksite: 'PB9-W1', crew: 'EV2' }),
      task({ worksite: 'W1', crew: 'EV2', socket: 'PB9-S1' }),
    ];
    const tl = computeTimeline(
      { plan: plan(tasks), airlockKey: 'A', orbit: ORBIT, hasNode: (k) => keys.has(k) },
      lineRoute(STATION),
    );
    expect(notesAside(tl).map((w) => [w.code, w.taskIndex])).toEqual([
      ['unknown-worksite', 0],
      ['unknown-socket', 1],
    ]);
    expect(notesAside(tl)[0].message).toContain('PB9-W1');
    expect(tl.crew.EV2.blocks[1]).toMatchObject({ type: 'work', unreached: true, start: 1800 });
  });

  it('an eclipse-only task in daylight names the next night window that fits, in h:mm elapsed (400 km, β = 0)', () => {
    // sunrise at EVA start: day until 56.45 min, night 56.45–92.56 min (36.11 min, Sumanth formula)
    const tasks = [
      task({
        worksite: 'W1',
        crew: 'EV1',
        durationSeconds: 1200,
        eclipseOnly: true,
        title: 'Mate power connectors',
      }),
    ];
    const tl = computeTimeline({ plan: plan(tasks), airlockKey: 'A', orbit: ORBIT }, lineRoute(STATION));
    const sunset = orbitSummary(ORBIT).sunlitSeconds;
    expect(notesAside(tl)).toHaveLength(1);
    const w = notesAside(tl)[0];
    expect(w.code).toBe('eclipse-only-outside-night');
    expect(w.taskIndex).toBe(0);
    expect(w.nextWindow?.start).toBeCloseTo(sunset, 6);
    expect(w.nextWindow?.end).toBeCloseTo(sunset + 1200, 6);
    expect(w.message).toContain('Mate power connectors');
    expect(w.message).toContain('0:36–0:56'); // scheduled: 2140–3340 s
    expect(w.message).toContain('0:56–1:33'); // the night window
  });

  it('no eclipse warning when the task lies wholly in a night window', () => {
    const T = orbitSummary(ORBIT).periodSeconds;
    const sunlit = orbitSummary(ORBIT).sunlitSeconds;
    // start the clock so that sunset falls at 2100 s, just before the work starts at 2140 s
    const phase = (((sunlit - 2100) / T) * 360 + 360) % 360;
    const tasks = [task({ worksite: 'W1', crew: 'EV1', durationSeconds: 1200, eclipseOnly: true })];
    const tl = computeTimeline(
      { plan: plan(tasks, { orbitPhaseAtStartDeg: phase }), airlockKey: 'A', orbit: ORBIT },
      lineRoute(STATION),
    );
    expect(notesAside(tl)).toEqual([]);
    expect(tl.nightWindows[0].start).toBeCloseTo(2100, 6);
  });

  it('at a beta angle past β* there is no night, and the warning says so', () => {
    const tasks = [task({ worksite: 'W1', crew: 'EV1', eclipseOnly: true })];
    const tl = computeTimeline(
      { plan: plan(tasks, { betaDegOverride: 75 }), airlockKey: 'A', orbit: ORBIT },
      lineRoute(STATION),
    );
    expect(tl.orbit.betaDeg).toBe(75);
    expect(tl.nightWindows).toEqual([]);
    expect(notesAside(tl)[0].code).toBe('eclipse-only-outside-night');
    expect(notesAside(tl)[0].nextWindow).toBeUndefined();
    expect(notesAside(tl)[0].message).toContain('no night');
  });
});

// random line stations and plans
const stationArb = fc
  .uniqueArray(fc.integer({ min: 1, max: 120 }), { minLength: 2, maxLength: 12 })
  .chain((xs) =>
    fc.tuple(fc.constant(xs), fc.array(fc.boolean(), { minLength: xs.length, maxLength: xs.length })),
  )
  .map(([xs, attach]) => [
    { key: 'AL', x: 0, attach: true },
    ...xs.map((x, i) => ({ key: `N${i}`, x, attach: attach[i] })),
  ]);

const planArb = (keys: string[], options: { carrying: boolean }): fc.Arbitrary<Scenario> =>
  fc.record({
    tasks: fc.array(
      fc.record({
        title: fc.constant('task'),
        worksite: fc.constantFrom(...keys),
        crew: fc.constantFrom<'EV1' | 'EV2' | 'both'>('EV1', 'EV2', 'both'),
        durationSeconds: fc.integer({ min: 1, max: 3600 }),
        eclipseOnly: fc.boolean(),
        carrying: options.carrying ? fc.boolean() : fc.constant(false),
      }),
      { maxLength: 10 },
    ),
    tether1: fc.integer({ min: 5, max: 60 }),
    tether2: fc.integer({ min: 5, max: 60 }),
    egress: fc.integer({ min: 0, max: 3600 }),
    ingress: fc.integer({ min: 0, max: 3600 }),
    phase: fc.double({ min: 0, max: 359, noNaN: true }),
  });

const scenarioArb = (options: { carrying: boolean }) =>
  stationArb.chain((station) =>
    fc.tuple(
      fc.constant(station),
      planArb(
        station.map((n) => n.key),
        options,
      ),
    ),
  );

interface Scenario {
  tasks: TimelineTask[];
  tether1: number;
  tether2: number;
  egress: number;
  ingress: number;
  phase: number;
}

function run(station: LineNode[], p: Scenario, tasks: TimelineTask[] = p.tasks) {
  return computeTimeline(
    {
      plan: plan(tasks, {
        crew: { EV1: { name: 'a', tetherLengthM: p.tether1 }, EV2: { name: 'b', tetherLengthM: p.tether2 } },
        egressSeconds: p.egress,
        ingressSeconds: p.ingress,
        orbitPhaseAtStartDeg: p.phase,
      }),
      airlockKey: 'AL',
      orbit: { altitudeKm: 410, betaDeg: 20 },
    },
    lineRoute(station),
  );
}

describe('computeTimeline properties (fast-check, random line stations)', () => {
  it('each lane is contiguous from 0 with no overlaps, and its total is the sum of its blocks', () => {
    fc.assert(
      fc.property(scenarioArb({ carrying: true }), ([station, p]) => {
        const tl = run(station, p);
        for (const m of ['EV1', 'EV2'] as CrewMember[]) {
          const lane = tl.crew[m];
          let t = 0;
          for (const b of lane.blocks) {
            expect(b.start).toBe(t);
            expect(b.end).toBeGreaterThanOrEqual(b.start);
            t = b.end;
          }
          expect(lane.totalSeconds).toBe(t);
          const sum = lane.blocks.reduce((s, b) => s + b.end - b.start, 0);
          expect(sum).toBeCloseTo(lane.totalSeconds, 6);
          expect(
            lane.workSeconds +
              lane.idleSeconds +
              lane.translateSeconds +
              lane.swapSeconds +
              p.egress +
              p.ingress,
          ).toBeCloseTo(lane.totalSeconds, 6);
        }
        expect(tl.endSeconds).toBe(Math.max(tl.crew.EV1.totalSeconds, tl.crew.EV2.totalSeconds));
      }),
    );
  });

  it("a 'both' task's work starts at the same time in both lanes; every task's work appears for its crew", () => {
    fc.assert(
      fc.property(scenarioArb({ carrying: true }), ([station, p]) => {
        const tl = run(station, p);
        p.tasks.forEach((t, i) => {
          const work = (m: CrewMember) =>
            tl.crew[m].blocks.filter((b) => b.type === 'work' && b.taskIndex === i);
          if (t.crew === 'both') {
            expect(work('EV1')).toHaveLength(1);
            expect(work('EV2')).toHaveLength(1);
            expect(work('EV1')[0].start).toBe(work('EV2')[0].start);
          } else {
            expect(work(t.crew)).toHaveLength(1);
            expect(work(t.crew === 'EV1' ? 'EV2' : 'EV1')).toHaveLength(0);
          }
          expect(
            work(t.crew === 'both' ? 'EV1' : t.crew)[0].end -
              work(t.crew === 'both' ? 'EV1' : t.crew)[0].start,
          ).toBe(t.durationSeconds);
        });
      }),
    );
  });

  it('translate and swap blocks of a route add up to its total, and swap blocks match its swaps', () => {
    fc.assert(
      fc.property(scenarioArb({ carrying: true }), ([station, p]) => {
        const tl = run(station, p);
        for (const m of ['EV1', 'EV2'] as CrewMember[]) {
          const routes = new Map<RouteFeasible, number>();
          const blocks = tl.crew[m].blocks;
          blocks.forEach((b, k) => {
            if (b.type !== 'translate' || !b.route) return;
            if (routes.has(b.route)) return;
            let end = k;
            while (
              end + 1 < blocks.length &&
              (blocks[end + 1].route === b.route || blocks[end + 1].type === 'swap')
            )
              end++;
            routes.set(b.route, blocks[end].end - b.start);
            const swapNodes = blocks
              .slice(k, end + 1)
              .filter((x) => x.type === 'swap')
              .map((x) => x.swapNode);
            expect(swapNodes).toEqual(b.route.swaps.map((s) => s.node));
          });
          for (const [route, seconds] of routes) expect(seconds).toBeCloseTo(route.totalSeconds, 6);
        }
      }),
    );
  });

  it('removing a task never lengthens the day (metric fake: no swaps, no carrying, so the triangle inequality holds)', () => {
    fc.assert(
      fc.property(scenarioArb({ carrying: false }), fc.nat(), ([station, p], pick) => {
        fc.pre(p.tasks.length > 0);
        // a 1000 m tether never needs a swap on a 120 m line, so route time is distance / speed
        const q = { ...p, tether1: 1000, tether2: 1000 };
        const full = run(station, q);
        const i = pick % p.tasks.length;
        const fewer = run(
          station,
          q,
          p.tasks.filter((_, k) => k !== i),
        );
        expect(fewer.endSeconds).toBeLessThanOrEqual(full.endSeconds + 1e-6);
      }),
    );
  });
});

describe('computeTimeline with a plan parsed by CreatePlanInputSchema', () => {
  it('uses the contract defaults: 6 h 30 min limit (space agency mission blogs), 30 min egress and ingress (planning defaults, from memory)', () => {
    const parsed = CreatePlanInputSchema.parse({
      title: 'Pump swap',
      stationId: 1,
      date: '2031-05-02',
      crew: { EV1: { name: 'Ada', tetherLengthM: 15 }, EV2: { name: 'Ben', tetherLengthM: 15 } },
      tasks: [{ title: 'Remove pump', worksite: 'W2', crew: 'both', durationSeconds: 1200 }],
    });
    const tl = computeTimeline({ plan: parsed, airlockKey: 'A', orbit: ORBIT }, lineRoute(STATION));
    expect(tl.timeLimitSeconds).toBe(23400);
    expect(tl.crew.EV1.blocks[0]).toMatchObject({ type: 'egress', start: 0, end: 1800 });
    // out 350 s + 2 swaps, work 1200 s, back 350 s + 2 swaps, ingress 1800 s
    expect(tl.endSeconds).toBe(1800 + 530 + 1200 + 530 + 1800);
  });

  it('refuses plans the timeline could not schedule (over 200 tasks, a duration over 24 h, an unknown field)', () => {
    const base = {
      title: 'x',
      stationId: 1,
      date: '2031-05-02',
      crew: { EV1: { name: 'a' }, EV2: { name: 'b' } },
    };
    const t = { title: 't', worksite: 'W1', crew: 'EV1', durationSeconds: 60 };
    expect(CreatePlanInputSchema.safeParse({ ...base, tasks: Array(201).fill(t) }).success).toBe(false);
    expect(
      CreatePlanInputSchema.safeParse({ ...base, tasks: [{ ...t, durationSeconds: 86401 }] }).success,
    ).toBe(false);
    expect(CreatePlanInputSchema.safeParse({ ...base, tasks: [{ ...t, eclipse: true }] }).success).toBe(
      false,
    );
    expect(CreatePlanInputSchema.safeParse({ ...base, tasks: Array(200).fill(t) }).success).toBe(true);
  });
});

describe('routes that leave a worksite', () => {
  it('are noted once for the plan, naming each such start, not once per route', () => {
    const route = lineRoute(STATION);
    const tasks = [
      task({ worksite: 'W1', crew: 'EV1' }),
      task({ worksite: 'W2', crew: 'EV1' }),
      task({ worksite: 'W1', crew: 'both' }),
    ];
    const timeline = computeTimeline({ plan: plan(tasks), airlockKey: 'A', orbit: ORBIT }, route);
    const notes = timeline.warnings.filter((w) => w.code === 'route-note');
    expect(notes).toHaveLength(1);
    expect(notes[0].message).toMatch(/Routes leaving W1, W2 assume/);
    expect(timeline.warnings.some((w) => /is not a tether attach point/.test(w.message))).toBe(false);
  });

  it('say nothing when every route starts at an attach point', () => {
    const timeline = computeTimeline(
      { plan: plan([task({ worksite: 'J2', crew: 'EV2' })]), airlockKey: 'A', orbit: ORBIT },
      lineRoute(STATION),
    );
    expect(timeline.warnings.filter((w) => w.code === 'route-note')).toEqual([]);
  });
});
