import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { ManifestItem, Task } from '@shared/schemas/plan';
import type { OtherTask } from '@/features/plans/components/after-chips';
import { TaskForm } from '@/features/plans/components/task-form';
import type { FlownEstimate } from '@shared/compute/day/flown-estimates';
import { ManifestEditor } from '@/features/plans/components/manifest-editor';
import { TimelineChart } from '@/features/plans/components/timeline-chart';
import type { PlanStationNodes, PlanTimeline } from '@/features/plans/types';
import { computeTimeline } from '@shared/compute/day/timeline';
import { CreatePlanInputSchema } from '@shared/schemas/plan';
import { LINE_KEYS, dayEngine, lineStationDocument } from '../factories/day';

afterEach(cleanup);

// the real day on the line station (10 s a metre), see tests/factories/day.ts
const engine = dayEngine(lineStationDocument());
const chartTasks: Task[] = [
  {
    title: 'Inspect hinge',
    worksite: LINE_KEYS.w3,
    crew: 'EV1',
    durationSeconds: 2700,
    eclipseOnly: false,
    carrying: false,
    tools: [],
    actions: [],
    after: [],
    optional: false,
  },
  // an hour of eclipse-only work cannot fit a night window of about 36 minutes
  {
    title: 'Mate connectors',
    worksite: LINE_KEYS.w2,
    crew: 'EV2',
    durationSeconds: 3600,
    eclipseOnly: true,
    carrying: false,
    tools: [],
    actions: [],
    after: [],
    optional: false,
  },
];

function chartTimeline(): PlanTimeline {
  const plan = CreatePlanInputSchema.parse({
    title: 'Chart day',
    stationId: 1,
    date: '2026-03-01',
    crew: { EV1: { name: 'Ada', tetherLengthM: 25.9 }, EV2: { name: 'Lars', tetherLengthM: 25.9 } },
    tasks: chartTasks,
  });
  const timeline = computeTimeline({ ...plan, manifest: [] }, engine.station, engine.route);
  return {
    ...timeline,
    planId: 1,
    planVersion: 1,
    stationId: 1,
    stationVersion: 1,
    airlockKey: LINE_KEYS.airlock,
    caution: '',
  };
}

const nodes: PlanStationNodes = {
  worksites: [{ key: 'W1', label: 'Pump bay', kind: 'worksite', position: [0, 0, 0] }],
  sockets: [
    { key: 'S1', kind: 'socket', position: [1, 0, 0] },
    { key: 'S2', kind: 'socket', position: [0, 2, 0] },
  ],
  all: [
    { key: 'W1', label: 'Pump bay', kind: 'worksite', position: [0, 0, 0] },
    { key: 'S1', kind: 'socket', position: [1, 0, 0] },
    { key: 'S2', kind: 'socket', position: [0, 2, 0] },
    { key: 'A9', kind: 'anchor', position: [0, 0, 3] },
  ],
  arms: [{ key: 'ARM-1', label: 'Main arm', baseNode: 'A9' }],
};

const manifest: ManifestItem[] = [
  {
    key: 'pfr-1',
    name: 'Foot restraint',
    kind: 'foot-restraint',
    quantity: 1,
    carriedBy: 'EV1',
    startsAt: 'airlock',
    leaveOutside: false,
  },
  {
    key: 'driver',
    name: 'Power driver',
    kind: 'tool',
    quantity: 1,
    carriedBy: 'EV2',
    startsAt: 'airlock',
    leaveOutside: false,
  },
  { key: 'pump', name: 'Pump module', kind: 'large-item', quantity: 1, startsAt: 'W1', leaveOutside: false },
];

const task: Task = {
  title: 'Swap the pump',
  worksite: 'W1',
  crew: 'both',
  durationSeconds: 1800,
  eclipseOnly: false,
  after: [],
  optional: false,
  carrying: false,
  tools: [],
  actions: [],
};

function renderTaskForm(given: Task = task, others: OtherTask[] = [], flownEstimates?: FlownEstimate[]) {
  const onSubmit = vi.fn<(task: Task, added: ManifestItem[]) => void>();
  render(
    <TaskForm
      task={given}
      others={others}
      nodes={nodes}
      manifest={manifest}
      onSubmit={onSubmit}
      onCancel={() => {}}
      flownEstimates={flownEstimates}
    />,
  );
  return { onSubmit, user: userEvent.setup() };
}

const apply = () => screen.getByRole('button', { name: 'Apply changes' });

describe('task form: flown durations as estimates', () => {
  const flown: FlownEstimate[] = [
    { title: 'Swap the pump', worksite: 'W1', flights: 3, seconds: 2460, minSeconds: 2100, maxSeconds: 2700 },
  ];

  it('offers what the same task took at the same worksite, and applies it only when the planner accepts', async () => {
    const { onSubmit, user } = renderTaskForm(task, [], flown);
    expect(screen.getByTestId('flown-estimate').textContent).toMatch(
      /Flown here: 41 min \(median of 3 runs, 35 min–45 min\)/,
    );
    // nothing applied yet: the duration is still the plan's
    expect((screen.getByLabelText(/^Duration/) as HTMLInputElement).value).toBe('0:30');
    await user.click(screen.getByRole('button', { name: 'Use 41 min' }));
    await user.click(apply());
    expect(onSubmit).toHaveBeenCalledWith(expect.objectContaining({ durationSeconds: 2460 }), []);
  });

  it('offers nothing for another kind of task, and follows the title as it is typed', async () => {
    const { user } = renderTaskForm({ ...task, title: 'Inspect the site' }, [], flown);
    expect(screen.queryByTestId('flown-estimate')).toBeNull();
    const title = screen.getByLabelText(/^Task title/);
    await user.clear(title);
    await user.type(title, 'swap the pump #2');
    expect(screen.getByTestId('flown-estimate')).toBeTruthy();
  });
});

describe('task form: order between tasks', () => {
  it('starts after the tasks chosen, is marked optional, and offers no task that waits for it', async () => {
    const { onSubmit, user } = renderTaskForm({ ...task, id: 3 }, [
      { id: 1, title: 'Stage the bag', position: 1, waitsForThis: false },
      { id: 2, title: 'Close out', position: 2, waitsForThis: true },
      { title: 'Just added', position: 4, waitsForThis: false },
    ]);
    expect(screen.getByRole('button', { name: /2\. Close out/ }).hasAttribute('disabled')).toBe(true);
    expect(screen.getByRole('button', { name: /4\. Just added/ }).hasAttribute('disabled')).toBe(true);
    await user.click(screen.getByRole('button', { name: /1\. Stage the bag/ }));
    await user.click(screen.getByLabelText(/Optional/));
    await user.click(apply());
    expect(onSubmit).toHaveBeenCalledOnce();
    const [saved] = onSubmit.mock.calls[0];
    expect(saved.after).toEqual([1]);
    expect(saved.optional).toBe(true);
    expect(saved.id).toBe(3);
  });
});

describe('task form: foot restraints for a task for both', () => {
  it('names each member’s socket, and refuses one restraint for two people', async () => {
    const { onSubmit, user } = renderTaskForm();
    await user.selectOptions(screen.getByLabelText('EV1 foot restraint'), 'S1');
    await user.selectOptions(screen.getByLabelText('EV2 foot restraint'), 'S1');
    await user.click(apply());
    expect(await screen.findByText(/cannot stand in one foot restraint/)).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();

    await user.selectOptions(screen.getByLabelText('EV2 foot restraint'), 'S2');
    await user.click(apply());
    expect(onSubmit).toHaveBeenCalledOnce();
    const [saved] = onSubmit.mock.calls[0];
    expect(saved.sockets).toEqual({ EV1: 'S1', EV2: 'S2' });
    expect(saved.socket).toBeUndefined();
  });

  it('a one-person task has one socket field and no sockets', async () => {
    const { onSubmit, user } = renderTaskForm({ ...task, crew: 'EV2' });
    expect(screen.queryByLabelText('EV1 foot restraint')).toBeNull();
    await user.selectOptions(screen.getByLabelText('Foot-restraint socket'), 'S2');
    await user.click(apply());
    const [saved] = onSubmit.mock.calls[0];
    expect(saved.socket).toBe('S2');
    expect(saved.sockets).toBeUndefined();
  });
});

describe('task form: a task done from an arm', () => {
  it('a task for both: the rider stands on the arm, the partner keeps their socket', async () => {
    const { onSubmit, user } = renderTaskForm({ ...task, sockets: { EV1: 'S1', EV2: 'S2' } });
    await user.selectOptions(screen.getByLabelText('Done from an arm'), 'ARM-1');
    await user.click(apply());
    expect(await screen.findByText('the node where the rider gets on')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();

    await user.type(screen.getByLabelText('Gets on at'), 'A9');
    await user.selectOptions(screen.getByLabelText('Arm rider'), 'EV1');
    await user.click(apply());
    const [saved] = onSubmit.mock.calls[0];
    expect(saved.arm).toEqual({ key: 'ARM-1', ingress: 'A9', rider: 'EV1' });
    expect(saved.sockets).toEqual({ EV2: 'S2' });
  });

  it('editing an arm task keeps its arm; choosing no arm drops it', async () => {
    const armTask: Task = { ...task, crew: 'EV2', arm: { key: 'ARM-1', ingress: 'A9', egress: 'S1' } };
    const { onSubmit, user } = renderTaskForm(armTask);
    expect(screen.queryByLabelText('Foot-restraint socket')).toBeNull();
    await user.click(apply());
    expect(onSubmit.mock.calls[0][0].arm).toEqual({ key: 'ARM-1', ingress: 'A9', egress: 'S1' });
    await user.selectOptions(screen.getByLabelText('Done from an arm'), '');
    await user.click(apply());
    expect(onSubmit.mock.calls[1][0].arm).toBeUndefined();
  });
});

describe('task form: item actions', () => {
  it('a hand-over says who gives the item; the form refuses it without', async () => {
    const { onSubmit, user } = renderTaskForm();
    await user.click(screen.getByRole('button', { name: 'Add an item action' }));
    const row = within(screen.getByRole('list', { name: 'Item actions' })).getAllByRole('listitem')[0];
    await user.selectOptions(within(row).getByLabelText('Action 1'), 'hand-over');
    await user.selectOptions(within(row).getByLabelText('Item'), 'pump');
    await user.click(apply());
    expect(await within(row).findByText(/say who hands the item over/)).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();

    await user.selectOptions(within(row).getByLabelText('By'), 'EV2');
    await user.click(apply());
    expect(onSubmit).toHaveBeenCalledOnce();
    expect(onSubmit.mock.calls[0][0].actions).toEqual([{ do: 'hand-over', item: 'pump', by: 'EV2' }]);
  });

  it('installing a restraint in a one-person task takes the task’s socket; a tool cannot be installed', async () => {
    const { onSubmit, user } = renderTaskForm({ ...task, crew: 'EV1', socket: 'S1' });
    await user.click(screen.getByRole('button', { name: 'Add an item action' }));
    await user.selectOptions(screen.getByLabelText('Action 1'), 'install');
    await user.selectOptions(screen.getByLabelText('Item'), 'driver');
    await user.click(apply());
    expect(await screen.findByText(/only a foot restraint or a tether anchor can be installed/)).toBeTruthy();

    await user.selectOptions(screen.getByLabelText('Item'), 'pfr-1');
    await user.click(apply());
    expect(onSubmit).toHaveBeenCalledOnce();
    expect(onSubmit.mock.calls[0][0].actions).toEqual([{ do: 'install', item: 'pfr-1' }]);
  });

  it('an action may name another place near the worksite', async () => {
    const { onSubmit, user } = renderTaskForm({ ...task, crew: 'EV1' });
    await user.click(screen.getByRole('button', { name: 'Add an item action' }));
    await user.selectOptions(screen.getByLabelText('Action 1'), 'set-down');
    await user.selectOptions(screen.getByLabelText('Item'), 'driver');
    await user.type(screen.getByLabelText('Where'), 'A9');
    await user.click(screen.getByRole('button', { name: 'Add an item action' }));
    await user.click(screen.getByRole('button', { name: 'Remove action 2' }));
    await user.click(apply());
    expect(onSubmit.mock.calls[0][0].actions).toEqual([{ do: 'set-down', item: 'driver', at: 'A9' }]);
  });
});

describe('task form: tools at hand', () => {
  it('picks manifest items by key, and a new tool goes on the manifest only when used', async () => {
    const { onSubmit, user } = renderTaskForm({ ...task, crew: 'EV2', tools: ['Power driver'] });
    const chips = screen.getByRole('group', { name: 'Manifest items' });
    // an older plan's tool named by its item's name shows as that item, picked
    expect(
      within(chips)
        .getByRole('button', { name: /Power driver/ })
        .getAttribute('aria-pressed'),
    ).toBe('true');

    await user.type(screen.getByLabelText('New tool for the manifest'), 'Torque wrench{Enter}');
    await user.type(screen.getByLabelText('New tool for the manifest'), 'Spare bag');
    await user.click(screen.getByRole('button', { name: 'Add to manifest' }));
    await user.click(within(chips).getByRole('button', { name: /Spare bag/ }));
    await user.click(apply());

    const [saved, added] = onSubmit.mock.calls[0];
    expect(saved.tools).toEqual(['driver', 'torque-wrench']);
    expect(added).toEqual([
      {
        key: 'torque-wrench',
        name: 'Torque wrench',
        kind: 'tool',
        quantity: 1,
        carriedBy: 'EV2',
        startsAt: 'airlock',
        leaveOutside: false,
      },
    ]);
  });
});

describe('manifest editor', () => {
  it('adds an item with its key, installed place and end of day', async () => {
    const onChange = vi.fn<(m: ManifestItem[]) => void>();
    const user = userEvent.setup();
    render(<ManifestEditor manifest={manifest} onChange={onChange} readOnly={false} places={['S1', 'A9']} />);
    await user.click(screen.getByRole('button', { name: 'Add an item' }));
    const dialog = screen.getByRole('dialog');
    await user.type(within(dialog).getByLabelText('Name'), 'Power driver');
    expect(within(dialog).getByText('power-driver')).toBeTruthy();
    await user.selectOptions(within(dialog).getByLabelText('Kind'), 'tool');
    await user.type(within(dialog).getByLabelText('Installed at'), 'A9');
    await user.click(within(dialog).getByRole('button', { name: 'Add item' }));
    expect(
      await within(dialog).findByText(/only a foot restraint or a tether anchor can start installed/),
    ).toBeTruthy();
    expect(onChange).not.toHaveBeenCalled();

    await user.selectOptions(within(dialog).getByLabelText('Kind'), 'tether-anchor');
    await user.click(within(dialog).getByLabelText(/Stays outside at the end of the day/));
    await user.click(within(dialog).getByRole('button', { name: 'Add item' }));
    expect(onChange).toHaveBeenCalledOnce();
    const added = onChange.mock.calls[0][0].at(-1);
    expect(added).toMatchObject({
      key: 'power-driver',
      name: 'Power driver',
      kind: 'tether-anchor',
      installedAt: 'A9',
      leaveOutside: true,
    });
  });
});

describe('timeline chart: the 3D day’s cursor, picking a block, eclipse-only work outside night', () => {
  it('marks on the chart each work block the day warns is outside night, and hands a clicked block over', async () => {
    const timeline = chartTimeline();
    const onPick = vi.fn();
    const user = userEvent.setup();
    const { container } = render(
      <TimelineChart timeline={timeline} tasks={chartTasks} onPick={onPick} cursor={1234.4} />,
    );
    const warned = new Set(
      timeline.warnings.filter((w) => w.code === 'eclipse-only-outside-night').map((w) => w.taskIndex),
    );
    expect(warned.size, 'the day puts an eclipse-only task outside night').toBe(1);
    const marked = [...container.querySelectorAll('[data-outside-night]')];
    const workOf = (i: number) =>
      (['EV1', 'EV2'] as const)
        .flatMap((m) => timeline.crew[m].blocks)
        .filter((b) => b.type === 'work' && b.taskIndex === i);
    expect(marked.length).toBe([...warned].flatMap((i) => workOf(i!)).length);
    for (const el of marked)
      expect(el.getAttribute('aria-label')).toMatch(/eclipse-only but not inside a night window/);
    expect(container.querySelector('[data-testid="timeline-cursor"]')?.getAttribute('data-t')).toBe('1234');

    const ev2 = screen.getByRole('list', { name: 'EV2 blocks' });
    const work = within(ev2)
      .getAllByRole('listitem')
      .find((el) => el.getAttribute('data-block-type') === 'work')!;
    await user.click(work);
    const block = timeline.crew.EV2.blocks.find((b) => b.type === 'work')!;
    expect(onPick).toHaveBeenLastCalledWith({ crew: 'EV2', block });
    work.focus();
    await user.keyboard('{Enter}');
    expect(onPick).toHaveBeenCalledTimes(2);
  });
});
