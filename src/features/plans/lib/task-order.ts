import type { Task } from '@shared/schemas/plan';

/** Ids of the tasks that wait, directly or through others, for the task with `id` (by `after`). */
export function waitingFor(tasks: readonly Pick<Task, 'id' | 'after'>[], id: number): Set<number> {
  const out = new Set<number>();
  const stack = [id];
  while (stack.length) {
    const at = stack.pop()!;
    for (const t of tasks) {
      if (t.id === undefined || out.has(t.id) || !t.after.includes(at)) continue;
      out.add(t.id);
      stack.push(t.id);
    }
  }
  return out;
}

/** The list without the task at `index`, and without any `after` entry that named it. */
export function removeTask(tasks: readonly Task[], index: number): Task[] {
  const id = tasks[index]?.id;
  return tasks
    .filter((_, i) => i !== index)
    .map((t) =>
      id !== undefined && t.after.includes(id) ? { ...t, after: t.after.filter((a) => a !== id) } : t,
    );
}

/** 1-based positions in the list of the tasks a task is after (unknown ids left out). */
export function afterPositions(tasks: readonly Pick<Task, 'id'>[], after: readonly number[]): number[] {
  return after.map((id) => tasks.findIndex((t) => t.id === id) + 1).filter((p) => p > 0);
}
