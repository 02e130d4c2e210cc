import type { CrewMember } from '../../schemas/plan';
import type { FlightEvent, RunEventKind } from './run';
import { membersOf } from './timeline';

/** The next thing a crew member's one key logs: the step after the last one logged for them. */
export interface NextRunStep {
  crew: CrewMember;
  kind: Exclude<RunEventKind, 'note'>;
  taskId?: number;
  /** what the key does, in words */
  label: string;
}

interface StepTask {
  id?: number;
  title: string;
  crew: CrewMember | 'both';
}

/**
 * The step a crew member's key logs next: out of the airlock, then each of their tasks in plan order
 * (start, then done; a joint task logged by either member counts for both), then ingress (either
 * member starts and ends it for both). Null when the crew member has nothing left to log.
 */
export function nextRunStep(
  tasks: readonly StepTask[],
  events: readonly FlightEvent[],
  crew: CrewMember,
): NextRunStep | null {
  const logged = (kind: RunEventKind, task?: StepTask) =>
    events.some(
      (e) =>
        e.kind === kind &&
        (task === undefined
          ? kind.startsWith('ingress') || e.crew === crew
          : e.taskId === task.id && (task.crew === 'both' || e.crew === crew)),
    );
  if (logged('ingress-done')) return null;
  if (logged('ingress-start')) return { crew, kind: 'ingress-done', label: 'Ingress done' };
  if (!logged('egress-done')) return { crew, kind: 'egress-done', label: 'Egress done' };
  for (const task of tasks) {
    if (task.id === undefined || !membersOf(task).includes(crew) || logged('task-done', task)) continue;
    return logged('task-start', task)
      ? { crew, kind: 'task-done', taskId: task.id, label: `Done: ${task.title}` }
      : { crew, kind: 'task-start', taskId: task.id, label: `Start: ${task.title}` };
  }
  return { crew, kind: 'ingress-start', label: 'Ingress start' };
}
