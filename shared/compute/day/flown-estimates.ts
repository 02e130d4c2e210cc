import type { FlightEvent } from './run';

/** A run as the estimates read it: the plan's tasks as flown and the events logged. */
export interface FlownRun {
  tasks: readonly { id?: number; title: string; worksite: string }[];
  events: readonly FlightEvent[];
}

/** What the flights of one kind of task at one worksite took. */
export interface FlownEstimate {
  /** the task's title as last flown */
  title: string;
  worksite: string;
  /** how many runs flew it start to done */
  flights: number;
  /** the suggested estimate: the median of the flown lengths, in whole seconds */
  seconds: number;
  minSeconds: number;
  maxSeconds: number;
}

/** Tasks are of one kind when their titles match but for case, spacing and a trailing number ("#2"). */
export function taskKind(title: string): string {
  return title
    .toLowerCase()
    .replace(/\s*(#|no\.?\s*)?\d+\s*$/, '')
    .replace(/\s+/g, ' ')
    .trim();
}

const keyOf = (title: string, worksite: string) => `${worksite}\u0000${taskKind(title)}`;

function median(sorted: readonly number[]): number {
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/**
 * The flown length of each task of each run, start to done as logged (the last log of each; a task
 * for both lasts until the later of the two is done), grouped by kind of task and worksite. A task
 * never logged done, or done before it started, gives nothing.
 */
export function flownEstimates(runs: readonly FlownRun[]): FlownEstimate[] {
  const groups = new Map<string, { title: string; worksite: string; lengths: number[] }>();
  for (const run of runs) {
    const spans = new Map<number, { start?: number; end?: number }[]>();
    const byCrew = new Map<string, { start?: number; end?: number }>();
    for (const e of run.events) {
      if ((e.kind !== 'task-start' && e.kind !== 'task-done') || e.taskId == null) continue;
      const k = `${e.taskId}:${e.crew}`;
      let span = byCrew.get(k);
      if (!span) {
        span = {};
        byCrew.set(k, span);
        spans.set(e.taskId, [...(spans.get(e.taskId) ?? []), span]);
      }
      if (e.kind === 'task-start') span.start = e.at;
      else span.end = e.at;
    }
    for (const task of run.tasks) {
      if (task.id === undefined) continue;
      const logged = (spans.get(task.id) ?? []).filter(
        (s): s is { start: number; end: number } =>
          s.start !== undefined && s.end !== undefined && s.end >= s.start,
      );
      if (logged.length === 0) continue;
      const seconds = Math.max(...logged.map((s) => s.end)) - Math.min(...logged.map((s) => s.start));
      const key = keyOf(task.title, task.worksite);
      const group = groups.get(key) ?? { title: task.title, worksite: task.worksite, lengths: [] };
      group.title = task.title;
      group.lengths.push(seconds);
      groups.set(key, group);
    }
  }
  return [...groups.values()]
    .map((g) => {
      const sorted = [...g.lengths].sort((a, b) => a - b);
      return {
        title: g.title,
        worksite: g.worksite,
        flights: sorted.length,
        seconds: Math.round(median(sorted)),
        minSeconds: sorted[0],
        maxSeconds: sorted[sorted.length - 1],
      };
    })
    .sort((a, b) => a.worksite.localeCompare(b.worksite) || a.title.localeCompare(b.title));
}

/** The estimate flown for a task of this title at this worksite, if any was. */
export function flownEstimateFor(
  estimates: readonly FlownEstimate[],
  title: string,
  worksite: string,
): FlownEstimate | undefined {
  const key = keyOf(title, worksite);
  return taskKind(title) === '' ? undefined : estimates.find((e) => keyOf(e.title, e.worksite) === key);
}
