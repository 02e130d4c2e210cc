import { and, asc, desc, eq, exists, sql } from 'drizzle-orm';
import type { AppContext } from '../../context';
import type { Db } from '../../db/client';
import { plans, runEvents, runs, stations, users } from '../../db/schema';
import { badRequest, conflict, notFound, staleVersion } from '../../lib/http-error';
import type { PlanView } from '@shared/schemas/plan-views';
import {
  MAX_RUN_EVENTS,
  MAX_RUN_SECONDS,
  type OpenRunInput,
  type RunEvent,
  type RunEventInput,
  type RunSummary,
} from '@shared/schemas/run';
import { recordActivity } from '../activity/activity.service';
import { asFlownRows } from '@shared/compute/day/as-flown';
import { flownEstimates, type FlownEstimate } from '@shared/compute/day/flown-estimates';
import type { Timeline } from '@shared/compute/day/types';
import { fromWire } from '@shared/compute/day/wire';
import type { RunView } from '@shared/schemas/run';
import { PLANNING_CAUTION } from '@shared/caution';
import { toCsv } from '../../lib/csv';
import { formatElapsed, formatGmt, formatMinutes } from '@shared/compute/units';
import { buildAsFlownPdf } from '../../lib/pdf';
import { planDayOutput } from '../plans/plan-timeline.service';
import { getPlan, type Actor } from '../plans/plans.service';

interface RunRecord {
  summary: RunSummary;
  plan: PlanView;
}

function readRun(db: Db, id: number): RunRecord {
  const row = db
    .select({ run: runs, openedBy: users.name })
    .from(runs)
    .leftJoin(users, eq(users.id, runs.openedBy))
    .where(eq(runs.id, id))
    .get();
  if (!row) throw notFound('Run');
  const plan = JSON.parse(row.run.planJson) as PlanView;
  return {
    plan,
    summary: {
      id: row.run.id,
      planId: row.run.planId,
      planVersion: row.run.planVersion,
      planTitle: plan.title,
      startedAt: row.run.startedAt,
      version: row.run.version,
      openedBy: row.openedBy,
      createdAt: row.run.createdAt,
    },
  };
}

function readEvents(db: Db, runId: number): RunEvent[] {
  return db
    .select({
      id: runEvents.id,
      crew: runEvents.crew,
      kind: runEvents.kind,
      taskId: runEvents.taskId,
      at: runEvents.at,
      text: runEvents.text,
      userId: runEvents.userId,
      userName: users.name,
      createdAt: runEvents.createdAt,
    })
    .from(runEvents)
    .leftJoin(users, eq(users.id, runEvents.userId))
    .where(eq(runEvents.runId, runId))
    .orderBy(asc(runEvents.id))
    .all() as RunEvent[];
}

/** Opens a run of an approved plan: the plan is kept as it is now, so later edits never change the run. */
export function openRun(ctx: AppContext, planId: number, input: OpenRunInput, actor: Actor): RunSummary {
  const plan = getPlan(ctx.db, planId);
  if (plan.status !== 'approved')
    throw conflict(
      `Only an approved plan can be flown; this one is ${plan.status === 'draft' ? 'a draft' : 'in review'}.`,
    );
  const { editors: _editors, ...kept } = plan;
  const row = ctx.db
    .insert(runs)
    .values({
      planId,
      planVersion: plan.version,
      planJson: JSON.stringify(kept),
      startedAt: new Date(input.startedAt).toISOString(),
      openedBy: actor.id,
    })
    .returning({ id: runs.id })
    .get();
  recordActivity(ctx.db, {
    userId: actor.id,
    kind: 'run.opened',
    summary: `${actor.name} opened a run of "${plan.title}"`,
    link: `/runs/${row.id}`,
  });
  return readRun(ctx.db, row.id).summary;
}

export function listRuns(ctx: AppContext, planId: number): RunSummary[] {
  getPlan(ctx.db, planId);
  return ctx.db
    .select({ id: runs.id })
    .from(runs)
    .where(eq(runs.planId, planId))
    .orderBy(desc(runs.id))
    .all()
    .map((r) => readRun(ctx.db, r.id).summary);
}

/**
 * Appends one event to a run (never changes or removes one). With `version`, the append is refused
 * with 409 when someone else logged meanwhile. A task event names a task of the plan that the crew
 * member takes part in; a task is not done before it started.
 */
export function appendRunEvent(
  ctx: AppContext,
  runId: number,
  input: RunEventInput,
  actor: Actor,
): { event: RunEvent; version: number } {
  return ctx.db.transaction((tx) => {
    const db = tx as unknown as Db;
    const { summary, plan } = readRun(db, runId);
    if (input.version !== undefined && input.version !== summary.version) {
      const last = readEvents(db, runId).at(-1);
      throw staleVersion('The run', input.version, {
        currentVersion: summary.version,
        changedBy: last?.userName ?? null,
        changedAt: last?.createdAt ?? null,
      });
    }
    const count = db
      .select({ n: sql<number>`count(*)` })
      .from(runEvents)
      .where(eq(runEvents.runId, runId))
      .get();
    if ((count?.n ?? 0) >= MAX_RUN_EVENTS) throw conflict(`A run keeps at most ${MAX_RUN_EVENTS} events.`);
    if (input.taskId !== undefined) {
      const task = plan.tasks.find((t) => t.id === input.taskId);
      if (!task)
        throw badRequest('No task of the plan has this id', [
          { path: 'body.taskId', message: `no task ${input.taskId}` },
        ]);
      if (task.crew !== 'both' && task.crew !== input.crew)
        throw badRequest(`The task is ${task.crew}'s`, [
          { path: 'body.crew', message: `task "${task.title}" is done by ${task.crew}, not ${input.crew}` },
        ]);
      if (input.kind === 'task-done') {
        const start = readEvents(db, runId)
          .filter((e) => e.kind === 'task-start' && e.taskId === input.taskId && e.crew === input.crew)
          .at(-1);
        if (start && input.at < start.at)
          throw badRequest('A task is not done before it started', [
            { path: 'body.at', message: `task "${task.title}" started at ${start.at} s` },
          ]);
      }
    }
    const version = summary.version + 1;
    const row = db
      .insert(runEvents)
      .values({
        runId,
        crew: input.crew,
        kind: input.kind,
        taskId: input.taskId ?? null,
        at: input.at,
        text: input.text ?? null,
        userId: actor.id,
      })
      .returning({ id: runEvents.id })
      .get();
    db.update(runs).set({ version }).where(eq(runs.id, runId)).run();
    const event = readEvents(db, runId).find((e) => e.id === row.id)!;
    return { event, version };
  });
}

/** Seconds of EVA elapsed time on the clock: since the run's start, within [0, a day]. */
export function elapsedNow(startedAt: string, nowMs = Date.now()): number {
  return Math.min(MAX_RUN_SECONDS, Math.max(0, (nowMs - Date.parse(startedAt)) / 1000));
}

/**
 * The run with the day as flown and re-projected from `at` (default: the clock), as JSON text.
 * The projection re-runs the day (and, to find what to drop, a few more times), so with a worker
 * pool it runs there, on the station the plan is computed on.
 */
export async function runViewText(ctx: AppContext, runId: number, at?: number): Promise<string> {
  const { summary, plan } = readRun(ctx.db, runId);
  const work = { run: summary, events: readEvents(ctx.db, runId), now: at ?? elapsedNow(summary.startedAt) };
  const { result } = await planDayOutput(ctx, plan.id, 'run', { plan, run: work });
  return 'text' in result ? result.text : '';
}

const minutes = (s: number | null) => (s === null ? '' : Math.round((s / 60) * 10) / 10);

/** Every task of each crew member, planned beside flown, with the view it came from. */
async function asFlown(ctx: AppContext, runId: number) {
  const view = JSON.parse(await runViewText(ctx, runId)) as RunView;
  const planned = fromWire(view.planned) as Timeline;
  const rows = asFlownRows(planned, view.actual).map((r) => {
    const plannedLength = r.plannedEnd - r.plannedStart;
    const flown = r.flownStart === null || r.flownEnd === null ? null : r.flownEnd - r.flownStart;
    return {
      ...r,
      task: view.tasks[r.taskIndex],
      plannedLength,
      flown,
      startSlip: r.flownStart === null ? null : r.flownStart - r.plannedStart,
      lengthSlip: flown === null ? null : flown - plannedLength,
    };
  });
  return { view, rows };
}

/** The as-flown record as CSV: every task of each crew member, planned beside flown, in minutes of elapsed time. */
export async function runAsFlownCsv(ctx: AppContext, runId: number): Promise<string> {
  const { view, rows } = await asFlown(ctx, runId);
  const cells = rows.map((r) => [
    r.task.title,
    r.crew,
    r.task.worksite,
    minutes(r.plannedStart),
    minutes(r.plannedEnd),
    minutes(r.plannedLength),
    minutes(r.flownStart),
    minutes(r.flownEnd),
    minutes(r.flown),
    minutes(r.lengthSlip),
    view.plan.startGmt ? formatGmt(view.plan.startGmt, r.plannedStart) : '',
    r.flownStart === null ? '' : formatGmt(view.run.startedAt, r.flownStart),
  ]);
  const header = [
    'task',
    'crew',
    'worksite',
    'planned start (min)',
    'planned end (min)',
    'planned (min)',
    'flown start (min)',
    'flown end (min)',
    'flown (min)',
    'flown minus planned (min)',
    'planned start (GMT)',
    'flown start (GMT)',
  ];
  return `${toCsv(header, cells)}\r\n\r\n${toCsv(['note'], [[PLANNING_CAUTION]])}\r\n`;
}

const signedMinutes = (s: number | null) =>
  s === null ? '' : Math.abs(s) < 30 ? 'on time' : `${s > 0 ? '+' : '-'}${formatMinutes(Math.abs(s))}`;

/** The as-flown record as PDF: the same rows with their slips, the day's end and margin, and the notes. */
export async function runAsFlownPdf(ctx: AppContext, runId: number): Promise<Buffer> {
  const { view, rows } = await asFlown(ctx, runId);
  const started = view.run.startedAt;
  const plannedStart = view.plan.startGmt;
  const span = (start: number, end: number, gmtStart: string | null) =>
    `${formatElapsed(start)}-${formatElapsed(end)} (${formatElapsed(end - start)})` +
    (gmtStart ? `  ${formatGmt(gmtStart, start)}-${formatGmt(gmtStart, end)} GMT` : '');
  const taskTitle = (id: number | null) =>
    id === null ? '' : ` on "${view.tasks.find((t) => t.id === id)?.title ?? `task ${id}`}"`;
  return buildAsFlownPdf({
    title: `${view.plan.title}: as flown`,
    subtitle: [
      `Run ${view.run.id} of plan version ${view.run.planVersion}`,
      `started ${started.slice(0, 16).replace('T', ' ')} GMT`,
      ...(plannedStart ? [`planned ${plannedStart.slice(0, 16).replace('T', ' ')} GMT`] : []),
      `opened by ${view.run.openedBy ?? 'someone'}`,
      `${view.events.length} events logged`,
    ].join(' · '),
    summary: [
      `Planned end ${formatElapsed(view.plannedEndSeconds)} elapsed, margin ${formatMinutes(view.plannedMarginSeconds)}.`,
      `Flown and projected end ${formatElapsed(view.projectedEndSeconds)} elapsed (${formatGmt(started, view.projectedEndSeconds)} GMT), margin ${formatMinutes(view.marginSeconds)}, at ${formatElapsed(view.now)} elapsed.`,
      ...view.missedNight.map((m) => `Misses its night: ${m.title}.`),
    ],
    rows: rows.map((r) => ({
      task: r.task.title,
      crew: r.crew,
      worksite: r.task.worksite,
      planned: span(r.plannedStart, r.plannedEnd, plannedStart),
      flown:
        r.flownStart === null || r.flownEnd === null ? 'not flown' : span(r.flownStart, r.flownEnd, started),
      startSlip: signedMinutes(r.startSlip),
      lengthSlip: signedMinutes(r.lengthSlip),
      late: (r.startSlip ?? 0) >= 30 || (r.lengthSlip ?? 0) >= 30,
    })),
    notes: view.events
      .filter((e) => e.kind === 'note')
      .map(
        (e) =>
          `${formatElapsed(e.at)} (${formatGmt(started, e.at)} GMT) ${e.crew}${taskTitle(e.taskId)}: ${e.text ?? ''} (${e.userName ?? 'someone'})`,
      ),
    caution: PLANNING_CAUTION,
  });
}

/** Completed runs read for the estimates, the latest first: plenty of history, bounded work. */
export const MAX_ESTIMATE_RUNS = 100;

/**
 * What each kind of task took at each worksite of the station, from the runs of its plans that
 * ended (ingress logged done): suggested estimates for the task form.
 */
export function stationFlownEstimates(ctx: AppContext, stationId: number): FlownEstimate[] {
  if (!ctx.db.select({ id: stations.id }).from(stations).where(eq(stations.id, stationId)).get())
    throw notFound('Station');
  const done = ctx.db
    .select({ id: runs.id, planJson: runs.planJson })
    .from(runs)
    .innerJoin(plans, eq(plans.id, runs.planId))
    .where(
      and(
        eq(plans.stationId, stationId),
        exists(
          ctx.db
            .select({ id: runEvents.id })
            .from(runEvents)
            .where(and(eq(runEvents.runId, runs.id), eq(runEvents.kind, 'ingress-done'))),
        ),
      ),
    )
    .orderBy(desc(runs.id))
    .limit(MAX_ESTIMATE_RUNS)
    .all();
  return flownEstimates(
    done.map((r) => ({
      tasks: (JSON.parse(r.planJson) as PlanView).tasks,
      events: readEvents(ctx.db, r.id),
    })),
  );
}
