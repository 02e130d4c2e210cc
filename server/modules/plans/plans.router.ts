import type { Request } from 'express';
import { z } from 'zod';
import type { Permission } from '@shared/auth/permissions';
import type { AppContext } from '../../context';
import { JsonText, defineRoute, mountRoutes } from '../../lib/route';
import { IdParamsSchema } from '@shared/schemas/auth';
import {
  CreatePlanInputSchema,
  PlanStatusSchema,
  ReturnPlanInputSchema,
  ReviewActionInputSchema,
  UpdatePlanInputSchema,
} from '@shared/schemas/plan';
import { VersionSchema, VersionTextSchema } from '@shared/schemas/version';
import {
  approvePlan,
  createPlan,
  deletePlan,
  duplicatePlan,
  getPlan,
  listPlans,
  returnPlan,
  submitPlan,
  updatePlan,
} from './plans.service';
import { PreviewPlanInputSchema, SequenceInputSchema } from '@shared/schemas/sequence';
import { planDayOutput, previewTimeline } from './plan-timeline.service';
import { planChangeControl } from './plan-station.service';
import { seriesStartOf } from '../series/series.service';
import { comparePlans, listPlanRevisions, previousSubmissionVersion } from './plan-revisions.service';
import type { PlanDetail } from '@shared/schemas/plan-views';
import { exportFileName } from './plan-export.service';
import { answered } from '../events/changes';
import { recordRoutes } from '../events/record-routes';
import { openNodeNotes } from '../annotations/annotations.service';

const ReviewBodySchema = ReviewActionInputSchema.extend({ version: VersionSchema });
/** `stationVersion`: the station version the reviewer saw the plan computed on; stale → 409 */
const ApproveBodySchema = ReviewBodySchema.extend({ stationVersion: VersionSchema.optional() });
const ReturnBodySchema = ReturnPlanInputSchema.extend({ version: VersionSchema });
const ListQuerySchema = z.strictObject({
  status: PlanStatusSchema.optional(),
  stationId: z.coerce.number().int().positive().optional(),
});
const DuplicateBodySchema = z.strictObject({ title: z.string().trim().min(1).max(200).optional() });
const CompareQuerySchema = z.strictObject({ from: VersionTextSchema, to: VersionTextSchema });
const DeleteQuerySchema = z.strictObject({
  version: VersionTextSchema,
});

function reviewRoute(
  action: 'submit',
  access: Permission,
  run: (req: Request, planId: number, body: z.infer<typeof ReviewBodySchema>) => unknown,
) {
  return defineRoute({
    method: 'post',
    path: `/:id/${action}`,
    access,
    input: { params: IdParamsSchema, body: ReviewBodySchema },
    handler: (req, _res, { params, body }) => run(req, params.id, body),
    emits: answered('plan'),
  });
}

/**
 * Plans: CRUD, the review cycle, the timeline and its exports. Editing is locked (409) while a plan
 * is in review or approved; a reviewer — or the author, to withdraw it — returns it to draft first.
 */
export function plansRouter(ctx: AppContext) {
  return mountRoutes('/api/plans', [
    defineRoute({
      method: 'get',
      path: '/',
      access: 'read',
      input: { query: ListQuerySchema },
      handler: (_req, _res, { query }) => listPlans(ctx.db, query),
    }),
    ...recordRoutes(
      ctx,
      'plan',
      { read: 'read', write: 'plans:edit' },
      {
        create: [CreatePlanInputSchema, createPlan],
        get: (id): PlanDetail => {
          const plan = getPlan(ctx.db, id);
          return {
            ...plan,
            ...planChangeControl(ctx, plan),
            previousSubmissionVersion: previousSubmissionVersion(ctx.db, plan.id),
          };
        },
        update: [UpdatePlanInputSchema, updatePlan],
        remove: [DeleteQuerySchema, deletePlan],
      },
    ),
    reviewRoute('submit', 'plans:submit', (req, id, body) =>
      submitPlan(ctx, id, body.version, body.comment || undefined, req.user!),
    ),
    defineRoute({
      method: 'post',
      path: '/:id/approve',
      access: 'plans:review',
      input: { params: IdParamsSchema, body: ApproveBodySchema },
      handler: (req, _res, { params, body }) =>
        approvePlan(ctx, params.id, body.version, body.comment || undefined, req.user!, body.stationVersion),
      emits: answered('plan'),
    }),
    defineRoute({
      method: 'post',
      path: '/:id/return',
      access: 'plans:review',
      input: { params: IdParamsSchema, body: ReturnBodySchema },
      handler: (req, _res, { params, body }) =>
        returnPlan(ctx, params.id, body.version, body.comment, req.user!),
      emits: answered('plan'),
    }),
    defineRoute({
      method: 'post',
      path: '/:id/duplicate',
      access: 'plans:edit',
      status: 201,
      input: { params: IdParamsSchema, body: DuplicateBodySchema },
      handler: (req, _res, { params, body }) => duplicatePlan(ctx, params.id, req.user!, body.title),
      emits: answered('plan'),
    }),
    defineRoute({
      method: 'get',
      path: '/:id/revisions',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: (_req, _res, { params }) => listPlanRevisions(ctx.db, params.id),
    }),
    defineRoute({
      method: 'get',
      path: '/:id/compare',
      access: 'read',
      input: { params: IdParamsSchema, query: CompareQuerySchema },
      handler: (_req, _res, { params, query }) => comparePlans(ctx, params.id, query.from, query.to),
    }),
    defineRoute({
      method: 'get',
      path: '/:id/timeline',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: async (_req, _res, { params }) => {
        const plan = getPlan(ctx.db, params.id);
        const { stationChangedSinceApproval, stationChanges } = planChangeControl(ctx, plan);
        const { result } = await planDayOutput(ctx, params.id, 'timeline', {
          plan,
          start: await seriesStartOf(ctx, plan),
          extra: {
            stationChangedSinceApproval,
            stationChanges,
            notes: openNodeNotes(ctx.db, plan.stationId),
          },
        });
        return new JsonText('text' in result ? result.text : '');
      },
    }),
    defineRoute({
      method: 'post',
      path: '/:id/timeline-preview',
      access: 'read',
      input: { params: IdParamsSchema, body: PreviewPlanInputSchema },
      handler: async (_req, _res, { params, body }) =>
        new JsonText(await previewTimeline(ctx, params.id, body)),
    }),
    defineRoute({
      method: 'post',
      path: '/:id/sequence',
      access: 'read',
      input: { params: IdParamsSchema, body: SequenceInputSchema },
      handler: async (_req, _res, { params, body }) => {
        const plan = getPlan(ctx.db, params.id);
        const { result } = await planDayOutput(ctx, params.id, 'sequence', {
          plan,
          start: await seriesStartOf(ctx, plan),
          sequence: { budgetMs: body.budgetMs },
        });
        return new JsonText('text' in result ? result.text : '');
      },
    }),
    defineRoute({
      method: 'get',
      path: '/:id/export.csv',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: async (_req, res, { params }) => {
        const plan = getPlan(ctx.db, params.id);
        const { result } = await planDayOutput(ctx, params.id, 'csv', {
          plan,
          start: await seriesStartOf(ctx, plan),
        });
        res
          .type('text/csv; charset=utf-8')
          .attachment(exportFileName(plan, 'csv'))
          .send('text' in result ? result.text : '');
      },
    }),
    defineRoute({
      method: 'get',
      path: '/:id/export.pdf',
      access: 'read',
      input: { params: IdParamsSchema },
      handler: async (_req, res, { params }) => {
        const plan = getPlan(ctx.db, params.id);
        const { result } = await planDayOutput(ctx, params.id, 'pdf', {
          plan,
          start: await seriesStartOf(ctx, plan),
          extra: { notes: openNodeNotes(ctx.db, plan.stationId) },
        });
        const pdf = 'bytes' in result ? Buffer.from(result.bytes) : Buffer.alloc(0);
        res.type('application/pdf').attachment(exportFileName(plan, 'pdf')).send(pdf);
      },
    }),
  ]);
}
