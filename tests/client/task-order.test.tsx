import { describe, expect, it } from 'vitest';
import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { Task } from '@shared/schemas/plan';
import { waitingFor } from '@/features/plans/lib/task-order';
import { buildParsedTask } from '../factories/plan';
import { renderTasksEditor } from '../setup/client';

const task = (id: number, title: string, more: Partial<Task> = {}): Task =>
  buildParsedTask({ id, title, worksite: 'W1', ...more });

const tasks = [
  task(1, 'Open the panel'),
  task(2, 'Swap the box', { after: [1], optional: true }),
  task(3, 'Close the panel', { after: [1, 2] }),
];

describe('task order in the task list', () => {
  it('each row says which tasks it starts after and whether it is optional', async () => {
    const { container } = renderTasksEditor(tasks);
    const row = (n: number) => container.querySelector(`#plan-task-${n}`)!.textContent;
    expect(row(1)).not.toContain('After');
    expect(row(2)).toContain('After task 1');
    expect(row(2)).toContain('Optional (get-ahead)');
    expect(row(3)).toContain('After tasks 1, 2');
  });

  it('removing a task takes it out of the `after` of the tasks that waited for it', async () => {
    const { latest } = renderTasksEditor(tasks);
    await userEvent.setup().click(screen.getByRole('button', { name: 'Remove task 1' }));
    expect(latest().map((t) => [t.id, t.after])).toEqual([
      [2, []],
      [3, [2]],
    ]);
  });

  it('the tasks that wait for a task, directly or through others, cannot be chosen to come before it', () => {
    expect([...waitingFor(tasks, 1)].sort()).toEqual([2, 3]);
    expect([...waitingFor(tasks, 2)]).toEqual([3]);
    expect([...waitingFor(tasks, 3)]).toEqual([]);
  });
});
