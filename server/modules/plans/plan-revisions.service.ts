import { and, desc, eq, isNotNull } from 'drizzle-orm';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { planAudit, users } from '../../db/schema';
import { notFound } from '../../lib/http-error';
import { comparePlanRevisions, type PlanComparison } from '@shared/compute/plan-compare';
import type { PlanRevisionEntry, PlanView } from '@shared/schemas/plan-views';
import { planDaySummary, planStation } from './plan-timeline.service';
import { getPlan } from './plans.service';

/** A plan's revisions listed at the most (newest first); every one stays readable by version. */
export const REVISIONS_MAX = 500;

/**
 * Every revision of a plan, newest first: each change and review step made one (its audit row keeps
 * the plan as it was after it), so nothing a planner saved is ever out of reach.
 */
export function listPlanRevisions(db: Db, planId: number): PlanRevisionEntry[] {
  getPlan(db, planId);
  return db
    .select({
      version: planAudit.versionAfter,
      action: planAudit.action,
      userId: planAudit.userId,
      userName: users.name,
      createdAt: planAudit.createdAt,
    })
    .from(planAudit)
    .leftJoin(users, eq(users.id, planAudit.userId))
    .where(and(eq(planAudit.planId, planId), isNotNull(planAudit.afterJson)))
    .orderBy(desc(planAudit.id))
    .limit(REVISIONS_MAX)
    .all()
    .map((r) => ({
      version: r.version,
      action: r.action,
      user: r.userId !== null && r.userName !== null ? { id: r.userId, name: r.userName } : null,
      createdAt: r.createdAt,
    }));
}

/** The plan as it was at one of its versions. */
export function planAtVersion(db: Db, planId: number, version: number): PlanView {
  const row = db
    .select({ afterJson: planAudit.afterJson })
    .from(planAudit)
    .where(
      and(eq(planAudit.planId, planId), eq(planAudit.versionAfter, version), isNotNull(planAudit.afterJson)),
    )
    .orderBy(desc(planAudit.id))
    .get();
  if (!row) throw notFound(`Version ${version} of this plan`);
  return { editors: [], ...(JSON.parse(row.afterJson!) as Omit<PlanView, 'editors'>) };
}

/**
 * The plan's version when it was submitted the time before the last (null when it was submitted
 * once or never): what a reviewer compares with to see what changed since they last saw it.
 */
export function previousSubmissionVersion(db: Db, planId: number): number | null {
  const submits = db
    .select({ version: planAudit.versionAfter })
    .from(planAudit)
    .where(and(eq(planAudit.planId, planId), eq(planAudit.action, 'submit')))
    .orderBy(desc(planAudit.id))
    .limit(2)
    .all();
  return submits[1]?.version ?? null;
}

/**
 * What changed from version `from` to `to` of a plan (tasks, manifest, settings) and what it does to
 * the day: both days computed on the station version the plan is computed on now, so the difference
 * is the plan's own.
 */
export async function comparePlans(
  ctx: AppContext,
  planId: number,
  from: number,
  to: number,
): Promise<PlanComparison> {
  const current = getPlan(ctx.db, planId);
  const a = planAtVersion(ctx.db, planId, from);
  const b = planAtVersion(ctx.db, planId, to);
  const station = planStation(ctx, current);
  // both days off this thread (a route worker, when there is a pool), on the one station version
  // (a revision that named another station is computed on this one, as the plan is now)
  const on = (p: PlanView) => planDaySummary(ctx, { ...p, stationId: current.stationId }, { station });
  const [dayA, dayB] = await Promise.all([on(a), on(b)]);
  return comparePlanRevisions(from, a, dayA, to, b, dayB);
}
