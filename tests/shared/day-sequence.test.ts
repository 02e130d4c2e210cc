import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { compileStation } from '@shared/compute/compiled-station';
import { computeTimeline, membersOf } from '@shared/compute/day/timeline';
import {
  addedWarnings,
  independentLanes,
  keepsAfter,
  MOVE_KINDS,
  neighbourOrders,
  orderBounds,
  proposeOrder,
  type MoveKind,
  type SequenceOptions,
} from '@shared/compute/day/sequence';
import type { DayItem, DayPlan, DayTask, Timeline } from '@shared/compute/day/types';
import { travelLowerBound } from '@shared/compute/travel-bound';
import { StationDocumentSchema } from '@shared/schemas/station';
import kestrel from '../../server/db/seed/kestrel-station.json';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask, lineStationDocument } from '../factories/day';

const doc = lineStationDocument();
const { station, route } = dayEngine(doc);
const travelSeconds = travelLowerBound(compileStation(doc), doc.settings, false);
const day = (plan: DayPlan, order: readonly number[]) =>
  computeTimeline({ ...plan, tasks: order.map((i) => plan.tasks[i]) }, station, route);
const propose = (plan: DayPlan, options: SequenceOptions = {}) =>
  proposeOrder(plan, station, route, { travelSeconds, budgetMs: 20_000, ...options });

const warningsOf = (t: Timeline, order: readonly number[]) =>
  new Map(
    t.warnings.map((w) => [
      `${w.code}|${w.taskIndex === undefined ? '' : order[w.taskIndex]}|${w.crew ?? ''}|${w.item ?? ''}|${w.arm ?? ''}`,
      0,
    ]),
  );
/** how many of the day's warnings the base day has not (counted per code, task, crew, item) */
function added(plan: DayPlan, base: Timeline, order: readonly number[]): number {
  const identity = plan.tasks.map((_, i) => i);
  const counts = new Map<string, number>();
  for (const k of warningsOf(base, identity).keys()) counts.set(k, 0);
  for (const w of base.warnings) {
    const k = `${w.code}|${w.taskIndex ?? ''}|${w.crew ?? ''}|${w.item ?? ''}|${w.arm ?? ''}`;
    counts.set(k, (counts.get(k) ?? 0) + 1);
  }
  return addedWarnings(counts, day(plan, order), order);
}

function* permutations(n: number): Generator<number[]> {
  const a = Array.from({ length: n }, (_, i) => i);
  const c = new Array(n).fill(0);
  yield [...a];
  let i = 0;
  while (i < n) {
    if (c[i] < i) {
      const j = i % 2 === 0 ? 0 : c[i];
      [a[i], a[j]] = [a[j], a[i]];
      yield [...a];
      c[i]++;
      i = 0;
    } else {
      c[i] = 0;
      i++;
    }
  }
}

/** The independent check: every order of the tasks, each day computed by the timeline itself. */
function bruteForce(plan: DayPlan, dayOf = day): number {
  const identity = plan.tasks.map((_, i) => i);
  const current = dayOf(plan, identity);
  const base = new Map<string, number>();
  for (const w of current.warnings) {
    const k = `${w.code}|${w.taskIndex ?? ''}|${w.crew ?? ''}|${w.item ?? ''}|${w.arm ?? ''}`;
    base.set(k, (base.get(k) ?? 0) + 1);
  }
  let best = Infinity;
  for (const order of permutations(plan.tasks.length)) {
    if (!keepsAfter(plan.tasks, order)) continue;
    const t = dayOf(plan, order);
    if (addedWarnings(base, t, order) > 0) continue;
    best = Math.min(best, t.endSeconds);
  }
  return best;
}

const SITES = [K.a1, K.w1, K.a2, K.w2, K.a3, K.w3];
const driver: DayItem = { key: 'driver', name: 'Power driver', kind: 'tool', startsAt: K.w3 };

interface Shape {
  tasks: {
    site: number;
    crew: 'EV1' | 'EV2' | 'both';
    minutes: number;
    eclipseOnly: boolean;
    socket: boolean;
    after: number[];
  }[];
  /** pick the power driver up at W3 in one task, use it in another of the same crew member */
  driver: [number, number] | null;
}

/** true one time in `k` */
const oneIn = (k: number) => fc.nat(k - 1).map((v) => v === 0);

/**
 * A random plan of up to `most` tasks on the line station: both-crew tasks, `after`, night work (one
 * task in `nightOneIn`), a tool to fetch; worksites among the first `sites` of SITES.
 */
const planArb = (least: number, most: number, sites = SITES.length, nightOneIn = 6) =>
  fc
    .record({
      tasks: fc.array(
        fc.record({
          site: fc.nat(sites - 1),
          crew: fc.constantFrom(
            'EV1' as const,
            'EV2' as const,
            'EV1' as const,
            'EV2' as const,
            'both' as const,
          ),
          minutes: fc.integer({ min: 5, max: 40 }),
          eclipseOnly: nightOneIn > 0 ? oneIn(nightOneIn) : fc.constant(false),
          socket: oneIn(2),
          after: fc.array(fc.nat(20), { maxLength: 2 }),
        }),
        { minLength: least, maxLength: most },
      ),
      driver: fc.option(fc.tuple(fc.nat(20), fc.nat(20)), { freq: 3 }),
    })
    .map((shape: Shape) => toPlan(shape));

function toPlan(shape: Shape): DayPlan {
  const tasks: DayTask[] = shape.tasks.map((t, i) => {
    const site = SITES[t.site];
    // only tasks at W2 can stand in the socket beside it (in reach)
    const socket = t.socket && site === K.w2 ? K.s2 : undefined;
    return dayTask(`T${i + 1}`, site, t.crew, t.minutes * 60, {
      id: i + 1,
      eclipseOnly: t.eclipseOnly,
      ...(socket ? (t.crew === 'both' ? { sockets: { EV1: socket } } : { socket }) : {}),
      // only earlier tasks: no loops
      after: [...new Set(t.after.filter((j) => j < i).map((j) => j + 1))],
    });
  });
  const manifest: DayItem[] = [];
  if (shape.driver && tasks.length >= 2) {
    const [a, b] = shape.driver.map((k) => k % tasks.length);
    const fetcher = tasks[a];
    const crew = fetcher.crew === 'both' ? 'EV1' : fetcher.crew;
    tasks[a] = { ...fetcher, worksite: K.w3, actions: [{ do: 'pick-up', item: 'driver', by: crew }] };
    if (b !== a && (tasks[b].crew === crew || tasks[b].crew === 'both'))
      tasks[b] = { ...tasks[b], tools: ['driver'] };
    manifest.push(driver);
  }
  return buildDayPlan({ tasks, manifest });
}

describe('the proposed order: exact on small plans, checked against every order', () => {
  it('a task waiting for the partner is put where the wait is shortest', () => {
    // EV2's long job at W3 is after EV1's short one at W1; EV1's long job at A1 comes first in the
    // plan, so EV2 waits for it. Doing the short one first removes the wait (worked by hand).
    const plan = buildDayPlan({
      tasks: [
        dayTask('Long EV1', K.a1, 'EV1', 3600, { id: 1 }),
        dayTask('Short EV1', K.w1, 'EV1', 300, { id: 2 }),
        dayTask('Long EV2', K.w3, 'EV2', 3600, { id: 3, after: [2] }),
      ],
    });
    const r = propose(plan);
    expect(r.exact).toBe(true);
    expect(r.order.indexOf(1)).toBeLessThan(r.order.indexOf(0));
    expect(r.currentEndSeconds - r.endSeconds).toBeGreaterThan(3000);
    expect(r.endSeconds).toBe(bruteForce(plan));
  });

  it('on random plans of up to 6 tasks the exact answer equals the best of every order', () => {
    fc.assert(
      fc.property(planArb(2, Number(process.env.SEQUENCE_MOST ?? 6)), (plan) => {
        const r = propose(plan);
        expect(r.exact).toBe(true);
        const best = bruteForce(plan);
        if (best === Infinity) return; // no order keeps `after` without a new warning: the plan stays
        expect(r.endSeconds).toBeCloseTo(best, 6);
        expect(keepsAfter(plan.tasks, r.order)).toBe(true);
      }),
      {
        numRuns: Number(process.env.SEQUENCE_RUNS ?? 20),
        seed: Number(process.env.SEQUENCE_SEED ?? 20261205),
      },
    );
  });

  it('partial days dominated by one met before are dropped, and the answer is still the best of every order', () => {
    // few worksites, no night work: two first parts that leave the crew in the same state with
    // clocks no later are common, so the dominance is used on most of these plans
    let dominated = 0;
    fc.assert(
      fc.property(
        // W1 and W2 only (the sites list's second and fourth), no night work
        planArb(5, 6, 4, 0).map((p) =>
          buildDayPlan({
            ...p,
            tasks: p.tasks.map((t) => ({
              ...t,
              worksite: t.worksite === K.a1 || t.worksite === K.w1 ? K.w1 : K.w2,
            })),
          }),
        ),
        (plan) => {
          const r = propose(plan);
          dominated += r.dominated;
          expect(r.exact).toBe(true);
          const best = bruteForce(plan);
          if (best === Infinity) return;
          expect(r.endSeconds).toBeCloseTo(best, 6);
          expect(keepsAfter(plan.tasks, r.order)).toBe(true);
        },
      ),
      { numRuns: 12, seed: 5 },
    );
    expect(dominated).toBeGreaterThan(0);
  });

  it('crew members whose days cannot touch are searched one at a time, with the same answer', () => {
    fc.assert(
      fc.property(
        planArb(4, 6).map((p) =>
          buildDayPlan({
            tasks: p.tasks.map((t) => ({
              ...t,
              crew: t.crew === 'both' ? 'EV1' : t.crew,
              tools: [],
              actions: [],
              after: [],
            })),
          }),
        ),
        (plan) => {
          expect(independentLanes(plan)).toBe(true);
          const r = propose(plan);
          expect(r.exact).toBe(true);
          expect(r.endSeconds).toBeCloseTo(bruteForce(plan), 6);
        },
      ),
      { numRuns: 5, seed: 7 },
    );
  });
});

/** Every order's day end, computed with the timeline itself; Infinity where an order breaks `after` or adds a warning. */
function everyOrder(plan: DayPlan): { order: number[]; end: number }[] {
  const identity = plan.tasks.map((_, i) => i);
  const base = new Map<string, number>();
  for (const w of day(plan, identity).warnings) {
    const k = `${w.code}|${w.taskIndex ?? ''}|${w.crew ?? ''}|${w.item ?? ''}|${w.arm ?? ''}`;
    base.set(k, (base.get(k) ?? 0) + 1);
  }
  return [...permutations(plan.tasks.length)].map((order) => {
    if (!keepsAfter(plan.tasks, order)) return { order, end: Infinity };
    const t = day(plan, order);
    return { order, end: addedWarnings(base, t, order) > 0 ? Infinity : t.endSeconds };
  });
}

describe('what the search knows before it ends: never past the earliest allowed day end', () => {
  it('the bound after any first tasks, and the floor, are at most the best allowed order (fast-check)', () => {
    fc.assert(
      fc.property(
        planArb(2, 6),
        fc.nat(),
        fc.nat(6),
        fc.boolean(),
        fc.integer({ min: -1800, max: 600 }),
        (plan, pick, cut, withNext, beside) => {
          const orders = everyOrder(plan);
          const allowed = orders.filter((o) => o.end < Infinity);
          if (allowed.length === 0) return;
          const best = Math.min(...allowed.map((o) => o.end));
          // the first tasks of an allowed order, and the best allowed order that starts with them
          const chosen = allowed[pick % allowed.length].order;
          const prefix = chosen.slice(0, Math.min(cut, plan.tasks.length));
          // a crew member's next task decided too (as the search does when it waits for the partner)
          const nextOf = (order: readonly number[], m: 'EV1' | 'EV2') =>
            order.slice(prefix.length).find((x) => plan.tasks[x].crew === m || plan.tasks[x].crew === 'both');
          const m = pick % 2 ? 'EV1' : 'EV2';
          const x = withNext ? nextOf(chosen, m) : undefined;
          const completions = allowed.filter(
            (o) => prefix.every((y, k) => o.order[k] === y) && (x === undefined || nextOf(o.order, m) === x),
          );
          const bestCompletion = Math.min(...completions.map((o) => o.end));
          const next = x === undefined ? {} : { [m]: x };
          const { bound, floor } = orderBounds(plan, station, route, prefix, { travelSeconds }, next);
          expect(bound).toBeLessThanOrEqual(bestCompletion + 1e-6);
          expect(floor).toBeLessThanOrEqual(best + 1e-6);
          // with a day end to beat near the best, as the search asks: the same bound below it, never
          // past the best completion
          const target = bestCompletion + beside;
          const near = orderBounds(plan, station, route, prefix, { travelSeconds }, next, target).bound;
          expect(near).toBeLessThanOrEqual(bestCompletion + 1e-6);
          if (near < target) expect(near).toBeCloseTo(bound, 6);
          else expect(bound).toBeGreaterThanOrEqual(target - 1e-6);
        },
      ),
      {
        numRuns: Number(process.env.SEQUENCE_RUNS ?? 40),
        seed: Number(process.env.SEQUENCE_SEED ?? 20261206),
      },
    );
  });
});

describe('on the demo station, where some orders pass a caution the plan order does not', () => {
  const demo = StationDocumentSchema.parse(kestrel);
  const engine = dayEngine(demo);
  const demoTravel = travelLowerBound(compileStation(demo), demo.settings, false);
  const sites = ['SB3-W01', 'PB2-W01', 'SB1-W01', 'PB3-W01', 'SB4-W01', 'CB-W01', 'CORE-W01', 'PB4-W01'];
  const demoDay = (plan: DayPlan, order: readonly number[]) =>
    computeTimeline({ ...plan, tasks: order.map((i) => plan.tasks[i]) }, engine.station, engine.route);

  it('the exact answer and the floor against every order (orders alone that warn more are left out)', () => {
    let cautions = 0;
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.nat(sites.length - 1), fc.integer({ min: 5, max: 40 })), {
          minLength: 5,
          maxLength: 5,
        }),
        (shape) => {
          const first = buildDayPlan({
            tasks: shape.map(([site, minutes], i) =>
              dayTask(`T${i + 1}`, sites[site], i % 2 ? 'EV2' : 'EV1', minutes * 60, { id: i + 1 }),
            ),
          });
          // the plan in an order that passes a caution, where one does: the rule then has to tell
          // the plan's own cautions from added ones
          const warned = [...permutations(first.tasks.length)].find((o) =>
            demoDay(first, o).warnings.some((w) => w.code === 'route-caution'),
          );
          const plan = warned ? { ...first, tasks: warned.map((i) => first.tasks[i]) } : first;
          if (warned) cautions++;
          const best = bruteForce(plan, demoDay);
          const r = proposeOrder(plan, engine.station, engine.route, {
            travelSeconds: demoTravel,
            budgetMs: 20_000,
          });
          expect(r.exact).toBe(true);
          expect(r.endSeconds).toBeCloseTo(best, 6);
          const { floor } = orderBounds(plan, engine.station, engine.route, [], {
            travelSeconds: demoTravel,
          });
          expect(floor).toBeLessThanOrEqual(best + 1e-6);
        },
      ),
      { numRuns: 4, seed: 11 },
    );
    expect(cautions).toBeGreaterThan(0);
  });
});

describe('the proposal, exact or not: properties', () => {
  it('never breaks `after`, never ends later than the current order, never adds a warning', () => {
    fc.assert(
      fc.property(planArb(3, 14), fc.boolean(), (plan, heuristic) => {
        // the heuristic alone (exactUpTo 0) and the mixed path (a short budget) both
        const r = propose(plan, heuristic ? { exactUpTo: 0, budgetMs: 150 } : { budgetMs: 150 });
        const identity = plan.tasks.map((_, i) => i);
        expect([...r.order].sort((a, b) => a - b)).toEqual(identity);
        if (keepsAfter(plan.tasks, identity)) expect(keepsAfter(plan.tasks, r.order)).toBe(true);
        expect(r.endSeconds).toBeLessThanOrEqual(r.currentEndSeconds + 1e-6);
        // recomputed here from the order alone, not taken from the answer
        const current = day(plan, identity);
        expect(added(plan, current, r.order)).toBe(0);
        expect(day(plan, r.order).endSeconds).toBeCloseTo(r.endSeconds, 6);
        if (heuristic) expect(r.exact).toBe(r.order.length <= 1);
        expect(r.explored).toBeGreaterThan(0);
      }),
      { numRuns: 25, seed: 42 },
    );
  });

  it('says it is not exact when the budget runs out, and still answers within it', () => {
    const tasks = Array.from({ length: 16 }, (_, i) =>
      dayTask(`T${i + 1}`, SITES[i % SITES.length], i % 2 ? 'EV2' : 'EV1', 300 + 60 * i, { id: i + 1 }),
    );
    const plan = buildDayPlan({ tasks });
    const t0 = Date.now();
    const r = propose(plan, { budgetMs: 200 });
    expect(Date.now() - t0).toBeLessThan(2000);
    expect(r.endSeconds).toBeLessThanOrEqual(r.currentEndSeconds);
    expect(typeof r.exact).toBe('boolean');
  });
});

/** Each crew member's sequence in an order. */
const lanes = (plan: DayPlan, order: readonly number[]) =>
  (['EV1', 'EV2'] as const).map((m) => order.filter((i) => membersOf(plan.tasks[i]).includes(m)));

/** Whether `next` is `lane` with one of the shapes a move of `kind` makes (worked by hand from the move's definition). */
function isShape(
  kind: Exclude<MoveKind, 'joint'>,
  lane: readonly number[],
  next: readonly number[],
): boolean {
  const len = lane.length;
  let a = 0;
  while (a < len && lane[a] === next[a]) a++;
  let b = len - 1;
  while (b >= a && lane[b] === next[b]) b--;
  if (a > b) return false;
  const mid = lane.slice(a, b + 1);
  const moved = next.slice(a, b + 1);
  if (kind === '2-opt') return b - a >= 2 && moved.every((x, k) => x === mid[mid.length - 1 - k]);
  if (kind === 'swap')
    return (
      moved[0] === mid[b - a] &&
      moved[b - a] === mid[0] &&
      mid.slice(1, -1).every((x, k) => x === moved[k + 1])
    );
  // or-opt: a run of one to three moved to one end of the changed span, as it was or reversed
  for (let k = 1; k <= 3; k++) {
    for (const [run, rest, runFirst] of [
      [mid.slice(0, k), mid.slice(k), false],
      [mid.slice(-k), mid.slice(0, -k), true],
    ] as const) {
      for (const r of [run, [...run].reverse()]) {
        const want = runFirst ? [...r, ...rest] : [...rest, ...r];
        if (want.length === moved.length && want.every((x, j) => x === moved[j])) return true;
      }
    }
  }
  return false;
}

describe('the local search: its moves, and the proposal with each', () => {
  const allowedOrder = fc
    .tuple(planArb(4, 12), fc.array(fc.nat(), { minLength: 12, maxLength: 12 }))
    .map(([plan, keys]) => {
      // a random order that keeps `after`: tasks taken by key among those whose tasks are placed
      const order: number[] = [];
      const left = new Set(plan.tasks.map((_, i) => i));
      const ids = new Map(plan.tasks.map((t, i) => [t.id, i]));
      while (left.size) {
        const ready = [...left].filter((i) =>
          (plan.tasks[i].after ?? []).every((id) => !left.has(ids.get(id)!)),
        );
        const x = ready[keys[order.length % keys.length] % ready.length];
        order.push(x);
        left.delete(x);
      }
      return { plan, order };
    });

  for (const kind of ['or-opt', '2-opt', 'swap'] as const) {
    it(`a ${kind} move changes one crew member's sequence by its shape and keeps the partner's own tasks in place`, () => {
      fc.assert(
        fc.property(allowedOrder, ({ plan, order }) => {
          const before = lanes(plan, order);
          for (const next of neighbourOrders(plan, station, route, order, kind, { travelSeconds })) {
            expect([...next].sort((a, b) => a - b)).toEqual(plan.tasks.map((_, i) => i));
            const after = lanes(plan, next);
            const changed = [0, 1].filter((k) => after[k].join() !== before[k].join());
            expect(changed.length).toBeGreaterThan(0);
            // the crew member whose sequence has the move's shape, with the partner's own tasks in place
            const fits = changed.filter(
              (k) =>
                isShape(kind, before[k], after[k]) &&
                order.every(
                  (x, at) => membersOf(plan.tasks[x]).includes(k ? 'EV2' : 'EV1') || next[at] === x,
                ),
            );
            expect(fits.length).toBeGreaterThan(0);
          }
        }),
        { numRuns: 20, seed: 7 },
      );
    });
  }

  it('a joint move puts one task for both elsewhere and keeps the others in order', () => {
    fc.assert(
      fc.property(allowedOrder, ({ plan, order }) => {
        for (const next of neighbourOrders(plan, station, route, order, 'joint', { travelSeconds })) {
          const movedBoth = order.filter((x, at) => plan.tasks[x].crew === 'both' && next.indexOf(x) !== at);
          expect(movedBoth.length).toBeGreaterThan(0);
          const x = movedBoth.find(
            (y) => next.filter((z) => z !== y).join() === order.filter((z) => z !== y).join(),
          );
          expect(x).toBeDefined();
        }
      }),
      { numRuns: 20, seed: 8 },
    );
  });

  for (const kind of MOVE_KINDS)
    it(`with ${kind} moves alone the proposal never breaks \`after\`, never ends later, never adds a warning`, () => {
      fc.assert(
        fc.property(planArb(3, 12), fc.nat(1000), (plan, seed) => {
          const r = propose(plan, { exactUpTo: 0, moves: [kind], seed, evaluations: 150 });
          const identity = plan.tasks.map((_, i) => i);
          if (keepsAfter(plan.tasks, identity)) expect(keepsAfter(plan.tasks, r.order)).toBe(true);
          expect(r.endSeconds).toBeLessThanOrEqual(r.currentEndSeconds + 1e-6);
          expect(added(plan, day(plan, identity), r.order)).toBe(0);
          expect(day(plan, r.order).endSeconds).toBeCloseTo(r.endSeconds, 6);
        }),
        { numRuns: 8, seed: 9 },
      );
    });

  it('the same plan, seed and number of days computed give the same order', () => {
    const tasks = Array.from({ length: 14 }, (_, i) =>
      dayTask(
        `T${i + 1}`,
        SITES[(i * 5) % SITES.length],
        i % 3 === 2 ? 'both' : i % 2 ? 'EV2' : 'EV1',
        300 + 60 * i,
        {
          id: i + 1,
        },
      ),
    );
    const plan = buildDayPlan({ tasks });
    const runs = [1, 2].map(() => propose(plan, { exactUpTo: 0, seed: 5, evaluations: 400 }));
    expect(runs[1].order).toEqual(runs[0].order);
    expect(runs[1].endSeconds).toBe(runs[0].endSeconds);
    expect(runs[0].endSeconds).toBeLessThan(runs[0].currentEndSeconds);
  });
});
