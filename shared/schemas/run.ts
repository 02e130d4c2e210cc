import { z } from 'zod';
import { RUN_EVENT_KINDS, type RunProjection } from '../compute/day/run';
import type { WireTimeline } from '../compute/day/wire';
import { CrewMemberSchema, type CrewMember } from './plan';
import type { PlanView } from './plan-views';
import { VersionSchema } from './version';

/** The longest EVA a run logs, in seconds of elapsed time: a day. */
export const MAX_RUN_SECONDS = 24 * 3600;
/** Events one run keeps: far beyond a day of start and done logs for two. */
export const MAX_RUN_EVENTS = 5000;

export const OpenRunInputSchema = z.strictObject({
  /** when EVA elapsed time 0 was, GMT */
  startedAt: z.iso.datetime({ offset: true, message: 'startedAt must be an ISO date and time' }),
});
export type OpenRunInput = z.infer<typeof OpenRunInputSchema>;

export const RunEventKindSchema = z.enum(RUN_EVENT_KINDS);

export const RunEventInputSchema = z
  .strictObject({
    crew: CrewMemberSchema,
    kind: RunEventKindSchema,
    taskId: z.number().int('must be a whole number').positive('must be positive').optional(),
    at: z
      .number()
      .finite('must be a finite number')
      .min(0, 'must be at least 0')
      .max(MAX_RUN_SECONDS, `must be at most ${MAX_RUN_SECONDS} s`),
    text: z.string().trim().max(2000, 'text must be at most 2000 characters').optional(),
    /** the run's version the logger saw: an append on a stale one is refused with 409 */
    version: VersionSchema.optional(),
  })
  .superRefine((e, ctx) => {
    const forTask = e.kind === 'task-start' || e.kind === 'task-done';
    if (forTask && e.taskId === undefined)
      ctx.addIssue({ code: 'custom', path: ['taskId'], message: `a ${e.kind} names its task` });
    if (!forTask && e.taskId !== undefined && e.kind !== 'note')
      ctx.addIssue({ code: 'custom', path: ['taskId'], message: `a ${e.kind} names no task` });
    if (e.kind === 'note' && !e.text)
      ctx.addIssue({ code: 'custom', path: ['text'], message: 'a note has text' });
  });
export type RunEventInput = z.infer<typeof RunEventInputSchema>;

export const RunQuerySchema = z.strictObject({
  /** seconds of EVA elapsed time to project from (default: the clock since `startedAt`) */
  at: z.coerce.number().finite().min(0).max(MAX_RUN_SECONDS).optional(),
});

export interface RunEvent {
  id: number;
  crew: CrewMember;
  kind: z.infer<typeof RunEventKindSchema>;
  taskId: number | null;
  at: number;
  text: string | null;
  userId: number | null;
  userName: string | null;
  createdAt: string;
}

export interface RunSummary {
  id: number;
  planId: number;
  planVersion: number;
  planTitle: string;
  startedAt: string;
  version: number;
  openedBy: string | null;
  createdAt: string;
}

/** `GET /api/runs/:id`: the run, its events, and the day as flown and re-projected from now. */
export interface RunView extends Omit<RunProjection, 'planned' | 'projected'> {
  run: RunSummary;
  /** the plan as it was when the run opened */
  plan: Pick<PlanView, 'id' | 'title' | 'stationId' | 'crew' | 'tasks'> & { startGmt: string | null };
  airlockKey: string;
  events: RunEvent[];
  /** the approved day and the re-projected one, as the timeline travels on the wire */
  planned: WireTimeline;
  projected: WireTimeline;
  plannedEndSeconds: number;
  plannedMarginSeconds: number;
  projectedEndSeconds: number;
  marginSeconds: number;
  tasks: { id: number | null; title: string; crew: string; worksite: string; optional: boolean }[];
  caution: string;
}
