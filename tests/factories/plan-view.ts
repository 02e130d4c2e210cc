import { computeTimeline } from '@shared/compute/day/timeline';
import { CreatePlanInputSchema, type Task } from '@shared/schemas/plan';
import type { PlanTimeline, PlanView } from '@shared/schemas/plan-views';
import { LINE_KEYS, dayEngine, lineStationDocument } from './day';

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

// the real day on the line station (10 s a metre, 12 m default tether), see tests/factories/day.ts
let engine: ReturnType<typeof dayEngine> | undefined;

/** The plan's day as `GET /api/plans/:id/timeline` answers it, computed on the line station. */
export function buildPlanTimeline(plan: PlanView): PlanTimeline {
  engine ??= dayEngine(lineStationDocument());
  const timeline = computeTimeline(
    { ...plan, manifest: plan.manifest.map((m, i) => ({ ...m, key: m.key ?? `item-${i + 1}` })) },
    engine.station,
    engine.route,
  );
  return {
    ...timeline,
    planId: plan.id,
    planVersion: plan.version,
    stationId: 1,
    stationVersion: 1,
    airlockKey: LINE_KEYS.airlock,
    caution: '',
  };
}
