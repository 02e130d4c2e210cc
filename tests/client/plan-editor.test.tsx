import { describe, expect, it } from 'vitest';
import { act, render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import fc from 'fast-check';
import type { Task } from '@shared/schemas/plan';
import { TimelineChart } from '@/features/plans/components/timeline-chart';
import { describeDifferences, draftChanges, draftFromPlan, moveItem } from '@/features/plans/lib/plan-draft';
import type { PlanView } from '@/features/plans/types';
import { LINE_KEYS } from '../factories/day';
import { buildPlanTimeline as planTimeline, buildPlanView } from '../factories/plan-view';
import { buildParsedTask } from '../factories/plan';
import { renderTasksEditor } from '../setup/client';

const tasks: Task[] = [
  buildParsedTask({
    title: 'Mate connectors',
    worksite: LINE_KEYS.w2,
    crew: 'both',
    durationSeconds: 1200,
    eclipseOnly: true,
  }),
  buildParsedTask({ title: 'Inspect hinge', worksite: LINE_KEYS.w3, crew: 'EV1', durationSeconds: 2700 }),
  buildParsedTask({ title: 'Route cable', worksite: LINE_KEYS.w1, crew: 'EV2', durationSeconds: 3600 }),
];

function planView(overrides: Partial<PlanView> = {}): PlanView {
  return buildPlanView(tasks, overrides);
}

describe('plan draft helpers', () => {
  it('moveItem keeps every item and puts the moved one where it was asked to go (property)', () => {
    fc.assert(
      fc.property(
        fc
          .array(fc.integer(), { minLength: 1, maxLength: 20 })
          .chain((list) => fc.tuple(fc.constant(list), fc.nat(list.length - 1), fc.nat(list.length - 1))),
        ([list, from, to]) => {
          const moved = moveItem(list, from, to);
          expect([...moved].sort((a, b) => a - b)).toEqual([...list].sort((a, b) => a - b));
          expect(moved[to]).toBe(list[from]);
          expect(moveItem(moved, to, from)).toEqual(list);
        },
      ),
    );
  });

  it('sends only the changed fields with the version read, and nothing when nothing changed', () => {
    const base = draftFromPlan(planView());
    expect(draftChanges(base, structuredClone(base), 3)).toBeNull();
    const edited = { ...base, title: 'Renamed', tasks: moveItem(base.tasks, 0, 2) };
    const body = draftChanges(base, edited, 3);
    expect(Object.keys(body ?? {}).sort()).toEqual(['tasks', 'title', 'version']);
    expect(body?.tasks?.map((t) => t.title)).toEqual(['Inspect hinge', 'Route cable', 'Mate connectors']);
  });

  it('lists, field by field, where the server’s plan differs from the draft', () => {
    const mine = draftFromPlan(planView());
    const theirs = structuredClone(mine);
    theirs.tasks[1].durationSeconds = 3600;
    theirs.crew.EV2.name = 'Mira';
    theirs.manifest.push({
      name: 'Torque wrench',
      kind: 'tool',
      quantity: 1,
      carriedBy: 'EV1',
      startsAt: 'airlock',
      leaveOutside: false,
    });
    const lines = describeDifferences(mine, theirs);
    expect(lines).toContain('EV2 name: Lars → Mira');
    expect(lines).toContain('Task 2 “Inspect hinge”: duration 0:45 → 1:00');
    expect(lines).toContain('Manifest items: 0 in your copy, 1 now');
    expect(describeDifferences(mine, structuredClone(mine))).toEqual([]);
  });
});

describe('timeline chart', () => {
  it('draws one band per night window, every block of both lanes, and the route of a focused block', async () => {
    const plan = planView();
    const timeline = planTimeline(plan);
    const { container } = render(<TimelineChart timeline={timeline} tasks={plan.tasks} />);
    expect(timeline.nightWindows.length).toBeGreaterThan(0);
    expect(container.querySelectorAll('[data-night-band]').length).toBe(timeline.nightWindows.length);
    const blocks = timeline.crew.EV1.blocks.length + timeline.crew.EV2.blocks.length;
    expect(container.querySelectorAll('[data-block-type]').length).toBe(blocks);
    expect(container.querySelectorAll('[data-block-type="work"]').length).toBe(4);

    const translate = container.querySelector<SVGGElement>('[data-block-type="translate"]')!;
    act(() => translate.focus());
    expect(container.textContent).toMatch(/Whole route: AL → W2, 21\.5 m/);
    expect(translate.getAttribute('aria-label')).toMatch(
      /^EV1 Translate: Translate AL → \w+, 0:30 to 0:3\d$/,
    );
  });
});

describe('timeline chart keyboard', () => {
  it('is one Tab stop: arrow keys move along a lane and to the other crew member, Home and End to the ends', async () => {
    const user = userEvent.setup();
    const plan = planView();
    const timeline = planTimeline(plan);
    const { container } = render(
      <>
        <button type="button">before</button>
        <TimelineChart timeline={timeline} tasks={plan.tasks} />
        <button type="button">after</button>
      </>,
    );
    const blocks = [...container.querySelectorAll<SVGGElement>('[data-block-type]')];
    expect(blocks.filter((b) => b.getAttribute('tabindex') === '0')).toHaveLength(1);
    await user.click(screen.getByRole('button', { name: 'before' }));
    await user.tab();
    const ev1 = timeline.crew.EV1.blocks;
    const label = () => document.activeElement?.getAttribute('aria-label') ?? '';
    expect(label()).toMatch(/^EV1 /);
    await user.keyboard('{ArrowRight}');
    expect(document.activeElement).toBe(blocks[1]);
    await user.keyboard('{End}');
    expect(document.activeElement).toBe(blocks[ev1.length - 1]);
    await user.keyboard('{Home}{ArrowRight}{ArrowDown}');
    // EV2's block under way when EV1's second block starts
    const t = ev1[1].start;
    const ev2 = timeline.crew.EV2.blocks;
    const k = Math.max(
      0,
      ev2.findLastIndex((b) => b.start <= t),
    );
    expect(document.activeElement).toBe(blocks[ev1.length + k]);
    expect(label()).toMatch(/^EV2 /);
    // the next Tab leaves the chart at once: the place moved with the arrows, so it is still one stop
    await user.tab();
    expect(document.activeElement).toBe(screen.getByRole('button', { name: 'after' }));
    await user.tab({ shift: true });
    expect(document.activeElement).toBe(blocks[ev1.length + k]);
  });
});

describe('task list reordering', () => {
  it('moves a focused task with Alt+↑ and announces the move', async () => {
    const user = userEvent.setup();
    const { container, latest } = renderTasksEditor(tasks, new Map([[0, 1]]));
    act(() => container.querySelector<HTMLLIElement>('#plan-task-3')!.focus());
    await user.keyboard('{Alt>}{ArrowUp}{/Alt}');
    expect(latest().map((t) => t.title)).toEqual(['Mate connectors', 'Route cable', 'Inspect hinge']);
    expect(screen.getByText('Moved task “Route cable” to position 2 of 3.')).toBeTruthy();
    expect(container.querySelector('#plan-task-1')?.textContent).toContain('⚠ 1 warning');

    // without Alt the arrow keys stay with the page, on the focused task as on any element
    expect(document.activeElement?.id).toMatch(/^plan-task-\d$/);
    await user.keyboard('{ArrowDown}');
    expect(latest().map((t) => t.title)).toEqual(['Mate connectors', 'Route cable', 'Inspect hinge']);
  });
});
