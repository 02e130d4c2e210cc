import { and, desc, eq } from 'drizzle-orm';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { plans, stations, users, walkthroughs } from '../../db/schema';
import { badRequest, notFound, staleVersion } from '../../lib/http-error';
import { planPlaybackOf, positionsOf } from '@shared/compute/plan-playback';
import { routeWalkthrough } from '@shared/compute/walkthrough';
import { notesOnSteps } from '@shared/compute/station-notes';
import type { StationDocument, Vec3 } from '@shared/schemas/station';
import {
  routeSummaryText,
  WalkthroughRouteSpecSchema,
  type CreateWalkthroughInput,
  type PlanPlayback,
  type RoutePlayback,
  type UpdateWalkthroughInput,
  type Walkthrough,
  type WalkthroughDetail,
  type WalkthroughNotes,
  type WalkthroughRouteSpec,
  type WalkthroughSummary,
} from '@shared/schemas/walkthrough';
import { recordActivity } from '../activity/activity.service';
import { openNodeNotes } from '../annotations/annotations.service';
import { getCompiledStation } from '../compute/compiled-cache';
import { routeOn } from '../compute/compute.service';
import { planTimeline } from '../plans/plan-timeline.service';
import { PLANNING_CAUTION } from '../plans/plans.service';

export interface Actor {
  id: number;
  name: string;
}

type Row = typeof walkthroughs.$inferSelect;

function parseRoute(json: string | null): WalkthroughRouteSpec | null {
  return json ? WalkthroughRouteSpecSchema.parse(JSON.parse(json)) : null;
}

function parseNotes(json: string): WalkthroughNotes {
  return JSON.parse(json) as WalkthroughNotes;
}

/** One query for the list and the detail: the walkthrough with its station, plan and author. */
function selectWalkthroughs(db: Db) {
  return db
    .select({
      w: walkthroughs,
      stationName: stations.name,
      stationVersion: stations.version,
      planTitle: plans.title,
      planStatus: plans.status,
      planVersion: plans.version,
      authorName: users.name,
    })
    .from(walkthroughs)
    .innerJoin(stations, eq(stations.id, walkthroughs.stationId))
    .leftJoin(plans, eq(plans.id, walkthroughs.planId))
    .leftJoin(users, eq(users.id, walkthroughs.authorId));
}

type Joined = NonNullable<ReturnType<ReturnType<typeof selectWalkthroughs>['get']>>;

const currentVersionOf = (j: Joined) => (j.w.planId !== null ? (j.planVersion ?? 0) : j.stationVersion);

function toWalkthrough(j: Joined): Walkthrough {
  const { w } = j;
  return {
    id: w.id,
    name: w.name,
    kind: w.planId !== null ? 'plan' : 'route',
    stationId: w.stationId,
    stationName: j.stationName,
    planId: w.planId,
    plan:
      w.planId !== null && j.planTitle !== null
        ? { id: w.planId, title: j.planTitle, status: j.planStatus!, version: j.planVersion! }
        : null,
    route: parseRoute(w.routeJson),
    basedOnVersion: w.basedOnVersion,
    notes: parseNotes(w.notesJson),
    version: w.version,
    authorId: w.authorId,
    authorName: j.authorName,
    createdAt: w.createdAt,
    updatedAt: w.updatedAt,
  };
}

export function listWalkthroughs(
  db: Db,
  filter: { planId?: number; stationId?: number } = {},
): WalkthroughSummary[] {
  const where = and(
    filter.planId ? eq(walkthroughs.planId, filter.planId) : undefined,
    filter.stationId ? eq(walkthroughs.stationId, filter.stationId) : undefined,
  );
  return selectWalkthroughs(db)
    .where(where)
    .orderBy(desc(walkthroughs.updatedAt), desc(walkthroughs.id))
    .all()
    .map((j) => {
      const w = toWalkthrough(j);
      return {
        id: w.id,
        name: w.name,
        kind: w.kind,
        stationId: w.stationId,
        stationName: w.stationName,
        plan: w.plan,
        routeSummary: w.route ? routeSummaryText(w.route) : null,
        authorName: w.authorName,
        updatedAt: w.updatedAt,
        noteCount: Object.keys(w.notes).length,
        stale: currentVersionOf(j) !== w.basedOnVersion,
      };
    });
}

function findJoined(db: Db, id: number): Joined {
  const j = selectWalkthroughs(db).where(eq(walkthroughs.id, id)).get();
  if (!j) throw notFound('Walkthrough');
  return j;
}

export function getWalkthrough(db: Db, id: number): Walkthrough {
  return toWalkthrough(findJoined(db, id));
}

const nodesByKey = (doc: StationDocument) => new Map(doc.nodes.map((n) => [n.key, n]));

/** The plan's playback, from the same timeline `GET /api/plans/:id/timeline` returns. */
export function planPlayback(
  ctx: AppContext,
  planId: number,
): { playback: PlanPlayback; planVersion: number } {
  const { plan, timeline } = planTimeline(ctx, planId);
  const { doc } = getCompiledStation(ctx, plan.stationId);
  return {
    playback: planPlaybackOf(timeline, plan, timeline.airlockKey, doc.nodes),
    planVersion: plan.version,
  };
}

type RoutePlaybackResult =
  | { ok: true; playback: RoutePlayback; stationVersion: number }
  | { ok: false; reason: string; stationVersion: number };

export function routePlayback(
  ctx: AppContext,
  stationId: number,
  spec: WalkthroughRouteSpec,
): RoutePlaybackResult {
  const entry = getCompiledStation(ctx, stationId);
  const route = routeOn(entry, spec, 'body.route');
  if (!route.feasible) return { ok: false, reason: route.reason, stationVersion: entry.version };
  const byKey = nodesByKey(entry.doc);
  const track = routeWalkthrough(route, (key) => (byKey.get(key)?.position as Vec3 | undefined) ?? [0, 0, 0]);
  return {
    ok: true,
    stationVersion: entry.version,
    playback: {
      kind: 'route',
      track,
      tetherLengthM: route.tetherLengthM,
      mode: route.mode,
      lengthM: route.lengthM,
      swapCount: route.swapCount,
      endSeconds: track.endSeconds,
      nightWindows: [],
      positions: positionsOf(byKey, [track], route.nodes),
      warnings: route.warnings,
    },
  };
}

function changeNotice(kind: 'plan' | 'route', based: number, current: number) {
  const what = kind === 'plan' ? 'plan' : 'station model';
  return `The ${what} has changed since these notes were written (version ${based}, now ${current}). The steps below are computed from the current ${what}; notes are kept by step number, so check each one is still on the right step, then accept the current version.`;
}

export function walkthroughDetail(ctx: AppContext, id: number): WalkthroughDetail {
  const walkthrough = getWalkthrough(ctx.db, id);
  let detail: Omit<WalkthroughDetail, 'changedSince' | 'notice' | 'walkthrough' | 'caution' | 'stationNotes'>;
  if (walkthrough.planId !== null) {
    const { playback, planVersion } = planPlayback(ctx, walkthrough.planId);
    detail = { playback, currentVersion: planVersion };
  } else {
    const result = routePlayback(ctx, walkthrough.stationId, walkthrough.route!);
    detail = result.ok
      ? { playback: result.playback, currentVersion: result.stationVersion }
      : {
          playback: null,
          unavailableReason: `The route cannot be walked on the current station model: ${result.reason}`,
          currentVersion: result.stationVersion,
        };
  }
  const changedSince = detail.currentVersion !== walkthrough.basedOnVersion;
  const playback = detail.playback;
  const steps = !playback
    ? []
    : playback.kind === 'plan'
      ? [...playback.crews.EV1.steps, ...playback.crews.EV2.steps]
      : playback.track.steps;
  return {
    walkthrough,
    ...detail,
    stationNotes: steps.length ? notesOnSteps(openNodeNotes(ctx.db, walkthrough.stationId), steps) : [],
    changedSince,
    ...(changedSince
      ? { notice: changeNotice(walkthrough.kind, walkthrough.basedOnVersion, detail.currentVersion) }
      : {}),
    caution: PLANNING_CAUTION,
  };
}

export function createWalkthrough(
  ctx: AppContext,
  input: CreateWalkthroughInput,
  actor: Actor,
): WalkthroughDetail {
  let basedOnVersion: number;
  if (input.planId !== undefined) {
    const plan = ctx.db
      .select({ stationId: plans.stationId, version: plans.version })
      .from(plans)
      .where(eq(plans.id, input.planId))
      .get();
    if (!plan) throw notFound('Plan');
    if (plan.stationId !== input.stationId) {
      throw badRequest('The plan is on another station.', [
        { path: 'body.stationId', message: `the plan is on station ${plan.stationId}` },
      ]);
    }
    // computing it now refuses a plan that cannot be laid out (e.g. a station with no airlock)
    basedOnVersion = planPlayback(ctx, input.planId).planVersion;
  } else {
    const result = routePlayback(ctx, input.stationId, input.route!);
    if (!result.ok)
      throw badRequest(`No walkable route: ${result.reason}`, [
        { path: 'body.route', message: result.reason },
      ]);
    basedOnVersion = result.stationVersion;
  }
  const row = ctx.db
    .insert(walkthroughs)
    .values({
      name: input.name,
      stationId: input.stationId,
      planId: input.planId ?? null,
      routeJson: input.route ? JSON.stringify(input.route) : null,
      basedOnVersion,
      notesJson: '{}',
      version: 1,
      authorId: actor.id,
    })
    .returning({ id: walkthroughs.id })
    .get();
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'walkthrough.created',
    summary: `${actor.name} saved the walkthrough "${input.name}"`,
    link: `/walkthroughs/${row.id}`,
  });
  return walkthroughDetail(ctx, row.id);
}

function staleError(current: Row, version: number) {
  return staleVersion('The walkthrough', version, {
    currentVersion: current.version,
    changedBy: null,
    changedAt: current.updatedAt,
  });
}

export function updateWalkthrough(
  ctx: AppContext,
  id: number,
  input: UpdateWalkthroughInput,
  actor: Actor,
): WalkthroughDetail {
  const j = findJoined(ctx.db, id);
  const current = j.w;
  if (current.version !== input.version) throw staleError(current, input.version);
  const set: Partial<typeof walkthroughs.$inferInsert> = {};
  if (input.name !== undefined) set.name = input.name;
  if (input.notes) {
    const notes = parseNotes(current.notesJson);
    for (const [stepId, text] of Object.entries(input.notes)) {
      const trimmed = text.trim();
      if (trimmed) notes[stepId] = trimmed;
      else delete notes[stepId];
    }
    set.notesJson = JSON.stringify(notes);
  }
  if (input.rebase) set.basedOnVersion = currentVersionOf(j);
  const updated = ctx.db
    .update(walkthroughs)
    .set({ ...set, version: current.version + 1, updatedAt: new Date().toISOString() })
    .where(and(eq(walkthroughs.id, id), eq(walkthroughs.version, input.version)))
    .returning({ id: walkthroughs.id })
    .get();
  if (!updated) throw staleError(getRow(ctx.db, id), input.version);
  if (input.rebase) {
    recordActivity(ctx.db, {
      userId: actor.id,
      kind: 'walkthrough.rebased',
      summary: `${actor.name} checked the walkthrough "${set.name ?? current.name}" against the current version`,
      link: `/walkthroughs/${id}`,
    });
  }
  return walkthroughDetail(ctx, id);
}

function getRow(db: Db, id: number): Row {
  const row = db.select().from(walkthroughs).where(eq(walkthroughs.id, id)).get();
  if (!row) throw notFound('Walkthrough');
  return row;
}

export function deleteWalkthrough(ctx: AppContext, id: number, version: number | undefined) {
  const row = getRow(ctx.db, id);
  if (version !== undefined && row.version !== version) throw staleError(row, version);
  ctx.db.delete(walkthroughs).where(eq(walkthroughs.id, id)).run();
}
