import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { computeTimeline } from '@shared/compute/day/timeline';
import type { DayPlan, Timeline } from '@shared/compute/day/types';
import { taskOrderProblems } from '@shared/schemas/plan';
import { LINE_KEYS as K, buildDayPlan, dayEngine, dayTask, lineStationDocument } from '../factories/day';

const { station, route } = dayEngine(lineStationDocument());
const day = (plan: DayPlan) => computeTimeline(plan, station, route);
const work = (t: Timeline, taskIndex: number) =>
  [...t.crew.EV1.blocks, ...t.crew.EV2.blocks].find((b) => b.type === 'work' && b.taskIndex === taskIndex)!;

describe('`after`: a task starts its work only once the tasks it names have ended', () => {
  // EV1 works 20 min at W1; EV2 is to start at W3 only after that, so it gets there and waits
  const plan = buildDayPlan({
    tasks: [
      dayTask('Open the panel', K.w1, 'EV1', 1200, { id: 11 }),
      dayTask('Swap the box', K.w3, 'EV2', 300, { id: 12, after: [11] }),
    ],
  });
  const t = day(plan);

  it('the later task waits, in a block that says what for, and starts the moment the other ends', () => {
    const opened = work(t, 0);
    const swapped = work(t, 1);
    expect(swapped.start).toBe(opened.end);
    const wait = t.crew.EV2.blocks.find((b) => b.type === 'wait')!;
    expect(wait).toMatchObject({
      end: opened.end,
      taskIndex: 1,
      label: 'Wait for Task 1 "Open the panel" to end',
    });
    // EV2 travelled first and waited at the worksite, before work (and before any restraint)
    const before = t.crew.EV2.blocks[t.crew.EV2.blocks.indexOf(wait) - 1];
    expect(before.type).toBe('translate');
    expect(before.to).toBe(K.w3);
    expect(t.warnings.map((w) => w.code)).toEqual([]);
  });

  it('without `after` the same tasks overlap (the wait is what `after` adds)', () => {
    const free = day({ ...plan, tasks: plan.tasks.map((x) => ({ ...x, after: [] })) });
    expect(work(free, 1).start).toBeLessThan(work(free, 0).end);
    expect(free.crew.EV2.blocks.some((b) => b.type === 'wait' && b.taskIndex !== undefined)).toBe(false);
  });

  it('a task for both waits for the later of its partner and what it is after', () => {
    const joint = day(
      buildDayPlan({
        tasks: [
          dayTask('Long prep', K.w3, 'EV2', 2400, { id: 1 }),
          dayTask('Short prep', K.w1, 'EV1', 60, { id: 2 }),
          dayTask('Together', K.w2, 'both', 600, { id: 3, after: [1] }),
        ],
      }),
    );
    expect(work(joint, 2).start).toBeGreaterThanOrEqual(work(joint, 0).end);
    const ev1 = joint.crew.EV1.blocks.filter((b) => b.type === 'wait' && b.taskIndex === 2);
    expect(ev1.length).toBeGreaterThan(0);
  });

  it('a task named in `after` that comes later in the plan is warned about and not waited for', () => {
    const swapped = day({ ...plan, tasks: [plan.tasks[1], plan.tasks[0]] });
    expect(swapped.warnings).toEqual([expect.objectContaining({ code: 'after-out-of-order', taskIndex: 0 })]);
    expect(swapped.crew.EV2.blocks.some((b) => b.type === 'wait' && b.taskIndex !== undefined)).toBe(false);
  });
});

describe('`after` on random plans (fast-check)', () => {
  const planArb = fc
    .array(
      fc.record({
        site: fc.constantFrom(K.w1, K.w2, K.w3),
        crew: fc.constantFrom('EV1' as const, 'EV2' as const, 'both' as const),
        duration: fc.integer({ min: 60, max: 1800 }),
        after: fc.array(fc.nat(), { maxLength: 3 }),
      }),
      { minLength: 1, maxLength: 8 },
    )
    .map((tasks) =>
      buildDayPlan({
        tasks: tasks.map((t, i) =>
          dayTask(`task ${i + 1}`, t.site, t.crew, t.duration, {
            id: 100 + i,
            // only earlier tasks: a plan in an order that keeps every `after`
            after: i === 0 ? [] : [...new Set(t.after.map((a) => 100 + (a % i)))],
          }),
        ),
      }),
    );

  it('every task starts its work no earlier than the end of each task it is after, and the day ends', () => {
    fc.assert(
      fc.property(planArb, (plan) => {
        const t = day(plan);
        plan.tasks.forEach((task, i) => {
          for (const id of task.after ?? []) {
            const j = plan.tasks.findIndex((x) => x.id === id);
            expect(work(t, i).start).toBeGreaterThanOrEqual(work(t, j).end - 1e-9);
          }
        });
        expect(t.warnings.filter((w) => w.code === 'after-out-of-order')).toEqual([]);
      }),
      { numRuns: 200 },
    );
  });
});

describe('task order rules', () => {
  const task = (id: number, after: number[] = []) => ({ id, title: `T${id}`, after });

  it('an unknown id, the task itself, and a duplicate id are each named by their path', () => {
    expect(taskOrderProblems([task(1, [7]), task(2, [2]), task(1)])).toEqual([
      { path: ['tasks', 2, 'id'], message: 'duplicate task id 1 (first at tasks[0])' },
      { path: ['tasks', 0, 'after', 0], message: 'no task of this plan has the id 7' },
      { path: ['tasks', 1, 'after', 0], message: 'a task cannot wait for itself' },
    ]);
  });

  it('a loop is reported once, at the entry that closes it, with the tasks it goes through', () => {
    expect(taskOrderProblems([task(1, [3]), task(2, [1]), task(3, [2]), task(4, [1])])).toEqual([
      {
        path: ['tasks', 1, 'after', 0],
        message:
          'this makes a loop of tasks that each wait for the next: task 1 "T1" → task 3 "T3" → task 2 "T2" → task 1 "T1"',
      },
    ]);
  });

  it('a chain and a diamond are fine', () => {
    expect(taskOrderProblems([task(1), task(2, [1]), task(3, [1]), task(4, [2, 3])])).toEqual([]);
  });
});
