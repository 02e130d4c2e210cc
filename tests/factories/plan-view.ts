import { CreatePlanInputSchema, type Task } from '@shared/schemas/plan';
import type { PlanView } from '@shared/schemas/plan-views';

/**
 * A draft plan as `GET /api/plans/:id` answers it (id 7, version 3, written by Priya) on station 1,
 * with the given tasks: what the client's plan screens start from. Override what a test is about.
 */
export function buildPlanView(tasks: Task[] = [], overrides: Partial<PlanView> = {}): PlanView {
  const input = CreatePlanInputSchema.parse({
    title: 'Test EVA',
    stationId: 1,
    date: '2026-03-01',
    crew: { EV1: { name: 'Ada', tetherLengthM: 25.9 }, EV2: { name: 'Lars', tetherLengthM: 16.8 } },
    tasks,
  });
  return {
    ...input,
    id: 7,
    status: 'draft',
    version: 3,
    authorId: 1,
    createdAt: '2026-01-01T00:00:00Z',
    updatedAt: '2026-01-01T00:00:00Z',
    reviewComments: [],
    stationName: 'Line Station',
    authorName: 'Priya',
    approverName: null,
    editors: [{ id: 1, name: 'Priya' }],
    ...overrides,
  };
}
