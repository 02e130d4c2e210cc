import {
  MAX_TASKS,
  TaskSchema,
  type CreatePlanInputSchema,
  type ManifestItemInput,
  type Task,
  type TaskInput,
} from '@shared/schemas/plan';
import type { z } from 'zod';
import { FIXTURE_KEYS as K } from './station-document';

/** A plan body as sent: the contract's input, with the task and item lists always there. */
export type PlanInput = z.input<typeof CreatePlanInputSchema> & {
  tasks: TaskInput[];
  manifest: ManifestItemInput[];
};

/** A task at the factory station's worksite: EV1, ten minutes, no socket, no tools. */
export function buildTask(overrides: Partial<TaskInput> = {}): TaskInput {
  return {
    title: 'Inspect the pump site',
    worksite: K.worksite,
    crew: 'EV1',
    durationSeconds: 600,
    ...overrides,
  };
}

/** `buildTask` as the schema reads it: every default filled in, as a plan's task comes back. */
export function buildParsedTask(overrides: Partial<TaskInput> = {}): Task {
  return TaskSchema.parse(buildTask(overrides));
}

/** A tool EV1 carries out of the airlock and brings back. */
export function buildManifestItem(overrides: Partial<ManifestItemInput> = {}): ManifestItemInput {
  return { name: 'Torque wrench', kind: 'tool', carriedBy: 'EV1', endsAt: 'airlock', ...overrides };
}

/**
 * A `POST /api/plans` body for a station built by `buildStationDocument`: two crew on the
 * commonly reported 85 ft (25.9 m) tether, one task, nothing on the manifest. Override what a
 * test is about.
 */
export function buildPlanInput(stationId: number, overrides: Partial<PlanInput> = {}): PlanInput {
  return {
    title: 'Pump site inspection',
    stationId,
    date: '2031-03-14',
    crew: {
      EV1: { name: 'Ana Vidal', tetherLengthM: 25.9 },
      EV2: { name: 'Bo Lindgren', tetherLengthM: 25.9 },
    },
    tasks: [buildTask()],
    manifest: [],
    ...overrides,
  };
}

/**
 * A long day on a generated truss: `tasks` tasks (the most a plan may have by default) of two minutes
 * each unless told, at the worksites in a fixed stride, for EV1, EV2 and both in turn, within a 24 h
 * limit. Worksites repeat once the stride has gone round them, so the day's legs repeat too.
 */
export function buildLongPlanInput(
  stationId: number,
  worksites: readonly string[],
  { tasks = MAX_TASKS, stride = 7, durationSeconds = 120 } = {},
) {
  return {
    title: 'Long day',
    stationId,
    date: '2031-01-01',
    crew: { EV1: { name: 'A', tetherLengthM: 25.9 }, EV2: { name: 'B', tetherLengthM: 25.9 } },
    timeLimitSeconds: 24 * 3600,
    tasks: Array.from({ length: tasks }, (_, i) => ({
      title: `Task ${i + 1}`,
      worksite: worksites[(i * stride) % worksites.length],
      crew: (['EV1', 'EV2', 'both'] as const)[i % 3],
      durationSeconds,
    })),
  };
}
