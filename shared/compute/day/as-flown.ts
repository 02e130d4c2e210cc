import type { CrewMember } from '../../schemas/plan';
import type { ActualBlock } from './run';
import type { Timeline } from './types';

/** One task of one crew member, planned beside flown (seconds of EVA elapsed time; null: not flown). */
export interface AsFlownRow {
  taskIndex: number;
  crew: CrewMember;
  plannedStart: number;
  plannedEnd: number;
  flownStart: number | null;
  flownEnd: number | null;
}

/** The as-flown record: every task's work block of the plan, each beside its flown stretch. */
export function asFlownRows(planned: Timeline, actual: Record<CrewMember, ActualBlock[]>): AsFlownRow[] {
  const rows: AsFlownRow[] = [];
  for (const crew of ['EV1', 'EV2'] as const)
    for (const b of planned.crew[crew].blocks) {
      if (b.type !== 'work' || b.taskIndex === undefined) continue;
      const flown = actual[crew].find(
        (a) => a.type === 'work' && a.taskIndex === b.taskIndex && !a.inProgress,
      );
      rows.push({
        taskIndex: b.taskIndex,
        crew,
        plannedStart: b.start,
        plannedEnd: b.end,
        flownStart: flown?.start ?? null,
        flownEnd: flown?.end ?? null,
      });
    }
  return rows.sort((a, b) => a.plannedStart - b.plannedStart || a.crew.localeCompare(b.crew));
}
