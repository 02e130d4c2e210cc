import { describe, expect, it } from 'vitest';
import { computeTimeline } from '@shared/compute/day/timeline';
import type { DayPlan, Timeline, TimelineBlock } from '@shared/compute/day/types';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask, lineStationDocument } from '../factories/day';

const doc = lineStationDocument();
const { station, route } = dayEngine(doc);
const day = (plan: DayPlan) => computeTimeline(plan, station, route);

const shape = (b: TimelineBlock) => [b.type, b.start, b.end];
const codes = (t: Timeline) => t.warnings.map((w) => w.code).sort();

/**
 * Worked by hand on the line station (10 s a metre, 90 s a swap, 120 s in or out of a restraint, a
 * 12 m tether): EV1 carries the foot restraint out and installs it in S2 working at W2 from the
 * handrail; both then work at W2, EV1 in the restraint and EV2 with the power driver in hand; EV1
 * takes the restraint out again and both go home.
 */
const handWorked = buildDayPlan({
  manifest: [
    { key: 'fr-1', name: 'Foot restraint 1', kind: 'foot-restraint', carriedBy: 'EV1', startsAt: 'airlock' },
    { key: 'driver', name: 'Power driver', kind: 'tool', carriedBy: 'EV2', startsAt: 'airlock' },
  ],
  tasks: [
    dayTask('Install the restraint', K.w2, 'EV1', 300, {
      actions: [{ do: 'install', item: 'fr-1', at: K.s2 }],
    }),
    dayTask('Replace the pump', K.w2, 'both', 600, { sockets: { EV1: K.s2 }, tools: ['Power driver'] }),
    dayTask('Take the restraint out', K.w2, 'EV1', 120, {
      actions: [{ do: 'remove', item: 'fr-1', at: K.s2 }],
    }),
  ],
});

describe('the continuous day, worked by hand on the line station', () => {
  const t = day(handWorked);
  const ev1 = t.crew.EV1.blocks;
  const ev2 = t.crew.EV2.blocks;

  it('EV1 goes out with two swaps (A1, A2: 16 m to A2 is past the 12 m tether), then works, gets in, gets out, and comes home', () => {
    // AL→A1 8 m (80 s), swap at A1, A1→A2 8 m, swap at A2, A2→W2 5.5 m: 215 s + 180 s
    expect(ev1.map(shape)).toEqual([
      ['egress', 0, 600],
      ['translate', 600, 680],
      ['swap', 680, 770],
      ['translate', 770, 850],
      ['swap', 850, 940],
      ['translate', 940, 995],
      ['work', 995, 1295],
      ['restraint-in', 1295, 1415],
      ['work', 1415, 2015],
      ['restraint-out', 2015, 2135],
      ['work', 2135, 2255],
      // home from W2 with 5.5 m out from A2: back to A2 (11 m out), swap, to A1, swap, to AL
      ['translate', 2255, 2310],
      ['swap', 2310, 2400],
      ['translate', 2400, 2480],
      ['swap', 2480, 2570],
      ['translate', 2570, 2650],
      ['ingress', 2650, 3250],
    ]);
  });

  it('the tether carries over: each stretch starts where the last one ended, and swaps are at attach points', () => {
    const moves = ev1.filter((b) => b.type === 'translate');
    expect(moves.map((b) => [b.tetherAtStart, b.tetherAtEnd])).toEqual([
      [
        { anchor: K.airlock, paidOutM: 0 },
        { anchor: K.airlock, paidOutM: 8 },
      ],
      [
        { anchor: K.a1, paidOutM: 0 },
        { anchor: K.a1, paidOutM: 8 },
      ],
      [
        { anchor: K.a2, paidOutM: 0 },
        { anchor: K.a2, paidOutM: 5.5 },
      ],
      // the way home starts from the state on arrival, not from a fresh clip at the worksite
      [
        { anchor: K.a2, paidOutM: 5.5 },
        { anchor: K.a2, paidOutM: 11 },
      ],
      [
        { anchor: K.a2, paidOutM: 0 },
        { anchor: K.a2, paidOutM: 8 },
      ],
      [
        { anchor: K.a1, paidOutM: 0 },
        { anchor: K.a1, paidOutM: 8 },
      ],
    ]);
    const swaps = ev1.filter((b) => b.type === 'swap');
    expect(swaps.map((b) => [b.swapNode, b.releaseNode])).toEqual([
      [K.a1, K.airlock],
      [K.a2, K.a1],
      [K.a2, K.a2],
      [K.a1, K.a2],
    ]);
  });

  it('EV2 waits at W2 from 995 s until EV1 is in the restraint at 1415 s, and waits at the airlock for EV1', () => {
    expect(ev2.map(shape)).toEqual([
      ['egress', 0, 600],
      ['translate', 600, 680],
      ['swap', 680, 770],
      ['translate', 770, 850],
      ['swap', 850, 940],
      ['translate', 940, 995],
      ['wait', 995, 1415],
      ['work', 1415, 2015],
      ['translate', 2015, 2070],
      ['swap', 2070, 2160],
      ['translate', 2160, 2240],
      ['swap', 2240, 2330],
      ['translate', 2330, 2410],
      ['wait', 2410, 2650],
      ['ingress', 2650, 3250],
    ]);
    expect(t.endSeconds).toBe(3250);
  });

  it('the restraint is carried, installed from 1295 s, carried back from 2255 s and in the airlock from 2650 s', () => {
    const fr = t.equipment.find((e) => e.item === 'fr-1')!;
    expect(fr.states).toEqual([
      { start: 0, end: 1295, where: { kind: 'carried', crew: 'EV1' } },
      { start: 1295, end: 2255, where: { kind: 'installed', node: K.s2 } },
      { start: 2255, end: 2650, where: { kind: 'carried', crew: 'EV1' } },
      { start: 2650, end: 3250, where: { kind: 'airlock' } },
    ]);
    const driver = t.equipment.find((e) => e.item === 'driver')!;
    expect(driver.states).toEqual([
      { start: 0, end: 2650, where: { kind: 'carried', crew: 'EV2' } },
      { start: 2650, end: 3250, where: { kind: 'airlock' } },
    ]);
  });

  it('has no warnings, and the restraint-in block carries the set angles of a worksite straight out from the socket', () => {
    expect(t.warnings).toEqual([]);
    const into = ev1.find((b) => b.type === 'restraint-in')!;
    expect(into.socket).toBe(K.s2);
    expect([into.yawSetDeg, into.pitchSetDeg]).toEqual([0, 90]);
    expect(t.reach).toHaveLength(1);
    expect(t.reach[0]).toMatchObject({ taskIndex: 1, crew: 'EV1', socket: K.s2, reach: { reachable: true } });
  });

  it('every route is listed once, and each translate block points into it', () => {
    expect(t.routes).toHaveLength(4);
    for (const b of [...ev1, ...ev2]) {
      if (b.type !== 'translate') continue;
      const r = t.routes[b.routeIndex!];
      expect(r.legs[b.legStart!].from).toBe(b.from);
      expect(r.legs[b.legEnd! - 1].to).toBe(b.to);
    }
  });
});

describe('the day’s checks on the line station', () => {
  const one = (more: Partial<DayPlan['tasks'][number]> = {}, plan: Partial<DayPlan> = {}) =>
    buildDayPlan({ tasks: [dayTask('Inspect', K.w3, 'EV1', 600, more)], ...plan });

  it('a worksite that takes the whole tether to reach is entered with room to leave: swap at A1 on the way in', () => {
    // W1 is 12 m from the airlock on a 12 m tether: straight in would leave 12 m out and no way on
    const t = day(
      buildDayPlan({ tasks: [dayTask('At W1', K.w1, 'EV1', 300), dayTask('At W3', K.w3, 'EV1', 300)] }),
    );
    expect(t.warnings).toEqual([]);
    const firstIn = t.crew.EV1.blocks.filter((b) => b.type === 'translate')[1];
    // in via A1 (swap there), arriving with 4 m out: W1 → A2 is 4 m more, within the tether
    expect(firstIn.tetherAtEnd).toEqual({ anchor: K.a1, paidOutM: 4 });
  });

  it('the day over its limit is a warning with the time past it', () => {
    const t = day(one({}, { timeLimitSeconds: 2400 }));
    expect(t.fitsTimeLimit).toBe(false);
    expect(codes(t)).toEqual(['over-time-limit']);
    expect(t.warnings[0].message).toContain('past the 0:40 limit');
    expect(t.marginSeconds).toBe(2400 - t.endSeconds);
  });

  it('the carrying flag slows only the way to its task, by the carry factor', () => {
    const plain = day(one());
    const carried = day(one({ carrying: true }));
    const first = (x: Timeline) => x.crew.EV1.blocks.find((b) => b.type === 'translate')!;
    expect(first(carried).end - first(carried).start).toBeCloseTo(
      1.5 * (first(plain).end - first(plain).start),
      9,
    );
    const last = (x: Timeline) => [...x.crew.EV1.blocks].reverse().find((b) => b.type === 'translate')!;
    expect(last(carried).end - last(carried).start).toBeCloseTo(last(plain).end - last(plain).start, 9);
  });

  it('holding a large item slows every translation until it is handed over, then slows the partner', () => {
    const t = day(
      buildDayPlan({
        manifest: [{ key: 'pump', name: 'Spare pump module', kind: 'large-item', carriedBy: 'EV1' }],
        tasks: [
          dayTask('Hand the pump over', K.w1, 'both', 120, {
            actions: [{ do: 'hand-over', item: 'pump', by: 'EV1' }],
          }),
          dayTask('Stow it', K.w3, 'EV2', 120, { actions: [{ do: 'set-down', item: 'pump' }] }),
        ],
      }),
    );
    const firstLeg = (m: 'EV1' | 'EV2') =>
      t.routes[t.crew[m].blocks.find((b) => b.type === 'translate')!.routeIndex!];
    // both walk AL → W1 the same way; EV1 holds the pump, so each leg takes 1.5 × as long
    expect(firstLeg('EV1').travelSeconds).toBeCloseTo(1.5 * firstLeg('EV2').travelSeconds, 9);
    const ev2Legs = t.crew.EV2.blocks
      .filter((b) => b.type === 'translate')
      .map((b) => t.routes[b.routeIndex!]);
    const toW3 = ev2Legs.find((r) => r.nodes[r.nodes.length - 1] === K.w3)!;
    expect(toW3.legs.every((l) => l.seconds === 1.5 * (l.lengthM / 0.1))).toBe(true);
    expect(codes(t)).toEqual(['left-outside']);
  });

  it('a route through a caution volume is listed with the task it leads to', () => {
    const cautious = lineStationDocument({
      hazards: [{ key: 'ANT-1', kind: 'caution', shape: 'sphere', center: [26, 0, 0], radiusM: 0.5 }],
    });
    const e = dayEngine(cautious);
    const t = computeTimeline(one(), e.station, e.route);
    expect(t.warnings.map((w) => [w.code, w.taskIndex, w.crew])).toEqual([
      ['route-caution', 0, 'EV1'],
      ['route-caution', undefined, 'EV1'],
    ]);
    expect(t.warnings[0].message).toContain('ANT-1');
  });

  it('an unreachable worksite: the reason is shown, the crew member stays put and the work is marked', () => {
    const closed = lineStationDocument();
    closed.edges = closed.edges.map((e) => (e.to === K.w3 ? { ...e, closed: true } : e));
    const e = dayEngine(closed);
    const t = computeTimeline(one(), e.station, e.route);
    expect(codes(t)).toEqual(['route-infeasible']);
    expect(t.warnings[0]).toMatchObject({ taskIndex: 0, crew: 'EV1' });
    expect(t.crew.EV1.blocks.map((b) => b.type)).toEqual(['egress', 'work', 'ingress']);
    expect(t.crew.EV1.blocks[1].unreached).toBe(true);
  });

  it('an unknown worksite or socket is named and not routed to', () => {
    const t = day(
      buildDayPlan({
        tasks: [
          dayTask('Lost', 'PB9-W1', 'EV2', 300),
          dayTask('Odd socket', K.w2, 'EV2', 300, { socket: 'PB9-S1' }),
        ],
      }),
    );
    expect(t.warnings.map((w) => [w.code, w.taskIndex])).toEqual([
      ['unknown-worksite', 0],
      ['unknown-socket', 1],
    ]);
    expect(t.crew.EV2.blocks[1]).toMatchObject({ type: 'work', unreached: true, start: 600 });
  });

  it('an eclipse-only task in daylight names the next night window that fits (400 km, β = 0: night 36.11 min, Sumanth)', () => {
    // sunrise at EVA start: day until 56.45 min, then night until 92.56 min (36.11 min of shadow by the Sumanth 2019 eclipse formula)
    const t = day(one({ eclipseOnly: true, durationSeconds: 1200, title: 'Mate power connectors' }));
    const sunset = t.nightWindows[0].start;
    expect(sunset / 60).toBeCloseTo(92.56 - 36.11, 1);
    const w = t.warnings.find((x) => x.code === 'eclipse-only-outside-night')!;
    expect(w.taskIndex).toBe(0);
    expect(w.nextWindow?.start).toBeCloseTo(sunset, 6);
    expect(w.nextWindow?.end).toBeCloseTo(sunset + 1200, 6);
    expect(w.message).toContain('Mate power connectors');
  });

  it('no eclipse warning when the task lies wholly in a night window; past β* there is no night and the warning says so', () => {
    const base = day(one({ eclipseOnly: true, durationSeconds: 1200 }));
    const work = base.crew.EV1.blocks.find((b) => b.type === 'work')!;
    const T = base.orbit.periodSeconds;
    const sunlit = base.orbit.sunlitSeconds;
    const phase = (((((sunlit - (work.start - 60)) / T) * 360) % 360) + 360) % 360;
    const inNight = day(one({ eclipseOnly: true, durationSeconds: 1200 }, { orbitPhaseAtStartDeg: phase }));
    expect(inNight.warnings).toEqual([]);
    const noNight = day(one({ eclipseOnly: true }, { betaDegOverride: 75 }));
    expect(noNight.nightWindows).toEqual([]);
    expect(noNight.warnings[0].code).toBe('eclipse-only-outside-night');
    expect(noNight.warnings[0].message).toContain('no night');
  });
});
