import { asc, desc, eq, inArray } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { plans, series, seriesPlans, users } from '../../db/schema';
import { badRequest, conflict, notFound, staleVersion } from '../../lib/http-error';
import { computeSeries, type SeriesEvaInput } from '@shared/compute/day/series';
import { dayStationOf } from '@shared/compute/day/station';
import type { DayStart } from '@shared/compute/day/types';
import type {
  CreateSeriesInput,
  SeriesEva,
  SeriesListItem,
  SeriesView,
  UpdateSeriesInput,
} from '@shared/schemas/series';
import { recordActivity } from '../activity/activity.service';
import { routeOffPath } from '../compute/clip-builder';
import { planStation } from '../plans/plan-timeline.service';
import { getPlan, type Actor, type PlanView } from '../plans/plans.service';

const author = alias(users, 'author');

type SeriesRow = typeof series.$inferSelect;

function seriesRow(db: Db, id: number): SeriesRow {
  const row = db.select().from(series).where(eq(series.id, id)).get();
  if (!row) throw notFound('Series');
  return row;
}

function planIdsOf(db: Db, seriesId: number): number[] {
  return db
    .select({ planId: seriesPlans.planId })
    .from(seriesPlans)
    .where(eq(seriesPlans.seriesId, seriesId))
    .orderBy(asc(seriesPlans.ord))
    .all()
    .map((r) => r.planId);
}

/** A plan's series and the plans before it there, or null when it is in none. */
export function seriesOfPlan(db: Db, planId: number): { seriesId: number; before: number[] } | null {
  const row = db
    .select({ seriesId: seriesPlans.seriesId })
    .from(seriesPlans)
    .where(eq(seriesPlans.planId, planId))
    .get();
  if (!row) return null;
  const ids = planIdsOf(db, row.seriesId);
  return { seriesId: row.seriesId, before: ids.slice(0, ids.indexOf(planId)) };
}

/** Each EVA's day input: the plan on the station version it is computed on. */
function evaInput(ctx: AppContext, plan: PlanView): SeriesEvaInput {
  const entry = planStation(ctx, plan);
  const station = dayStationOf(entry.doc, entry.compiled);
  if (!station)
    throw badRequest(`The station "${entry.doc.name}" has no airlock, so no EVA day can be laid out on it.`);
  return {
    plan: { ...plan, manifest: plan.manifest.map((m, i) => ({ ...m, key: m.key ?? `item-${i + 1}` })) },
    station,
    route: (request) => routeOffPath(entry.compiled, entry.doc, request),
  };
}

/**
 * Where a plan's items start when it is an EVA of a series: where the EVAs before it left them
 * (computed afresh, so a change to an earlier EVA re-checks this one). Empty when it is in no series
 * or is the first EVA.
 */
export function seriesStartOf(ctx: AppContext, plan: PlanView): DayStart {
  const membership = seriesOfPlan(ctx.db, plan.id);
  if (!membership || membership.before.length === 0) return {};
  const evas = [...membership.before.map((id) => evaInput(ctx, getPlan(ctx.db, id))), evaInput(ctx, plan)];
  return computeSeries(evas)[evas.length - 1].start;
}

/**
 * The plans of a series: each must exist, all on one station, none in another series. A plan of
 * this series (`seriesId`) may stay.
 */
function checkPlans(db: Db, planIds: readonly number[], seriesId: number | null) {
  const rows = db
    .select({ id: plans.id, stationId: plans.stationId, title: plans.title })
    .from(plans)
    .where(inArray(plans.id, [...planIds]))
    .all();
  const missing = planIds.filter((id) => !rows.some((r) => r.id === id));
  if (missing.length)
    throw badRequest(
      `There is no plan ${missing.join(', ')}.`,
      missing.map((id) => ({ path: `body.planIds.${planIds.indexOf(id)}`, message: 'no such plan' })),
    );
  const stationsUsed = new Set(rows.map((r) => r.stationId));
  if (stationsUsed.size > 1)
    throw badRequest('The EVAs of a series are on one station.', [
      { path: 'body.planIds', message: 'the plans are on different stations' },
    ]);
  const elsewhere = db
    .select({ planId: seriesPlans.planId, seriesId: seriesPlans.seriesId })
    .from(seriesPlans)
    .where(inArray(seriesPlans.planId, [...planIds]))
    .all()
    .filter((r) => r.seriesId !== seriesId);
  if (elsewhere.length)
    throw conflict(
      'A plan is in one series at most.',
      elsewhere.map((r) => ({
        path: `body.planIds.${planIds.indexOf(r.planId)}`,
        message: `plan ${r.planId} is in series ${r.seriesId}`,
      })),
    );
}

function writePlanIds(db: Db, seriesId: number, planIds: readonly number[]) {
  db.delete(seriesPlans).where(eq(seriesPlans.seriesId, seriesId)).run();
  planIds.forEach((planId, ord) => db.insert(seriesPlans).values({ seriesId, planId, ord }).run());
}

export function listSeries(db: Db): SeriesListItem[] {
  return db
    .select()
    .from(series)
    .orderBy(desc(series.updatedAt), desc(series.id))
    .all()
    .map((s) => ({
      id: s.id,
      title: s.title,
      version: s.version,
      planIds: planIdsOf(db, s.id),
      updatedAt: s.updatedAt,
    }));
}

/** The series with every EVA's day computed in order, each starting where the one before left its items. */
export function getSeries(ctx: AppContext, id: number): SeriesView {
  const row = seriesRow(ctx.db, id);
  const authorName =
    row.authorId === null
      ? null
      : (ctx.db.select({ name: author.name }).from(author).where(eq(author.id, row.authorId)).get()?.name ??
        null);
  const list = planIdsOf(ctx.db, id).map((planId) => getPlan(ctx.db, planId));
  const days = computeSeries(list.map((p) => evaInput(ctx, p)));
  const evas: SeriesEva[] = list.map((p, i) => ({
    planId: p.id,
    title: p.title,
    status: p.status,
    version: p.version,
    date: p.date,
    endSeconds: days[i].timeline.endSeconds,
    marginSeconds: days[i].timeline.marginSeconds,
    warningCount: days[i].timeline.warnings.length,
    foundOutside: days[i].foundOutside,
    outsideAfter: days[i].outsideAfter,
    carriedOver: days[i].warnings,
  }));
  return {
    id: row.id,
    title: row.title,
    version: row.version,
    stationId: list[0]?.stationId ?? null,
    authorId: row.authorId,
    authorName,
    createdAt: row.createdAt,
    updatedAt: row.updatedAt,
    evas,
  };
}

export function createSeries(ctx: AppContext, input: CreateSeriesInput, actor: Actor): SeriesView {
  const id = ctx.db.transaction((tx) => {
    const db = tx as unknown as Db;
    checkPlans(db, input.planIds, null);
    const row = db
      .insert(series)
      .values({ title: input.title, authorId: actor.id })
      .returning({ id: series.id })
      .get();
    writePlanIds(db, row.id, input.planIds);
    return row.id;
  });
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'series.created',
    summary: `${actor.name} planned the series "${input.title}" (${input.planIds.length} EVA${input.planIds.length === 1 ? '' : 's'})`,
    link: `/series/${id}`,
  });
  return getSeries(ctx, id);
}

function assertSeriesVersion(db: Db, row: SeriesRow, version: number) {
  if (row.version !== version)
    throw staleVersion('The series', version, {
      currentVersion: row.version,
      changedBy: null,
      changedAt: row.updatedAt,
    });
}

/** Bumps a series' version (its EVAs changed: one was deleted, or its list was edited). */
export function bumpSeries(db: Db, row: SeriesRow, set: Partial<typeof series.$inferInsert> = {}) {
  const done = db
    .update(series)
    .set({ ...set, version: row.version + 1, updatedAt: new Date().toISOString() })
    .where(eq(series.id, row.id))
    .run();
  if (done.changes !== 1)
    throw conflict('The series was changed at the same moment; reload it and try again.');
}

export function updateSeries(
  ctx: AppContext,
  id: number,
  input: UpdateSeriesInput,
  actor: Actor,
): SeriesView {
  ctx.db.transaction((tx) => {
    const db = tx as unknown as Db;
    const row = seriesRow(db, id);
    assertSeriesVersion(db, row, input.version);
    if (input.planIds) {
      checkPlans(db, input.planIds, id);
      writePlanIds(db, id, input.planIds);
    }
    bumpSeries(db, row, input.title ? { title: input.title } : {});
  });
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'series.updated',
    summary: `${actor.name} changed the series "${seriesRow(ctx.db, id).title}"`,
    link: `/series/${id}`,
  });
  return getSeries(ctx, id);
}

/** Deletes a series; its plans stay, each an EVA on its own again. */
export function deleteSeries(ctx: AppContext, id: number, version: number, actor: Actor) {
  const title = ctx.db.transaction((tx) => {
    const db = tx as unknown as Db;
    const row = seriesRow(db, id);
    assertSeriesVersion(db, row, version);
    db.delete(series).where(eq(series.id, id)).run();
    return row.title;
  });
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'series.deleted',
    summary: `${actor.name} deleted the series "${title}" (its plans stay)`,
  });
}
