import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { planStationNotices, plans, stationVersions, users } from '../../db/schema';
import { describeTouch, planFootprint, planTouches, type PlanFootprint } from '@shared/compute/plan-touches';
import type { AffectedPlan, PlanChangeControl, PlanStationNotice } from '@shared/schemas/plan-views';
import type { StationDocument } from '@shared/schemas/station';
import { recordActivity } from '../activity/activity.service';
import { getCompiledStationAt, stationVersion } from '../compute/compiled-cache';
import { stationDocumentAt } from '../stations/station-versions.service';
import type { Editor } from '../stations/stations.service';
import { planTimelineOn } from './plan-day';
import { planStationVersion } from './plan-timeline.service';
import { authorOf, getPlan, sendQuietly, type PlanView } from './plans.service';

/** Plans in review or approved are the ones a station change must not reach silently. */
const REVIEWED = ['in-review', 'approved'] as const;
/** A station write looks at this many reviewed plans at the most (bounded work per write). */
export const AFFECTED_PLANS_MAX = 100;

const footprints = new WeakMap<Db, Map<string, PlanFootprint>>();
const FOOTPRINTS_KEEP = 64;

/** What a plan stands on in one station version: its day computed there, once per plan and station version. */
function footprintOf(ctx: AppContext, plan: PlanView, version: number): PlanFootprint {
  let cache = footprints.get(ctx.db);
  if (!cache) footprints.set(ctx.db, (cache = new Map()));
  const key = `${plan.id}:${plan.version}@${version}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const fp = planFootprint(plan, planTimelineOn(getCompiledStationAt(ctx, plan.stationId, version), plan));
  cache.set(key, fp);
  while (cache.size > FOOTPRINTS_KEEP) cache.delete(cache.keys().next().value!);
  return fp;
}

function noticesOf(db: Db, planId: number): PlanStationNotice[] {
  return db
    .select({ n: planStationNotices, userName: users.name })
    .from(planStationNotices)
    .leftJoin(users, eq(users.id, planStationNotices.userId))
    .where(eq(planStationNotices.planId, planId))
    .orderBy(desc(planStationNotices.id))
    .limit(50)
    .all()
    .map(({ n, userName }) => ({
      id: n.id,
      stationVersion: n.stationVersion,
      planStatus: n.planStatus,
      user: n.userId !== null && userName !== null ? { id: n.userId, name: userName } : null,
      summary: n.summary,
      touches: JSON.parse(n.touchesJson) as PlanStationNotice['touches'],
      createdAt: n.createdAt,
    }));
}

/**
 * What a plan says about its station: the version it is computed on, and for an approved plan whose
 * station has moved on since, that it has, with the changes since approval that touch its tasks,
 * routes and sockets; and the station writes listed on it while it was in review or approved.
 */
export function planChangeControl(ctx: AppContext, plan: PlanView): PlanChangeControl {
  const current = stationVersion(ctx.db, plan.stationId) ?? 0;
  const computedOn = planStationVersion(ctx, plan);
  const approvedOn = plan.status === 'approved' ? plan.approvedStationVersion : null;
  const changed = approvedOn != null && approvedOn !== current;
  return {
    stationVersion: computedOn,
    currentStationVersion: current,
    stationChangedSinceApproval: changed,
    stationChanges: changed
      ? planTouches(
          stationDocumentAt(ctx.db, plan.stationId, approvedOn),
          stationDocumentAt(ctx.db, plan.stationId, current),
          footprintOf(ctx, plan, approvedOn),
        )
      : [],
    stationNotices: noticesOf(ctx.db, plan.id),
  };
}

/** The reviewed plans on a station, and the version each stands on before a write making `version`. */
function reviewedPlans(ctx: AppContext, stationId: number, before: number) {
  return ctx.db
    .select({ id: plans.id })
    .from(plans)
    .where(and(eq(plans.stationId, stationId), inArray(plans.status, [...REVIEWED])))
    .orderBy(asc(plans.id))
    .limit(AFFECTED_PLANS_MAX)
    .all()
    .map(({ id }) => {
      const plan = getPlan(ctx.db, id);
      // an approved plan stands on its approval's version; one in review on the station as it was
      const on =
        plan.status === 'approved' && plan.approvedStationVersion != null
          ? plan.approvedStationVersion
          : before;
      return { plan, on };
    });
}

function touchedPlans(
  ctx: AppContext,
  stationId: number,
  before: StationDocument,
  after: StationDocument,
  beforeVersion: number,
) {
  return reviewedPlans(ctx, stationId, beforeVersion)
    .map(({ plan, on }) => ({ plan, touches: planTouches(before, after, footprintOf(ctx, plan, on)) }))
    .filter((p) => p.touches.length > 0);
}

const affected = (p: PlanView): AffectedPlan => ({
  id: p.id,
  title: p.title,
  status: p.status as AffectedPlan['status'],
});

/** The reviewed plans a station write would touch, were the station to become `after` (a dry run). */
export function previewAffectedPlans(
  ctx: AppContext,
  stationId: number,
  fromVersion: number,
  after: StationDocument,
): AffectedPlan[] {
  const before = stationDocumentAt(ctx.db, stationId, fromVersion);
  return touchedPlans(ctx, stationId, before, after, fromVersion).map((p) => affected(p.plan));
}

/**
 * After a station write made `version`: the reviewed plans it touches get it listed on them (with
 * what it touches), their authors a mail; the answer names them.
 */
export async function noticeStationWrite(
  ctx: AppContext,
  stationId: number,
  version: number,
  editor: Editor,
): Promise<AffectedPlan[]> {
  if (version <= 1) return [];
  const row = ctx.db
    .select({ summaryJson: stationVersions.summaryJson })
    .from(stationVersions)
    .where(and(eq(stationVersions.stationId, stationId), eq(stationVersions.version, version)))
    .get();
  if (!row) return [];
  // no plan in review or approved on the station: nothing to touch, no versions to rebuild
  if (reviewedPlans(ctx, stationId, version - 1).length === 0) return [];
  const before = stationDocumentAt(ctx.db, stationId, version - 1);
  const after = stationDocumentAt(ctx.db, stationId, version);
  const touched = touchedPlans(ctx, stationId, before, after, version - 1);
  if (touched.length === 0) return [];
  const summary = (JSON.parse(row.summaryJson) as string[]).join(', ') || 'changed the model';
  ctx.db.transaction((tx) => {
    for (const { plan, touches } of touched) {
      tx.insert(planStationNotices)
        .values({
          planId: plan.id,
          stationId,
          stationVersion: version,
          planStatus: plan.status,
          userId: editor.id,
          summary,
          touchesJson: JSON.stringify(touches),
        })
        .run();
    }
  });
  for (const { plan, touches } of touched) {
    recordActivity(ctx.db, {
      userId: editor.id,
      kind: 'plan.station-changed',
      summary: `${editor.name} changed ${plan.stationName} under the ${plan.status === 'approved' ? 'approved' : 'in-review'} plan "${plan.title}"`,
      link: `/plans/${plan.id}`,
    });
    const author = authorOf(ctx.db, plan);
    if (!author || author.disabled) continue;
    await sendQuietly(ctx, {
      to: author.email,
      subject: `Station changed under "${plan.title}"`,
      text: [
        `Hello ${author.name},`,
        '',
        `${editor.name} changed the station ${plan.stationName} (now version ${version}: ${summary}). Your EVA plan "${plan.title}" is ${plan.status === 'approved' ? 'approved' : 'in review'}, and the change touches it:`,
        '',
        ...touches.map((t) => `- ${describeTouch(t)}`),
        '',
        plan.status === 'approved'
          ? 'The approved plan is still computed on the station version it was approved on; review it against the new version and return it if it must change.'
          : 'The plan is computed on the current station: its reviewers see the change.',
        '',
        `Open the plan: ${ctx.config.publicOrigin}/plans/${plan.id}`,
      ].join('\n'),
    });
  }
  return touched.map((p) => affected(p.plan));
}
