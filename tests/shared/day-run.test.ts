import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { flownFrom, projectRun, withoutTasks, type FlightEvent } from '@shared/compute/day/run';
import { computeTimeline } from '@shared/compute/day/timeline';
import type { DayPlan, DayTask } from '@shared/compute/day/types';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask, lineStationDocument } from '../factories/day';

const { station, route } = dayEngine(lineStationDocument());
const optional = (task: DayTask): DayTask => Object.assign(task, { optional: true });

/**
 * EV1: a 10 min task at W1, then get-ahead tasks of the given lengths at W1; EV2: one task at W3.
 * The time limit leaves `marginSeconds` after the planned day.
 */
function planWith(optionals: number[], marginSeconds: number): DayPlan {
  const tasks = [
    dayTask('Open the panel', K.w1, 'EV1', 600, { id: 1 }),
    ...optionals.map((s, i) => optional(dayTask(`Get-ahead ${i + 1}`, K.w1, 'EV1', s, { id: 10 + i }))),
    dayTask('Check the valve', K.w3, 'EV2', 300, { id: 2 }),
  ];
  const plan = buildDayPlan({ tasks });
  const end = computeTimeline(plan, station, route).endSeconds;
  return { ...plan, timeLimitSeconds: end + marginSeconds };
}

/** Both out on time, EV2's task on time, EV1's first task done `delay` late; now is that moment. */
function delayed(plan: DayPlan, delay: number): { events: FlightEvent[]; now: number } {
  const day = computeTimeline(plan, station, route);
  const first = day.crew.EV1.blocks.find((b) => b.type === 'work')!;
  const valve = day.crew.EV2.blocks.find((b) => b.type === 'work')!;
  const events: FlightEvent[] = [
    { crew: 'EV1', kind: 'egress-done', at: day.crew.EV1.blocks[0].end },
    { crew: 'EV2', kind: 'egress-done', at: day.crew.EV2.blocks[0].end },
    { crew: 'EV2', kind: 'task-start', taskId: 2, at: valve.start },
    { crew: 'EV2', kind: 'task-done', taskId: 2, at: valve.end },
    { crew: 'EV1', kind: 'task-start', taskId: 1, at: first.start },
    { crew: 'EV1', kind: 'task-done', taskId: 1, at: first.end + delay },
  ];
  return { events, now: first.end + delay };
}

/** EV2's task logged as planned. */
function valveOnTime(day: ReturnType<typeof computeTimeline>): FlightEvent[] {
  const valve = day.crew.EV2.blocks.find((b) => b.type === 'work')!;
  return [
    { crew: 'EV2', kind: 'task-start', taskId: 2, at: valve.start },
    { crew: 'EV2', kind: 'task-done', taskId: 2, at: valve.end },
  ];
}

/** The day re-projected without some tasks, computed again from scratch. */
function marginWithout(plan: DayPlan, events: FlightEvent[], now: number, ids: number[]) {
  const flown = flownFrom(plan, events, Math.max(now, ...events.map((e) => e.at)));
  return computeTimeline({ ...plan, tasks: withoutTasks(plan.tasks, new Set(ids)) }, station, route, {
    flown,
  }).marginSeconds;
}

describe('the day as flown', () => {
  it('takes a task started and not logged done as running until now, and moves the rest after it', () => {
    const plan = planWith([], 600);
    const planned = computeTimeline(plan, station, route);
    const first = planned.crew.EV1.blocks.find((b) => b.type === 'work')!;
    const now = first.end + 300;
    const events: FlightEvent[] = [
      { crew: 'EV1', kind: 'egress-done', at: 600 },
      { crew: 'EV2', kind: 'egress-done', at: 600 },
      { crew: 'EV1', kind: 'task-start', taskId: 1, at: first.start },
      ...valveOnTime(planned),
    ];
    const run = projectRun(plan, station, route, events, now);
    const work = run.projected.crew.EV1.blocks.find((b) => b.type === 'work')!;
    expect([work.start, work.end]).toEqual([first.start, now]);
    expect(run.actual.EV1.at(-1)).toMatchObject({
      type: 'work',
      start: first.start,
      end: now,
      inProgress: true,
    });
    const next = run.projected.crew.EV1.blocks[run.projected.crew.EV1.blocks.indexOf(work) + 1];
    expect(next.start).toBe(now);
  });

  it('holds a task nobody has started yet to now', () => {
    const plan = planWith([], 600);
    const planned = computeTimeline(plan, station, route);
    const first = planned.crew.EV1.blocks.find((b) => b.type === 'work')!;
    const events: FlightEvent[] = [{ crew: 'EV1', kind: 'egress-done', at: 600 }];
    const run = projectRun(plan, station, route, events, first.start + 120);
    const work = run.projected.crew.EV1.blocks.find((b) => b.type === 'work')!;
    expect(work.start).toBe(first.start + 120);
    expect(
      run.projected.crew.EV1.blocks.find((b) => b.type === 'wait' && b.end === work.start),
    ).toBeDefined();
  });
});

describe('the projection and the clock', () => {
  /** Both crew members' tasks started on time and not logged done (a log is never after now). */
  function running() {
    const plan = planWith([], 600);
    const planned = computeTimeline(plan, station, route);
    const first = planned.crew.EV1.blocks.find((b) => b.type === 'work')!;
    const valve = planned.crew.EV2.blocks.find((b) => b.type === 'work')!;
    const events: FlightEvent[] = [
      { crew: 'EV1', kind: 'egress-done', at: 600 },
      { crew: 'EV2', kind: 'egress-done', at: 600 },
      { crew: 'EV1', kind: 'task-start', taskId: 1, at: first.start },
      { crew: 'EV2', kind: 'task-start', taskId: 2, at: valve.start },
    ];
    return {
      plan,
      planned,
      first,
      valve,
      at: (now: number) => projectRun(plan, station, route, events, now),
    };
  }

  it('stays as it is until a running task reaches its planned end, and says when that is', () => {
    const { planned, first, valve, at } = running();
    const since = Math.max(first.start, valve.start);
    const soon = Math.min(first.end, valve.end);
    const early = at(since + 1);
    const later = at(soon - 1);
    expect(early.clock).toEqual({ held: false, steadyUntil: soon });
    expect(later.clock).toEqual({ held: false, steadyUntil: soon });
    expect(early.projected.endSeconds).toBe(planned.endSeconds);
    expect(later.projected.endSeconds).toBe(planned.endSeconds);
  });

  it('pushes the rest of the day with the clock while the tasks run past their planned ends, nothing logged', () => {
    const { planned, first, valve, at } = running();
    const late = Math.max(first.end, valve.end);
    const five = at(late + 300);
    const fifteen = at(late + 900);
    expect(five.clock).toEqual({ held: true, steadyUntil: null });
    expect(fifteen.clock).toEqual({ held: true, steadyUntil: null });
    // the lane that ends the day was running its task: the day ends later by exactly that overrun
    expect(five.projected.endSeconds).toBe(planned.endSeconds + 300);
    expect(fifteen.projected.endSeconds).toBe(planned.endSeconds + 900);
    expect(fifteen.actual.EV1.at(-1)).toMatchObject({ inProgress: true, end: late + 900 });
  });

  it('holds a step nobody started once its time has come, and never before (fast-check)', () => {
    const { plan, first } = running();
    const events: FlightEvent[] = [{ crew: 'EV1', kind: 'egress-done', at: 600 }];
    fc.assert(
      fc.property(fc.integer({ min: 600, max: Math.round(first.start) + 3600 }), (now) => {
        const run = projectRun(plan, station, route, events, now);
        const work = run.projected.crew.EV1.blocks.find((b) => b.type === 'work')!;
        // EV1's task starts at its planned time or now, whichever is later
        expect(work.start).toBe(Math.max(first.start, now));
        if (now >= first.start) expect(run.clock.held).toBe(true);
        if (!run.clock.held) {
          expect(run.clock.steadyUntil).toBeGreaterThan(now);
          // and until then the day is the one projected now
          const until = projectRun(plan, station, route, events, run.clock.steadyUntil!);
          expect(until.projected.endSeconds).toBe(run.projected.endSeconds);
        }
      }),
      { numRuns: 25 },
    );
  });
});

describe('what to drop to restore the margin', () => {
  it('drops the one get-ahead task that gives the margin back, worked by hand', () => {
    // 5 min late on a 100 s margin: the 10 min get-ahead task gives back 600 s, the 5 min one 300 s
    const plan = planWith([300, 600], 100);
    const { events, now } = delayed(plan, 500);
    const run = projectRun(plan, station, route, events, now);
    expect(run.projected.marginSeconds).toBeCloseTo(-400, 6);
    expect(run.drop).toEqual({
      targetMarginSeconds: 100,
      taskIds: [11],
      marginSeconds: expect.any(Number),
      restores: true,
    });
    expect(run.drop!.marginSeconds).toBeCloseTo(200, 6);
  });

  it('suggests nothing when the day keeps its margin, and says so when dropping cannot restore it', () => {
    const onTime = planWith([300], 100);
    const fine = delayed(onTime, 0);
    expect(projectRun(onTime, station, route, fine.events, fine.now).drop).toBeNull();
    const late = delayed(onTime, 3000);
    const run = projectRun(onTime, station, route, late.events, late.now);
    expect(run.drop).toMatchObject({ taskIds: [10], restores: false });
    expect(run.drop!.marginSeconds).toBeLessThan(100);
  });

  it('restores the margin whenever it says it does (recomputed from scratch)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 60, max: 1800 }), { minLength: 0, maxLength: 4 }),
        fc.integer({ min: 0, max: 1200 }),
        fc.integer({ min: 0, max: 3600 }),
        (optionals, margin, delay) => {
          const plan = planWith(optionals, margin);
          const { events, now } = delayed(plan, delay);
          const run = projectRun(plan, station, route, events, now);
          if (!run.drop) {
            // nothing to drop, or nothing needs dropping
            const target = Math.max(0, run.planned.marginSeconds);
            expect(optionals.length === 0 || run.projected.marginSeconds >= target).toBe(true);
            return;
          }
          const again = marginWithout(plan, events, now, run.drop.taskIds);
          expect(again).toBeCloseTo(run.drop.marginSeconds, 6);
          expect(again >= run.drop.targetMarginSeconds).toBe(run.drop.restores);
          if (!run.drop.restores) {
            const all = plan.tasks.filter((t) => t.id! >= 10).map((t) => t.id!);
            expect(marginWithout(plan, events, now, all)).toBeLessThan(run.drop.targetMarginSeconds);
          }
        },
      ),
      { numRuns: 40 },
    );
  });
});
