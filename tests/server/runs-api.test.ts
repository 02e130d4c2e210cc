import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fromWire } from '@shared/compute/day/wire';
import { orbitSummary } from '@shared/compute/orbit';
import { formatElapsed } from '@shared/compute/units';
import type { Timeline, TimelineBlock } from '@shared/compute/day/types';
import type { RunView } from '@shared/schemas/run';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { buildPlanInput, buildTask } from '../factories/plan';
import { makeAppWithStation } from '../setup/stations';
import type { TestApp } from '../setup/test-app';
import { getPdf, pdfAnswerText } from '../setup/pdf-text';

let t: TestApp;
let stationId: number;
const ORBIT = { altitudeKm: 410, betaDeg: 20 };

beforeAll(async () => {
  const doc = buildStationDocument({ orbit: ORBIT });
  doc.edges = doc.edges.map((e) =>
    e.from === K.socket && e.to === K.worksite ? { ...e, closed: false } : e,
  );
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(doc));
});
afterAll(() => t.close());

/**
 * EV1 works two tasks at the pump site (the second eclipse-only), then both swap the pump, then EV2
 * inspects: EV2's joint task waits for EV1, so a delay of EV1's first task carries into both lanes.
 */
async function approvedPlan(
  orbitPhaseAtStartDeg = 0,
  tasks = [
    buildTask({ title: 'Open the cover', durationSeconds: 600 }),
    buildTask({ title: 'Demate connectors', durationSeconds: 600, eclipseOnly: true }),
    buildTask({ title: 'Swap the pump', crew: 'both', durationSeconds: 900 }),
    buildTask({ title: 'Inspect the site', crew: 'EV2', durationSeconds: 300 }),
  ],
) {
  const planner = await t.agent('planner');
  const created = await planner
    .post('/api/plans')
    .send(buildPlanInput(stationId, { orbitPhaseAtStartDeg, tasks }));
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  const submitted = await planner.post(`/api/plans/${created.body.id}/submit`).send({ version: 1 });
  expect(submitted.status).toBe(200);
  const approved = await (
    await t.agent('planner2')
  )
    .post(`/api/plans/${created.body.id}/approve`)
    .send({ version: submitted.body.version });
  expect(approved.status, JSON.stringify(approved.body)).toBe(200);
  return approved.body as { id: number; tasks: { id: number; title: string }[] };
}

async function openRun(planId: number) {
  const res = await (
    await t.agent('planner')
  )
    .post(`/api/plans/${planId}/runs`)
    .send({ startedAt: '2031-03-14T08:00:00Z' });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as { id: number; version: number };
}

async function log(runId: number, body: object) {
  const res = await (await t.agent('planner')).post(`/api/runs/${runId}/events`).send(body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as { version: number };
}

async function view(runId: number, at: number) {
  const res = await (await t.agent('viewer')).get(`/api/runs/${runId}?at=${at}`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  const body = res.body as RunView;
  return {
    ...body,
    plannedDay: fromWire(body.planned) as Timeline,
    projectedDay: fromWire(body.projected) as Timeline,
  };
}

const work = (day: Timeline, crew: 'EV1' | 'EV2', taskIndex: number) =>
  day.crew[crew].blocks.find((b) => b.type === 'work' && b.taskIndex === taskIndex)!;

/** Logs both egresses and EV1's first task as flown, its end `delay` seconds after the plan's. */
async function flyFirstTask(
  runId: number,
  plan: { tasks: { id: number }[] },
  planned: Timeline,
  delay: number,
) {
  const egress = planned.crew.EV1.blocks[0].end;
  await log(runId, { crew: 'EV1', kind: 'egress-done', at: egress });
  await log(runId, { crew: 'EV2', kind: 'egress-done', at: planned.crew.EV2.blocks[0].end });
  const first = work(planned, 'EV1', 0);
  await log(runId, { crew: 'EV1', kind: 'task-start', taskId: plan.tasks[0].id, at: first.start });
  await log(runId, { crew: 'EV1', kind: 'task-done', taskId: plan.tasks[0].id, at: first.end + delay });
  return first.end + delay;
}

describe('runs of an approved plan', () => {
  it('opens only on an approved plan, and only for planners', async () => {
    const draft = await (await t.agent('planner')).post('/api/plans').send(buildPlanInput(stationId));
    const refused = await (
      await t.agent('planner')
    )
      .post(`/api/plans/${draft.body.id}/runs`)
      .send({ startedAt: '2031-03-14T08:00:00Z' });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('CONFLICT');
    const plan = await approvedPlan();
    const byViewer = await (
      await t.agent('viewer')
    )
      .post(`/api/plans/${plan.id}/runs`)
      .send({ startedAt: '2031-03-14T08:00:00Z' });
    expect(byViewer.status).toBe(403);
    const bad = await (
      await t.agent('planner')
    )
      .post(`/api/plans/${plan.id}/runs`)
      .send({ startedAt: 'soon' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('body.startedAt');
  });

  it('appends events version-checked: a stale append is a 409 and nothing is written', async () => {
    const plan = await approvedPlan();
    const run = await openRun(plan.id);
    const first = await log(run.id, { crew: 'EV1', kind: 'egress-done', at: 1800, version: run.version });
    expect(first.version).toBe(run.version + 1);
    const stale = await (
      await t.agent('admin')
    )
      .post(`/api/runs/${run.id}/events`)
      .send({ crew: 'EV2', kind: 'egress-done', at: 1810, version: run.version });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('CONFLICT');
    const after = await view(run.id, 1900);
    expect(after.events.map((e) => [e.crew, e.kind, e.at, e.userName])).toEqual([
      ['EV1', 'egress-done', 1800, expect.any(String)],
    ]);
    expect(after.run.version).toBe(first.version);
  });

  it('refuses events that name no task of the plan, another member’s task, or a done before its start', async () => {
    const plan = await approvedPlan();
    const run = await openRun(plan.id);
    const planner = await t.agent('planner');
    const post = (body: object) => planner.post(`/api/runs/${run.id}/events`).send(body);
    const unknown = await post({ crew: 'EV1', kind: 'task-start', taskId: 999_999, at: 10 });
    expect([unknown.status, unknown.body.error.details[0].path]).toEqual([400, 'body.taskId']);
    const notTheirs = await post({ crew: 'EV2', kind: 'task-start', taskId: plan.tasks[0].id, at: 10 });
    expect([notTheirs.status, notTheirs.body.error.details[0].path]).toEqual([400, 'body.crew']);
    const noTask = await post({ crew: 'EV1', kind: 'task-done', at: 10 });
    expect([noTask.status, noTask.body.error.details[0].path]).toEqual([400, 'body.taskId']);
    const negative = await post({ crew: 'EV1', kind: 'egress-done', at: -1 });
    expect([negative.status, negative.body.error.details[0].path]).toEqual([400, 'body.at']);
    await log(run.id, { crew: 'EV1', kind: 'task-start', taskId: plan.tasks[0].id, at: 2000 });
    const early = await post({ crew: 'EV1', kind: 'task-done', taskId: plan.tasks[0].id, at: 1999 });
    expect([early.status, early.body.error.details[0].path]).toEqual([400, 'body.at']);
    expect((await post({ crew: 'EV1', kind: 'note', at: 10 })).status).toBe(400);
    expect((await (await t.agent('viewer')).get('/api/runs/999999')).status).toBe(404);
  });

  it('projects the plan itself where nothing slipped', async () => {
    const plan = await approvedPlan();
    const run = await openRun(plan.id);
    const untouched = await view(run.id, 0);
    expect(untouched.projectedDay.crew).toEqual(untouched.plannedDay.crew);
    const now = await flyFirstTask(run.id, plan, untouched.plannedDay, 0);
    const flown = await view(run.id, now);
    expect(flown.projectedDay.crew).toEqual(flown.plannedDay.crew);
    expect(flown.projectedEndSeconds).toBe(flown.plannedEndSeconds);
    expect(flown.marginSeconds).toBe(flown.plannedMarginSeconds);
    expect(flown.actual.EV1.map((b) => [b.type, b.start, b.end])).toEqual([
      ['egress', 0, flown.plannedDay.crew.EV1.blocks[0].end],
      ['work', work(flown.plannedDay, 'EV1', 0).start, work(flown.plannedDay, 'EV1', 0).end],
    ]);
  });

  it('shifts the rest of the day by exactly a logged delay, in both lanes', async () => {
    const plan = await approvedPlan();
    const run = await openRun(plan.id);
    const planned = (await view(run.id, 0)).plannedDay;
    const delay = 437;
    const now = await flyFirstTask(run.id, plan, planned, delay);
    const flown = await view(run.id, now);
    expect(flown.projectedEndSeconds).toBeCloseTo(flown.plannedEndSeconds + delay, 6);
    expect(flown.marginSeconds).toBeCloseTo(flown.plannedMarginSeconds - delay, 6);
    const joint = work(planned, 'EV1', 2).start;
    const shifted = (crew: 'EV1' | 'EV2', from: number) => {
      const pick = (blocks: TimelineBlock[]) => blocks.filter((b) => b.start >= from);
      const before = pick(planned.crew[crew].blocks);
      const after = flown.projectedDay.crew[crew].blocks.slice(-before.length);
      expect(after.map((b) => b.label)).toEqual(before.map((b) => b.label));
      after.forEach((b, i) => {
        expect(b.start).toBeCloseTo(before[i].start + delay, 6);
        expect(b.end).toBeCloseTo(before[i].end + delay, 6);
      });
    };
    shifted('EV1', work(planned, 'EV1', 0).end);
    shifted('EV2', joint);
  });

  it('finds the next night window for an eclipse-only task the delay pushes out of its own', async () => {
    // the night that holds the eclipse-only task starts 60 s before it (0° is orbital sunrise)
    const probe = await approvedPlan();
    const probeRun = await openRun(probe.id);
    const start = work((await view(probeRun.id, 0)).plannedDay, 'EV1', 1).start;
    const o = orbitSummary(ORBIT);
    const nightStart = start - 60;
    const phase = (((o.sunlitSeconds - nightStart) / o.periodSeconds) * 360 + 720) % 360;
    const plan = await approvedPlan(phase);
    const run = await openRun(plan.id);
    const before = await view(run.id, 0);
    expect(before.plannedDay.warnings.filter((w) => w.code === 'eclipse-only-outside-night')).toEqual([]);
    expect(before.missedNight).toEqual([]);
    // longer than the rest of that night
    const delay = o.eclipseSeconds;
    const now = await flyFirstTask(run.id, plan, before.plannedDay, delay);
    const flown = await view(run.id, now);
    expect(flown.missedNight).toHaveLength(1);
    const missed = flown.missedNight[0];
    expect(missed.taskId).toBe(plan.tasks[1].id);
    expect(missed.start).toBeCloseTo(start + delay, 6);
    expect(missed.nextWindow!.nightStart).toBeCloseTo(nightStart + o.periodSeconds, 3);
    expect(missed.nextWindow!.start).toBeCloseTo(nightStart + o.periodSeconds, 3);
    expect(missed.nextWindow!.end - missed.nextWindow!.start).toBeCloseTo(600, 6);
  });

  it('restores the margin when the drop suggestion says it does: the same day flown without those tasks', async () => {
    const cover = buildTask({ title: 'Open the cover', durationSeconds: 600 });
    const getAhead = buildTask({ title: 'Clean the radiator', durationSeconds: 1500, optional: true });
    const close = buildTask({ title: 'Close the cover', durationSeconds: 600 });
    const delay = 1200;
    const plan = await approvedPlan(0, [cover, getAhead, close]);
    const run = await openRun(plan.id);
    const planned = (await view(run.id, 0)).plannedDay;
    const now = await flyFirstTask(run.id, plan, planned, delay);
    const flown = await view(run.id, now);
    expect(flown.marginSeconds).toBeCloseTo(flown.plannedMarginSeconds - delay, 6);
    expect(flown.drop).toMatchObject({ taskIds: [plan.tasks[1].id], restores: true });
    expect(flown.drop!.targetMarginSeconds).toBe(Math.max(0, flown.plannedMarginSeconds));

    // the day it stands for, flown for real: the plan approved without the dropped task, same logs
    const without = await approvedPlan(0, [cover, close]);
    const again = await openRun(without.id);
    await flyFirstTask(again.id, without, planned, delay);
    const check = await view(again.id, now);
    expect(check.marginSeconds).toBeCloseTo(flown.drop!.marginSeconds, 6);
    expect(check.marginSeconds).toBeGreaterThanOrEqual(flown.drop!.targetMarginSeconds);
    expect(check.drop).toBeNull();
  });

  it('moves the projected end with the clock while a task runs long and nothing is logged', async () => {
    const plan = await approvedPlan();
    const run = await openRun(plan.id);
    const planned = (await view(run.id, 0)).plannedDay;
    const first = work(planned, 'EV1', 0);
    await log(run.id, { crew: 'EV1', kind: 'egress-done', at: planned.crew.EV1.blocks[0].end });
    await log(run.id, { crew: 'EV2', kind: 'egress-done', at: planned.crew.EV2.blocks[0].end });
    await log(run.id, { crew: 'EV1', kind: 'task-start', taskId: plan.tasks[0].id, at: first.start });
    const before = await view(run.id, first.start + 60);
    expect(before.clock.held).toBe(false);
    expect(before.clock.steadyUntil).toBeGreaterThan(first.start + 60);
    const a = await view(run.id, first.end + 120);
    const b = await view(run.id, first.end + 720);
    expect(a.clock).toEqual({ held: true, steadyUntil: null });
    expect(b.projectedEndSeconds - a.projectedEndSeconds).toBe(600);
    expect(b.events).toHaveLength(3);
  });

  it('offers flown durations of ended runs as estimates for the same task at the same worksite', async () => {
    const viewer = await t.agent('viewer');
    const estimates = async () => {
      const res = await viewer.get(`/api/stations/${stationId}/flown-estimates`);
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      return res.body as { title: string; worksite: string; flights: number; seconds: number }[];
    };
    const open = (list: Awaited<ReturnType<typeof estimates>>) =>
      list.find((e) => e.title === 'Open the cover');
    const before = open(await estimates());
    const plan = await approvedPlan();
    const flying = await openRun(plan.id);
    const planned = (await view(flying.id, 0)).plannedDay;
    // a run still flying gives nothing yet
    await flyFirstTask(flying.id, plan, planned, 300);
    expect(open(await estimates())).toEqual(before);
    // a run that ended: its first task took 10 min planned + 5 min late
    const ended = await openRun(plan.id);
    const done = await flyFirstTask(ended.id, plan, planned, 300);
    await log(ended.id, { crew: 'EV1', kind: 'ingress-start', at: done + 60 });
    await log(ended.id, { crew: 'EV1', kind: 'ingress-done', at: done + 120 });
    const after = open(await estimates())!;
    expect(after.worksite).toBe(K.worksite);
    expect(after.flights).toBe((before?.flights ?? 0) + 1);
    if (!before) expect(after.seconds).toBe(900);
    const missing = await viewer.get('/api/stations/99999/flown-estimates');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('NOT_FOUND');
  });

  it('exports the run as flown: every task planned beside flown, in minutes', async () => {
    const plan = await approvedPlan();
    const run = await openRun(plan.id);
    const planned = (await view(run.id, 0)).plannedDay;
    await flyFirstTask(run.id, plan, planned, 300);
    const res = await (await t.agent('viewer')).get(`/api/runs/${run.id}/export.csv`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    const lines = res.text.split('\r\n');
    expect(lines[0]).toBe(
      'task,crew,worksite,planned start (min),planned end (min),planned (min),flown start (min),flown end (min),flown (min),flown minus planned (min),planned start (GMT),flown start (GMT)',
    );
    const first = lines.find((l) => l.startsWith('Open the cover,EV1,'))!.split(',');
    expect(first.slice(5, 10)).toEqual(['10', first[3], String(Number(first[3]) + 15), '15', '5']);
    // the run started at 08:00 GMT; the plan has no start time
    // (minutes shown to 0.1, the clock to the nearest minute)
    expect(first[10]).toBe('');
    const [h, m] = first[11].split(':').map(Number);
    expect(Math.abs(h * 60 + m - (8 * 60 + Number(first[6])))).toBeLessThanOrEqual(0.55);
    const notFlown = lines.find((l) => l.startsWith('Inspect the site,EV2,'))!.split(',');
    expect(notFlown.slice(6)).toEqual(['', '', '', '', '', '']);
    expect(res.text).toContain('planning aid');
  });

  it('exports the run as flown as a PDF: planned beside flown with the slips, the notes, the caution on every page', async () => {
    const plan = await approvedPlan();
    const run = await openRun(plan.id);
    const planned = (await view(run.id, 0)).plannedDay;
    const done = await flyFirstTask(run.id, plan, planned, 300);
    await log(run.id, {
      crew: 'EV1',
      kind: 'note',
      taskId: plan.tasks[0].id,
      at: done,
      text: 'Cover hinge stiff',
    });
    const res = await getPdf(await t.agent('viewer'), `/api/runs/${run.id}/export.pdf`);
    const text = pdfAnswerText(res);
    const raw = (res.body as Buffer).toString('latin1');
    expect(text).toContain('as flown');
    expect(text).toContain('started 2031-03-14 08:00 GMT');
    // each task of each crew member once (the joint one twice), in planned order
    for (const title of ['Open the cover', 'Demate connectors', 'Inspect the site'])
      expect(text.split(title).length - 1).toBeGreaterThanOrEqual(1);
    expect(text.split('Swap the pump').length - 1).toBe(2);
    // the first task flew on time and ran 5 min long (worked from the logged times)
    const first = work(planned, 'EV1', 0);
    const line = text.split('\n').findIndex((l) => l.includes('Open the cover'));
    const rowText = text
      .split('\n')
      .slice(line, line + 8)
      .join(' ');
    expect(rowText).toContain(`${formatElapsed(first.start)}-${formatElapsed(done)}`);
    expect(rowText).toContain('on time');
    expect(rowText).toContain('+5 min');
    expect(text).toContain('not flown');
    expect(text).toContain('Cover hinge stiff');
    expect(text).toContain('Notes');
    const pages = (raw.match(/\/Type \/Page\b/g) ?? []).length;
    expect(pages).toBeGreaterThanOrEqual(1);
    expect(text.split('This is a planning aid').length - 1).toBe(pages);
  });
});
