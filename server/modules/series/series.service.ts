import { asc, desc, eq, inArray } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { plans, series, seriesPlans, users } from '../../db/schema';
import { badRequest, conflict, notFound, staleVersion } from '../../lib/http-error';
import { SeriesChain, carriedOverWarnings } from '@shared/compute/day/series';
import type { DayStart } from '@shared/compute/day/types';
import type {
  CreateSeriesInput,
  SeriesEva,
  SeriesListItem,
  SeriesView,
  UpdateSeriesInput,
} from '@shared/schemas/series';
import { recordActivity } from '../activity/activity.service';
import { planDaySummary, planStation } from '../plans/plan-timeline.service';
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

/** The plan as the day reads it: every item with its key (given, or `item-<n>`). */
const withItemKeys = (plan: PlanView) => ({
  ...plan,
  manifest: plan.manifest.map((m, i) => ({ ...m, key: m.key ?? `item-${i + 1}` })),
});

/** The airlock of the station version a plan is computed on (a day starts and ends there). */
function airlockOf(station: ReturnType<typeof planStation>): string {
  const airlock = station.doc.nodes.find((n) => n.kind === 'airlock');
  if (!airlock)
    throw badRequest(
      `The station "${station.doc.name}" has no airlock, so no EVA day can be laid out on it.`,
    );
  return airlock.key;
}

/**
 * The EVAs of a series in order, each on the station version it is computed on and starting where
 * the ones before left its items. The days are computed where a plan's timeline is (a route worker
 * when there is a pool); this thread keeps only the chain of item states between them. With
 * `alone`, each EVA that starts with carried-over items is also computed on its own, so the
 * warnings the carried-over start brings about can be told apart.
 */
async function seriesDays(
  ctx: AppContext,
  list: readonly PlanView[],
  alone: boolean,
  chain = new SeriesChain(),
) {
  const out = [];
  for (const [index, plan] of list.entries()) {
    const station = planStation(ctx, plan);
    const { start, foundOutside, warnings } = chain.begin(withItemKeys(plan), airlockOf(station));
    const [day, plain] = await Promise.all([
      planDaySummary(ctx, plan, { start, station }),
      alone && start.items ? planDaySummary(ctx, plan, { station }) : null,
    ]);
    if (plain) warnings.push(...carriedOverWarnings(day.warnings, plain.warnings));
    const outsideAfter = chain.end(index, day.itemsAtEnd);
    out.push({ start, foundOutside, day, outsideAfter, warnings });
  }
  return out;
}

/**
 * Where a plan's items start when it is an EVA of a series: where the EVAs before it left them
 * (computed afresh, so a change to an earlier EVA re-checks this one). Empty when it is in no series
 * or is the first EVA.
 */
export async function seriesStartOf(ctx: AppContext, plan: PlanView): Promise<DayStart> {
  const membership = seriesOfPlan(ctx.db, plan.id);
  if (!membership || membership.before.length === 0) return {};
  const chain = new SeriesChain();
  await seriesDays(
    ctx,
    membership.before.map((id) => getPlan(ctx.db, id)),
    false,
    chain,
  );
  return chain.begin(withItemKeys(plan), airlockOf(planStation(ctx, plan))).start;
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
export async function getSeries(ctx: AppContext, id: number): Promise<SeriesView> {
  const row = seriesRow(ctx.db, id);
  const authorName =
    row.authorId === null
      ? null
      : (ctx.db.select({ name: author.name }).from(author).where(eq(author.id, row.authorId)).get()?.name ??
        null);
  const list = planIdsOf(ctx.db, id).map((planId) => getPlan(ctx.db, planId));
  const days = await seriesDays(ctx, list, true);
  const evas: SeriesEva[] = list.map((p, i) => ({
    planId: p.id,
    title: p.title,
    status: p.status,
    version: p.version,
    date: p.date,
    endSeconds: days[i].day.endSeconds,
    marginSeconds: days[i].day.marginSeconds,
    warningCount: days[i].day.warnings.length,
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

export function createSeries(ctx: AppContext, input: CreateSeriesInput, actor: Actor): Promise<SeriesView> {
  return getSeries(ctx, insertSeries(ctx, input, actor));
}

/** Writes a new series and its activity line; answers its id without computing any EVA's day. */
export function insertSeries(ctx: AppContext, input: CreateSeriesInput, actor: Actor): number {
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
  return id;
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
): Promise<SeriesView> {
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
