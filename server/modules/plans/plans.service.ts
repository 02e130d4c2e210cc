import { and, asc, desc, eq, gt, inArray, isNotNull, ne, notInArray, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/sqlite-core';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import {
  crewSlots,
  manifestItems,
  planAudit,
  plans,
  reviewComments,
  series,
  seriesPlans,
  stations,
  tasks,
  users,
} from '../../db/schema';
import { badRequest, conflict, forbidden, notFound, staleVersion } from '../../lib/http-error';
import type { ErrorDetail } from '@shared/errors';
import {
  AIRLOCK_LOCATION,
  CreatePlanInputSchema,
  PLAN_SETTING_KEYS,
  planReferenceProblems,
  planSettingsOf,
  startGmtOn,
  withItemKeys,
  withOwnSockets,
  type CreatePlanInput,
  type ManifestItem,
  type PlanSettings,
  type PlanStatus,
  type ReviewComment,
  type Task,
  type UpdatePlanInput,
} from '@shared/schemas/plan';
import { formatIssuePath, type StationDocument } from '@shared/schemas/station';
import { recordActivity } from '../activity/activity.service';
import { getCompiledStation, stationVersion } from '../compute/compiled-cache';

export { PLANNING_CAUTION } from '@shared/caution';

export type { PlanListItem, PlanView } from '@shared/schemas/plan-views';
import type { PlanListItem, PlanView } from '@shared/schemas/plan-views';

export interface Actor {
  id: number;
  name: string;
}

const author = alias(users, 'author');
const approver = alias(users, 'approver');

const planLink = (ctx: AppContext, id: number) => `${ctx.config.publicOrigin}/plans/${id}`;

export function listPlans(db: Db, filter: { status?: PlanStatus; stationId?: number } = {}): PlanListItem[] {
  const where = and(
    filter.status ? eq(plans.status, filter.status) : undefined,
    filter.stationId ? eq(plans.stationId, filter.stationId) : undefined,
  );
  return db
    .select({
      id: plans.id,
      title: plans.title,
      stationId: plans.stationId,
      stationName: stations.name,
      date: plans.date,
      status: plans.status,
      version: plans.version,
      authorId: plans.authorId,
      authorName: author.name,
      updatedAt: plans.updatedAt,
    })
    .from(plans)
    .innerJoin(stations, eq(stations.id, plans.stationId))
    .leftJoin(author, eq(author.id, plans.authorId))
    .where(where)
    .orderBy(desc(plans.updatedAt), desc(plans.id))
    .all();
}

/** Review steps: they move a plan along, they do not change what it says. */
const REVIEW_ACTIONS: ReviewAction[] = ['submit', 'approve', 'return'];

/**
 * Everyone who changed the plan (created it, or any change that is not a review step) since it was
 * last approved, or since it was created when it never was: the people who may not approve it.
 */
function planEditors(db: Db, planId: number): { id: number; name: string | null }[] {
  const lastApproval =
    db
      .select({ id: planAudit.id })
      .from(planAudit)
      .where(and(eq(planAudit.planId, planId), eq(planAudit.action, 'approve')))
      .orderBy(desc(planAudit.id))
      .get()?.id ?? 0;
  return db
    .selectDistinct({ id: planAudit.userId, name: users.name })
    .from(planAudit)
    .leftJoin(users, eq(users.id, planAudit.userId))
    .where(
      and(
        eq(planAudit.planId, planId),
        gt(planAudit.id, lastApproval),
        notInArray(planAudit.action, REVIEW_ACTIONS),
        isNotNull(planAudit.userId),
      ),
    )
    .orderBy(asc(planAudit.userId))
    .all()
    .map((e) => ({ id: e.id!, name: e.name }));
}

export function getPlan(db: Db, id: number): PlanView {
  const row = db
    .select({ plan: plans, stationName: stations.name, authorName: author.name, approverName: approver.name })
    .from(plans)
    .innerJoin(stations, eq(stations.id, plans.stationId))
    .leftJoin(author, eq(author.id, plans.authorId))
    .leftJoin(approver, eq(approver.id, plans.approverId))
    .where(eq(plans.id, id))
    .get();
  if (!row) throw notFound('Plan');
  const p = row.plan;
  const settings = JSON.parse(p.settingsJson) as PlanSettings;
  const crew = db.select().from(crewSlots).where(eq(crewSlots.planId, id)).all();
  const slot = (s: 'EV1' | 'EV2') => {
    const c = crew.find((r) => r.slot === s);
    return { name: c?.name ?? s, tetherLengthM: c?.tetherLengthM ?? 0 };
  };
  const taskRows = db.select().from(tasks).where(eq(tasks.planId, id)).orderBy(asc(tasks.ord)).all();
  const itemRows = db
    .select()
    .from(manifestItems)
    .where(eq(manifestItems.planId, id))
    .orderBy(asc(manifestItems.ord))
    .all();
  const comments: ReviewComment[] = db
    .select({
      id: reviewComments.id,
      authorId: reviewComments.authorId,
      authorName: users.name,
      action: reviewComments.action,
      body: reviewComments.body,
      createdAt: reviewComments.createdAt,
    })
    .from(reviewComments)
    .leftJoin(users, eq(users.id, reviewComments.authorId))
    .where(eq(reviewComments.planId, id))
    .orderBy(asc(reviewComments.id))
    .all()
    .map((c) => ({ ...c, authorName: c.authorName ?? undefined }));
  return {
    id: p.id,
    title: p.title,
    stationId: p.stationId,
    stationName: row.stationName,
    date: p.date,
    crew: { EV1: slot('EV1'), EV2: slot('EV2') },
    ...settings,
    startGmt: settings.startGmt ?? null,
    tasks: taskRows.map((t): Task => ({
      id: t.id,
      title: t.title,
      worksite: t.worksiteKey,
      crew: t.crew,
      durationSeconds: t.durationSeconds,
      eclipseOnly: t.eclipseOnly,
      carrying: t.carrying,
      ...(t.socketKey ? { socket: t.socketKey } : {}),
      ...(t.socketsJson ? { sockets: JSON.parse(t.socketsJson) as Task['sockets'] } : {}),
      tools: JSON.parse(t.toolsJson) as string[],
      actions: JSON.parse(t.actionsJson) as Task['actions'],
      ...(t.armJson ? { arm: JSON.parse(t.armJson) as NonNullable<Task['arm']> } : {}),
      after: JSON.parse(t.afterJson) as number[],
      optional: t.optional,
      ...(t.notes ? { notes: t.notes } : {}),
    })),
    manifest: itemRows.map((m): ManifestItem & { key: string } => ({
      id: m.id,
      key: m.key,
      name: m.name,
      kind: m.kind,
      quantity: m.quantity,
      ...(m.carriedBy ? { carriedBy: m.carriedBy } : {}),
      startsAt: m.startsAt,
      ...(m.installedAt ? { installedAt: m.installedAt } : {}),
      leaveOutside: m.leaveOutside,
      ...(m.notes ? { notes: m.notes } : {}),
    })),
    status: p.status,
    version: p.version,
    authorId: p.authorId,
    authorName: row.authorName,
    approverId: p.approverId,
    approverName: row.approverName,
    submittedAt: p.submittedAt,
    approvedAt: p.approvedAt,
    submittedStationVersion: p.submittedStationVersion,
    approvedStationVersion: p.approvedStationVersion,
    createdAt: p.createdAt,
    updatedAt: p.updatedAt,
    reviewComments: comments,
    editors: planEditors(db, id),
  };
}

/**
 * Worksites, sockets and item places the plan names must be nodes of the right kind on the plan's
 * station: a task's worksite a worksite, its sockets sockets, where an item starts or an action
 * happens any node (or `airlock`), where a foot restraint starts installed a socket. An arm's key
 * counts as a place for a foot restraint (installed on its end); a task's arm must be an arm of the
 * station and its ingress and egress nodes.
 */
export function checkTaskKeys(
  doc: StationDocument,
  planTasks: readonly Pick<Task, 'worksite' | 'socket' | 'sockets' | 'actions' | 'arm'>[],
  manifest: readonly Pick<ManifestItem, 'kind' | 'startsAt' | 'installedAt'>[] = [],
): ErrorDetail[] {
  const kindOf = new Map(doc.nodes.map((n) => [n.key, n.kind]));
  const details: ErrorDetail[] = [];
  const armKeys = new Set(doc.arms.map((a) => a.key));
  const check = (key: string, wanted: 'worksite' | 'socket' | 'node', path: (string | number)[]) => {
    const kind = key === AIRLOCK_LOCATION && wanted === 'node' ? 'airlock' : kindOf.get(key);
    const at = `body.${formatIssuePath(path)}`;
    if (kind === undefined && wanted !== 'worksite' && armKeys.has(key)) return;
    if (kind === undefined)
      details.push({ path: at, message: `the station "${doc.name}" has no node "${key}"` });
    else if (wanted !== 'node' && kind !== wanted)
      details.push({ path: at, message: `"${key}" is a ${kind}, not a ${wanted}` });
  };
  planTasks.forEach((t, i) => {
    check(t.worksite, 'worksite', ['tasks', i, 'worksite']);
    if (t.socket) check(t.socket, 'socket', ['tasks', i, 'socket']);
    for (const m of ['EV1', 'EV2'] as const) {
      const socket = t.sockets?.[m];
      if (socket) check(socket, 'socket', ['tasks', i, 'sockets', m]);
    }
    t.actions.forEach((a, j) => {
      if (a.at) check(a.at, 'node', ['tasks', i, 'actions', j, 'at']);
    });
    if (t.arm) {
      if (!armKeys.has(t.arm.key))
        details.push({
          path: `body.tasks[${i}].arm.key`,
          message: `the station "${doc.name}" has no arm "${t.arm.key}"${armKeys.size ? ` (its arms: ${[...armKeys].join(', ')})` : ''}`,
        });
      for (const end of ['ingress', 'egress'] as const) {
        const key = t.arm[end];
        if (key !== undefined && !kindOf.has(key))
          details.push({
            path: `body.tasks[${i}].arm.${end}`,
            message: `the station "${doc.name}" has no node "${key}"`,
          });
      }
    }
  });
  manifest.forEach((m, i) => {
    if (m.installedAt)
      check(m.installedAt, m.kind === 'foot-restraint' ? 'socket' : 'node', ['manifest', i, 'installedAt']);
    else check(m.startsAt, 'node', ['manifest', i, 'startsAt']);
  });
  return details;
}

export function stationDocFor(ctx: AppContext, stationId: number): StationDocument {
  if (stationVersion(ctx.db, stationId) === null) {
    throw badRequest(`There is no station ${stationId}.`, [
      { path: 'body.stationId', message: 'no such station' },
    ]);
  }
  return getCompiledStation(ctx, stationId).doc;
}

export function assertKeys(
  doc: StationDocument,
  planTasks: readonly Task[],
  manifest: readonly ManifestItem[],
) {
  const details = [
    ...planReferenceProblems(planTasks, manifest).map((p) => ({
      path: `body.${formatIssuePath(p.path)}`,
      message: p.message,
    })),
    ...checkTaskKeys(doc, planTasks, manifest),
  ];
  if (details.length)
    throw badRequest(`The plan is not valid: ${details[0].path} ${details[0].message}`, details);
}

function writeCrew(db: Db, planId: number, crew: CreatePlanInput['crew']) {
  db.delete(crewSlots).where(eq(crewSlots.planId, planId)).run();
  for (const slot of ['EV1', 'EV2'] as const) {
    db.insert(crewSlots)
      .values({ planId, slot, name: crew[slot].name, tetherLengthM: crew[slot].tetherLengthM })
      .run();
  }
}

/**
 * Replaces the plan's task list. A task keeps its id when it is one of this plan's tasks already (so
 * `after` and anything else that names it keeps meaning the same task); any other task, a new one or
 * one copied from elsewhere with its id, gets a fresh id, and the `after` entries that named it by
 * the id it came with are rewritten to the new one.
 */
function writeTasks(db: Db, planId: number, list: readonly Task[]) {
  const own = new Set(
    db
      .select({ id: tasks.id })
      .from(tasks)
      .where(eq(tasks.planId, planId))
      .all()
      .map((r) => r.id),
  );
  db.delete(tasks).where(eq(tasks.planId, planId)).run();
  const idOf = new Map<number, number>();
  const rows = list.map(withOwnSockets).map((t, ord) => {
    const row = db
      .insert(tasks)
      .values({
        ...(t.id !== undefined && own.has(t.id) ? { id: t.id } : {}),
        planId,
        ord,
        title: t.title,
        worksiteKey: t.worksite,
        crew: t.crew,
        durationSeconds: t.durationSeconds,
        eclipseOnly: t.eclipseOnly,
        carrying: t.carrying,
        socketKey: t.socket ?? null,
        socketsJson: t.sockets ? JSON.stringify(t.sockets) : null,
        toolsJson: JSON.stringify(t.tools),
        actionsJson: JSON.stringify(t.actions),
        armJson: t.arm ? JSON.stringify(t.arm) : null,
        optional: t.optional,
        notes: t.notes ?? null,
      })
      .returning({ id: tasks.id })
      .get();
    if (t.id !== undefined) idOf.set(t.id, row.id);
    return { id: row.id, after: t.after };
  });
  for (const row of rows) {
    if (row.after.length === 0) continue;
    db.update(tasks)
      .set({ afterJson: JSON.stringify(row.after.map((id) => idOf.get(id) ?? id)) })
      .where(eq(tasks.id, row.id))
      .run();
  }
}

function writeManifest(db: Db, planId: number, list: readonly ManifestItem[]) {
  db.delete(manifestItems).where(eq(manifestItems.planId, planId)).run();
  withItemKeys(list).forEach((m, ord) =>
    db
      .insert(manifestItems)
      .values({
        planId,
        ord,
        key: m.key,
        name: m.name,
        kind: m.kind,
        quantity: m.quantity,
        carriedBy: m.carriedBy ?? null,
        startsAt: m.startsAt,
        installedAt: m.installedAt ?? null,
        leaveOutside: m.leaveOutside,
        notes: m.notes ?? null,
      })
      .run(),
  );
}

/** A plan as the audit keeps it: what it says, not who may approve it (that follows from the audit). */
const snapshot = ({ editors: _editors, ...plan }: PlanView) => JSON.stringify(plan);

/** The plan as it is after a change's audit row: its editors include the one who just changed it. */
const withEditors = (db: Db, plan: PlanView): PlanView => ({ ...plan, editors: planEditors(db, plan.id) });

function audit(
  db: Db,
  planId: number,
  userId: number | null,
  action: string,
  before: PlanView | null,
  after: PlanView | null,
) {
  db.insert(planAudit)
    .values({
      planId,
      userId,
      action,
      beforeJson: before ? snapshot(before) : null,
      afterJson: after ? snapshot(after) : null,
      versionAfter: after?.version ?? (before ? before.version + 1 : 1),
    })
    .run();
}

export function createPlan(ctx: AppContext, input: CreatePlanInput, actor: Actor): PlanView {
  const doc = stationDocFor(ctx, input.stationId);
  assertKeys(doc, input.tasks, input.manifest);
  const settings = { ...planSettingsOf(input), startGmt: startGmtOn(input.startGmt, input.date) };
  const plan = ctx.db.transaction((tx) => {
    const db = tx as unknown as Db;
    const row = db
      .insert(plans)
      .values({
        stationId: input.stationId,
        title: input.title,
        date: input.date,
        status: 'draft',
        version: 1,
        authorId: actor.id,
        settingsJson: JSON.stringify(settings),
      })
      .returning({ id: plans.id })
      .get();
    writeCrew(db, row.id, input.crew);
    writeTasks(db, row.id, input.tasks);
    writeManifest(db, row.id, input.manifest);
    const created = getPlan(db, row.id);
    audit(db, row.id, actor.id, 'create', null, created);
    return withEditors(db, created);
  });
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'plan.created',
    summary: `${actor.name} started the plan "${plan.title}"`,
    link: `/plans/${plan.id}`,
  });
  return plan;
}

/** 409 unless `version` is the plan's current one, naming who changed it last and when. */
function assertVersion(db: Db, plan: PlanView, version: number) {
  if (plan.version === version) return;
  const last = db
    .select({ name: users.name, at: planAudit.createdAt })
    .from(planAudit)
    .leftJoin(users, eq(users.id, planAudit.userId))
    .where(eq(planAudit.planId, plan.id))
    .orderBy(desc(planAudit.id))
    .get();
  throw staleVersion('The plan', version, {
    currentVersion: plan.version,
    changedBy: last?.name ?? null,
    changedAt: last?.name ? last.at : null,
  });
}

const LOCKED_MESSAGE: Record<PlanStatus, string> = {
  draft: '',
  'in-review': 'The plan is in review; return it to draft to edit it.',
  approved: 'The plan is approved; a reviewer must return it to draft before it can be edited.',
};

function bump(db: Db, plan: PlanView, set: Partial<typeof plans.$inferInsert>) {
  const updated = db
    .update(plans)
    .set({ ...set, version: plan.version + 1, updatedAt: new Date().toISOString() })
    .where(and(eq(plans.id, plan.id), eq(plans.version, plan.version)))
    .returning({ id: plans.id })
    .get();
  // the version was checked in the same transaction; this only guards against a second writer process
  if (!updated) throw conflict('The plan was changed at the same moment; reload it and try again.');
}

export function updatePlan(ctx: AppContext, id: number, input: UpdatePlanInput, actor: Actor): PlanView {
  const current = getPlan(ctx.db, id);
  assertVersion(ctx.db, current, input.version);
  if (current.status !== 'draft') throw conflict(LOCKED_MESSAGE[current.status]);
  const stationId = input.stationId ?? current.stationId;
  const nextTasks = input.tasks ?? current.tasks;
  if (input.stationId !== undefined || input.tasks !== undefined || input.manifest !== undefined)
    assertKeys(stationDocFor(ctx, stationId), nextTasks, input.manifest ?? current.manifest);

  const settings: PlanSettings = planSettingsOf(current);
  for (const k of PLAN_SETTING_KEYS)
    if (input[k] !== undefined) (settings as unknown as Record<string, unknown>)[k] = input[k];
  settings.startGmt = startGmtOn(settings.startGmt, input.date ?? current.date);
  const plan = ctx.db.transaction((tx) => {
    const db = tx as unknown as Db;
    const before = getPlan(db, id);
    assertVersion(db, before, input.version);
    if (before.status !== 'draft') throw conflict(LOCKED_MESSAGE[before.status]);
    bump(db, before, {
      stationId,
      title: input.title ?? before.title,
      date: input.date ?? before.date,
      settingsJson: JSON.stringify(settings),
    });
    if (input.crew) writeCrew(db, id, input.crew);
    if (input.tasks) writeTasks(db, id, input.tasks);
    if (input.manifest) writeManifest(db, id, input.manifest);
    const after = getPlan(db, id);
    audit(db, id, actor.id, 'update', before, after);
    return withEditors(db, after);
  });
  return plan;
}

export function deletePlan(ctx: AppContext, id: number, version: number, actor: Actor) {
  const title = ctx.db.transaction((tx) => {
    const db = tx as unknown as Db;
    const before = getPlan(db, id);
    assertVersion(db, before, version);
    if (before.status !== 'draft')
      throw conflict(`Only draft plans can be deleted. ${LOCKED_MESSAGE[before.status]}`);
    // a series it was an EVA of loses it (the row goes with the plan): its version moves on
    const inSeries = db
      .select({ seriesId: seriesPlans.seriesId })
      .from(seriesPlans)
      .where(eq(seriesPlans.planId, id))
      .get();
    if (inSeries)
      db.update(series)
        .set({ version: sql`${series.version} + 1`, updatedAt: new Date().toISOString() })
        .where(eq(series.id, inSeries.seriesId))
        .run();
    db.delete(plans).where(eq(plans.id, id)).run();
    return before.title;
  });
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'plan.deleted',
    summary: `${actor.name} deleted the draft plan "${title}"`,
  });
}

/** A new draft with the plan's tasks, manifest, crew and settings: the author is whoever duplicates it. */
export function duplicatePlan(ctx: AppContext, id: number, actor: Actor, title?: string): PlanView {
  const p = getPlan(ctx.db, id);
  const { betaDegOverride, ...settings } = planSettingsOf(p);
  const input = CreatePlanInputSchema.parse({
    title: title ?? `${p.title} (copy)`.slice(0, 200),
    stationId: p.stationId,
    date: p.date,
    crew: p.crew,
    ...settings,
    ...(betaDegOverride === null ? {} : { betaDegOverride }),
    tasks: p.tasks.map(({ id: _id, ...t }) => t),
    manifest: p.manifest.map(({ id: _id, ...m }) => m),
  });
  return createPlan(ctx, input, actor);
}

export type ReviewAction = 'submit' | 'approve' | 'return';

const TRANSITIONS: Record<ReviewAction, { from: PlanStatus[]; to: PlanStatus; verb: string }> = {
  submit: { from: ['draft'], to: 'in-review', verb: 'submitted' },
  approve: { from: ['in-review'], to: 'approved', verb: 'approved' },
  // an approved plan can be reopened the same way, else it could never change again
  return: { from: ['in-review', 'approved'], to: 'draft', verb: 'returned to draft' },
};

const STATUS_WORDS: Record<PlanStatus, string> = {
  draft: 'a draft',
  'in-review': 'in review',
  approved: 'approved',
};

/** One review step in one transaction (status, review comment, audit), without the e-mails. */
export function reviewTransition(
  ctx: AppContext,
  id: number,
  action: ReviewAction,
  version: number,
  comment: string | undefined,
  actor: Actor,
  /** approve: the station version the reviewer saw the plan computed on (stale → 409) */
  seenStationVersion?: number,
) {
  const rule = TRANSITIONS[action];
  return ctx.db.transaction((tx) => {
    const db = tx as unknown as Db;
    const before = getPlan(db, id);
    assertVersion(db, before, version);
    // submitting and approving record the station version the plan was checked against
    const stationNow = stationVersion(db, before.stationId)!;
    if (seenStationVersion !== undefined && seenStationVersion !== stationNow) {
      throw staleVersion('The station this plan is computed on', seenStationVersion, {
        currentVersion: stationNow,
        changedBy: null,
        changedAt: null,
      });
    }
    if (!rule.from.includes(before.status)) {
      throw conflict(`The plan is ${STATUS_WORDS[before.status]}, so it cannot be ${rule.verb}.`);
    }
    if (action === 'submit' && before.tasks.length === 0) {
      throw conflict('The plan has no tasks yet: add the day’s tasks before submitting it for review.', [
        { path: 'tasks', message: 'at least one task' },
      ]);
    }
    if (action === 'approve' && before.authorId === actor.id) {
      throw forbidden('You wrote this plan, so you cannot approve it: another planner must review it.');
    }
    if (action === 'approve' && before.editors.some((e) => e.id === actor.id)) {
      throw forbidden(
        'You changed this plan since it was last approved, so you cannot approve it: a planner who did not change it must review it.',
      );
    }
    const now = new Date().toISOString();
    bump(db, before, {
      status: rule.to,
      ...(action === 'submit'
        ? { submittedAt: now, approverId: null, approvedAt: null, submittedStationVersion: stationNow }
        : {}),
      ...(action === 'approve'
        ? { approverId: actor.id, approvedAt: now, approvedStationVersion: stationNow }
        : {}),
      ...(action === 'return' ? { approverId: null, approvedAt: null, approvedStationVersion: null } : {}),
    });
    db.insert(reviewComments)
      .values({ planId: id, authorId: actor.id, action, body: comment ?? '' })
      .run();
    const after = getPlan(db, id);
    audit(db, id, actor.id, action, before, after);
    return withEditors(db, after);
  });
}

export async function sendQuietly(ctx: AppContext, mail: { to: string; subject: string; text: string }) {
  // the review step is saved either way; a mail server outage must not undo it
  try {
    await ctx.mailer.send(mail);
  } catch (err) {
    ctx.logger.error({ err, to: mail.to }, 'could not send a plan e-mail');
  }
}

export function authorOf(db: Db, plan: Pick<PlanView, 'authorId'>) {
  if (plan.authorId === null) return null;
  return (
    db
      .select({ email: users.email, name: users.name, disabled: users.disabled })
      .from(users)
      .where(eq(users.id, plan.authorId))
      .get() ?? null
  );
}

export async function submitPlan(
  ctx: AppContext,
  id: number,
  version: number,
  comment: string | undefined,
  actor: Actor,
) {
  const plan = reviewTransition(ctx, id, 'submit', version, comment, actor);
  const reviewers = ctx.db
    .select({ email: users.email, name: users.name })
    .from(users)
    .where(
      and(
        inArray(users.role, ['planner', 'admin']),
        eq(users.disabled, false),
        plan.authorId === null ? undefined : ne(users.id, plan.authorId),
      ),
    )
    .all();
  for (const r of reviewers) {
    await sendQuietly(ctx, {
      to: r.email,
      subject: `Review requested: "${plan.title}"`,
      text: [
        `Hello ${r.name},`,
        '',
        `${actor.name} has submitted the EVA plan "${plan.title}" (${plan.stationName}, ${plan.date}) for review.`,
        ...(comment ? ['', `Their note: ${comment}`] : []),
        '',
        `Review it here: ${planLink(ctx, id)}`,
      ].join('\n'),
    });
  }
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'plan.submitted',
    summary: `${actor.name} submitted "${plan.title}" for review`,
    link: `/plans/${id}`,
  });
  return plan;
}

export async function approvePlan(
  ctx: AppContext,
  id: number,
  version: number,
  comment: string | undefined,
  actor: Actor,
  seenStationVersion?: number,
) {
  const plan = reviewTransition(ctx, id, 'approve', version, comment, actor, seenStationVersion);
  await mailAuthor(
    ctx,
    plan,
    actor,
    `Approved: "${plan.title}"`,
    `${actor.name} has approved your EVA plan "${plan.title}".`,
    comment,
  );
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'plan.approved',
    summary: `${actor.name} approved "${plan.title}"${
      plan.submittedStationVersion !== plan.approvedStationVersion
        ? ` on station version ${plan.approvedStationVersion} (submitted on version ${plan.submittedStationVersion})`
        : ''
    }`,
    link: `/plans/${id}`,
  });
  return plan;
}

export async function returnPlan(
  ctx: AppContext,
  id: number,
  version: number,
  comment: string,
  actor: Actor,
) {
  const plan = reviewTransition(ctx, id, 'return', version, comment, actor);
  await mailAuthor(
    ctx,
    plan,
    actor,
    `Returned to draft: "${plan.title}"`,
    `${actor.name} has returned your EVA plan "${plan.title}" to draft.`,
    comment,
  );
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'plan.returned',
    summary: `${actor.name} returned "${plan.title}" to draft`,
    link: `/plans/${id}`,
  });
  return plan;
}

async function mailAuthor(
  ctx: AppContext,
  plan: PlanView,
  actor: Actor,
  subject: string,
  first: string,
  comment?: string,
) {
  const to = authorOf(ctx.db, plan);
  // an author withdrawing their own plan needs no mail about it
  if (!to || to.disabled || plan.authorId === actor.id) return;
  await sendQuietly(ctx, {
    to: to.email,
    subject,
    text: [
      `Hello ${to.name},`,
      '',
      first,
      ...(comment ? ['', `Comment: ${comment}`] : []),
      '',
      `Open the plan: ${planLink(ctx, plan.id)}`,
    ].join('\n'),
  });
}
