import {
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
