import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readStaleVersion } from '@shared/errors';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { buildManifestItem, buildPlanInput, buildTask } from '../factories/plan';
import { getPdf, pdfAnswerText } from '../setup/pdf-text';
import { makeAppWithStation } from '../setup/stations';
import type { TestAgent, TestApp } from '../setup/test-app';
import { CSV_HEADER } from '../../server/modules/plans/plan-export.service';
import { fromWire } from '@shared/compute/day/wire';

const ORIGIN = 'http://tetherwise.test';
const NEAR_SITE = 'T2-W2';

let t: TestApp;
let stationId: number;

/** The factory station with the worksite's edge open and a second worksite in reach of the socket. */
function planStation() {
  const doc = buildStationDocument();
  doc.edges = doc.edges.map((e) =>
    e.from === K.socket && e.to === K.worksite ? { ...e, closed: false } : e,
  );
  doc.nodes.push({ key: NEAR_SITE, kind: 'worksite', label: 'Valve panel', position: [9, 2.5, 0.4] });
  doc.edges.push({ from: K.socket, to: NEAR_SITE, kind: 'handrail' });
  return doc;
}

/** Three tasks (one in eclipse, one for both crew carrying, one on the socket) and three items. */
function planBody(overrides: Record<string, unknown> = {}) {
  return {
    ...buildPlanInput(stationId, {
      title: 'Pump module swap, test',
      tasks: [
        buildTask({ title: 'Demate power connectors', eclipseOnly: true, tools: ['Torque wrench'] }),
        buildTask({
          title: 'Swap pump, "main" unit',
          worksite: NEAR_SITE,
          crew: 'both',
          durationSeconds: 1800,
          socket: K.socket,
          carrying: true,
          tools: ['Pump bag'],
        }),
        buildTask({ title: 'Inspect pump site', crew: 'EV2', durationSeconds: 300, socket: K.socket }),
      ],
      manifest: [
        buildManifestItem({ name: 'Torque wrench' }),
        buildManifestItem({ name: 'Pump bag', kind: 'bag', carriedBy: 'EV2' }),
        { name: 'Spare tether', kind: 'tool', carriedBy: 'EV2' },
      ],
    }),
    ...overrides,
  };
}

beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(planStation(), { publicOrigin: ORIGIN }));
});
afterAll(() => t.close());

async function createPlan(
  overrides: Record<string, unknown> = {},
  role: 'planner' | 'planner2' | 'admin' = 'planner',
) {
  const res = await (await t.agent(role)).post('/api/plans').send(planBody(overrides));
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body;
}

async function mailbox(): Promise<{ to: string; subject: string; text: string }[]> {
  const admin = await t.agent('admin');
  const res = await admin.get('/api/mailbox');
  await admin.delete('/api/mailbox');
  return res.body;
}

const review = async (agent: TestAgent, id: number, action: string, body: object) =>
  agent.post(`/api/plans/${id}/${action}`).send(body);

describe('plans CRUD', () => {
  it('a planner creates a draft; GET returns crew, tasks in order, manifest, author', async () => {
    const created = await createPlan();
    expect(created).toMatchObject({
      status: 'draft',
      version: 1,
      authorName: 'Priya Lindqvist',
      stationId,
      routeMode: 'balanced',
    });
    const got = (await (await t.agent('viewer')).get(`/api/plans/${created.id}`)).body;
    expect(got.crew.EV2).toEqual({ name: 'Bo Lindgren', tetherLengthM: 25.9 });
    expect(got.tasks.map((x: { title: string }) => x.title)).toEqual(planBody().tasks.map((x) => x.title));
    // one socket on a task for both: EV1 stands in that restraint, EV2 works from handrails
    expect(got.tasks[1]).toMatchObject({
      sockets: { EV1: K.socket },
      crew: 'both',
      carrying: true,
      tools: ['Pump bag'],
    });
    expect(got.manifest.map((m: { name: string; key: string }) => [m.name, m.key])).toEqual([
      ['Torque wrench', 'torque-wrench'],
      ['Pump bag', 'pump-bag'],
      ['Spare tether', 'spare-tether'],
    ]);
    expect(got.reviewComments).toEqual([]);
  });

  it('lists plans with station, author and version; filters by status', async () => {
    const created = await createPlan({ title: 'Listed plan' });
    const viewer = await t.agent('viewer');
    const all = (await viewer.get('/api/plans')).body;
    expect(all.find((p: { id: number }) => p.id === created.id)).toMatchObject({
      title: 'Listed plan',
      status: 'draft',
      version: 1,
      stationName: 'Test Station',
      authorName: 'Priya Lindqvist',
    });
    expect(
      (await viewer.get('/api/plans?status=draft')).body.some((p: { id: number }) => p.id === created.id),
    ).toBe(true);
    expect(
      (await viewer.get('/api/plans?status=approved')).body.some((p: { id: number }) => p.id === created.id),
    ).toBe(false);
    expect((await viewer.get('/api/plans?status=done')).status).toBe(400);
  });

  it('checks worksite and socket keys against the station, naming the task path', async () => {
    const planner = await t.agent('planner');
    const tasks = planBody().tasks;
    const unknown = await planner
      .post('/api/plans')
      .send(planBody({ tasks: [tasks[0], { ...tasks[1], worksite: 'NOWHERE-9' }] }));
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details).toEqual([
      { path: 'body.tasks[1].worksite', message: expect.stringContaining('NOWHERE-9') },
    ]);
    const notSocket = await planner
      .post('/api/plans')
      .send(planBody({ tasks: [{ ...tasks[0], socket: K.anchorFar }] }));
    expect(notSocket.status).toBe(400);
    expect(notSocket.body.error.details[0].path).toBe('body.tasks[0].socket');
    const notWorksite = await planner
      .post('/api/plans')
      .send(planBody({ tasks: [{ ...tasks[0], worksite: K.anchorNear }] }));
    expect(notWorksite.body.error.details[0].path).toBe('body.tasks[0].worksite');
    expect((await planner.post('/api/plans').send(planBody({ stationId: 9999 }))).status).toBe(400);
    expect((await planner.post('/api/plans').send(planBody({ colour: 'red' }))).status).toBe(400);
    expect((await planner.get('/api/plans/424242')).status).toBe(404);
  });

  it('viewer, trainer and engineer cannot create, edit or delete', async () => {
    const created = await createPlan();
    for (const role of ['viewer', 'trainer', 'engineer'] as const) {
      const agent = await t.agent(role);
      expect((await agent.post('/api/plans').send(planBody())).status, role).toBe(403);
      expect(
        (await agent.patch(`/api/plans/${created.id}`).send({ version: 1, title: 'x' })).status,
        role,
      ).toBe(403);
      expect((await agent.delete(`/api/plans/${created.id}?version=1`)).status, role).toBe(403);
    }
    expect((await t.anonymous().get('/api/plans')).status).toBe(401);
  });

  it('PATCH replaces tasks and bumps the version; a stale PATCH is 409, names the change, and changes nothing', async () => {
    const created = await createPlan();
    const planner2 = await t.agent('planner2');
    const first = await planner2
      .patch(`/api/plans/${created.id}`)
      .send({ version: 1, title: 'Renamed', tasks: [planBody().tasks[1]] });
    expect(first.status, JSON.stringify(first.body)).toBe(200);
    expect(first.body).toMatchObject({ version: 2, title: 'Renamed' });
    expect(first.body.tasks).toHaveLength(1);

    const planner = await t.agent('planner');
    const stale = await planner
      .patch(`/api/plans/${created.id}`)
      .send({ version: 1, title: 'Lost update', tasks: [] });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('CONFLICT');
    expect(stale.body.error.message).toContain('version 2');
    expect(stale.body.error.message).toContain('Tomas Reyes');
    expect(readStaleVersion(stale.body.error.details)).toMatchObject({
      currentVersion: 2,
      changedBy: 'Tomas Reyes',
    });
    const now = (await planner.get(`/api/plans/${created.id}`)).body;
    expect(now).toMatchObject({ version: 2, title: 'Renamed' });
    expect(now.tasks).toHaveLength(1);

    const bad = await planner
      .patch(`/api/plans/${created.id}`)
      .send({ version: 2, tasks: [{ ...planBody().tasks[0], worksite: 'NOPE-3' }] });
    expect(bad.status).toBe(400);
    expect((await planner.patch(`/api/plans/${created.id}`).send({ title: 'no version' })).status).toBe(400);
    const cleared = await planner.patch(`/api/plans/${created.id}`).send({ version: 2, betaDegOverride: 55 });
    expect(cleared.body.betaDegOverride).toBe(55);
    expect(
      (await planner.patch(`/api/plans/${created.id}`).send({ version: 3, betaDegOverride: null })).body
        .betaDegOverride,
    ).toBeNull();
  });

  it('DELETE needs the current version and a draft', async () => {
    const created = await createPlan();
    const planner = await t.agent('planner');
    expect((await planner.delete(`/api/plans/${created.id}`)).status).toBe(400);
    expect((await planner.delete(`/api/plans/${created.id}?version=7`)).status).toBe(409);
    await review(planner, created.id, 'submit', { version: 1 });
    expect((await planner.delete(`/api/plans/${created.id}?version=2`)).status).toBe(409);
    await review(planner, created.id, 'return', { version: 2, comment: 'withdrawn to delete' });
    expect((await planner.delete(`/api/plans/${created.id}?version=3`)).status).toBe(204);
    expect((await planner.get(`/api/plans/${created.id}`)).status).toBe(404);
  });
});

describe('review: submit, approve, return', () => {
  it('submit e-mails every planner and admin but the author, with the plan link; editing is then locked', async () => {
    await mailbox();
    const created = await createPlan({ title: 'Review mail plan' });
    const planner = await t.agent('planner');
    for (const role of ['viewer', 'trainer', 'engineer'] as const) {
      expect((await review(await t.agent(role), created.id, 'submit', { version: 1 })).status, role).toBe(
        403,
      );
    }
    const res = await review(planner, created.id, 'submit', { version: 1, comment: 'ready for a look' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'in-review', version: 2 });
    const mails = await mailbox();
    expect(mails.map((m) => m.to).sort()).toEqual(['admin@example.org', 'planner2@example.org']);
    for (const m of mails) {
      expect(m.subject).toContain('Review mail plan');
      expect(m.text).toContain(`${ORIGIN}/plans/${created.id}`);
    }

    const locked = await planner.patch(`/api/plans/${created.id}`).send({ version: 2, title: 'sneaky edit' });
    expect(locked.status).toBe(409);
    expect(locked.body.error.message).toContain('in review');
    expect((await review(planner, created.id, 'submit', { version: 2 })).status).toBe(409);
  });

  it('a plan with no tasks cannot be submitted: 409 at tasks, and the plan stays a draft', async () => {
    const created = await createPlan({ title: 'Empty day', tasks: [] });
    const planner = await t.agent('planner');
    const res = await review(planner, created.id, 'submit', { version: 1 });
    expect(res.status).toBe(409);
    expect(res.body.error.details).toEqual([{ path: 'tasks', message: 'at least one task' }]);
    expect((await planner.get(`/api/plans/${created.id}`)).body).toMatchObject({
      status: 'draft',
      version: 1,
    });
  });

  it('the author cannot approve; other roles without review rights cannot; planner2 can, and the author is mailed', async () => {
    const created = await createPlan({ title: 'Approval plan' });
    const planner = await t.agent('planner');
    await review(planner, created.id, 'submit', { version: 1 });
    await mailbox();
    const own = await review(planner, created.id, 'approve', { version: 2 });
    expect(own.status).toBe(403);
    expect(own.body.error.message).toMatch(/another planner/i);
    for (const role of ['viewer', 'trainer', 'engineer'] as const) {
      expect((await review(await t.agent(role), created.id, 'approve', { version: 2 })).status, role).toBe(
        403,
      );
    }
    const planner2 = await t.agent('planner2');
    expect((await review(planner2, created.id, 'approve', { version: 1 })).status).toBe(409);
    const ok = await review(planner2, created.id, 'approve', { version: 2, comment: 'looks right' });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ status: 'approved', approverName: 'Tomas Reyes', version: 3 });
    const mails = await mailbox();
    expect(mails).toHaveLength(1);
    expect(mails[0]).toMatchObject({
      to: 'planner@example.org',
      subject: expect.stringContaining('Approval plan'),
    });
    expect(mails[0].text).toContain(`${ORIGIN}/plans/${created.id}`);

    expect((await planner.patch(`/api/plans/${created.id}`).send({ version: 3, title: 'x' })).status).toBe(
      409,
    );
    // an admin may reopen an approved plan, with a reason; the author hears of it
    const reopened = await review(await t.agent('admin'), created.id, 'return', {
      version: 3,
      comment: 'station model changed',
    });
    expect(reopened.body).toMatchObject({ status: 'draft', approverId: null });
    const back = await mailbox();
    expect(back).toHaveLength(1);
    expect(back[0].to).toBe('planner@example.org');
    expect(back[0].text).toContain('station model changed');
    expect(reopened.body.reviewComments.map((c: { action: string }) => c.action)).toEqual([
      'submit',
      'approve',
      'return',
    ]);
  });

  it("an admin can approve a planner's plan; return needs a comment; the author may withdraw their own plan", async () => {
    const a = await createPlan({ title: 'Admin approves' });
    const planner = await t.agent('planner');
    await review(planner, a.id, 'submit', { version: 1 });
    expect((await review(await t.agent('admin'), a.id, 'approve', { version: 2 })).body.status).toBe(
      'approved',
    );

    const b = await createPlan({ title: 'Withdrawn' });
    await review(planner, b.id, 'submit', { version: 1 });
    expect((await review(await t.agent('planner2'), b.id, 'return', { version: 2 })).status).toBe(400);
    expect(
      (await review(await t.agent('planner2'), b.id, 'return', { version: 2, comment: '  ' })).status,
    ).toBe(400);
    await mailbox();
    const withdrawn = await review(planner, b.id, 'return', { version: 2, comment: 'forgot the bag' });
    expect(withdrawn.body).toMatchObject({ status: 'draft', version: 3 });
    expect(await mailbox()).toEqual([]);
    expect((await review(planner, b.id, 'return', { version: 3, comment: 'again' })).status).toBe(409);
  });
});

describe('timeline and exports', () => {
  let planId: number;
  let timeline: {
    crew: Record<'EV1' | 'EV2', { blocks: { type: string; taskIndex?: number }[] }>;
    warnings: { code: string; taskIndex?: number }[];
    reach: { taskIndex: number; reach: { reachable: boolean } | null }[];
    reachWarnings: { code: string; taskIndex: number }[];
    inventoryWarnings: { code: string; item?: string }[];
    caution: string;
  };

  beforeAll(async () => {
    planId = (await createPlan({ title: 'Timeline plan' })).id;
    const res = await (await t.agent('viewer')).get(`/api/plans/${planId}/timeline`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    timeline = fromWire(res.body) as unknown as typeof timeline;
  });

  it('lays out both crew members from egress to ingress, with work blocks for their tasks', () => {
    for (const m of ['EV1', 'EV2'] as const) {
      const types = timeline.crew[m].blocks.map((b) => b.type);
      expect(types[0], m).toBe('egress');
      expect(types.at(-1), m).toBe('ingress');
      expect(types).toContain('translate');
    }
    const work = (m: 'EV1' | 'EV2') =>
      timeline.crew[m].blocks.filter((b) => b.type === 'work').map((b) => b.taskIndex);
    expect(work('EV1')).toEqual([0, 1]);
    expect(work('EV2')).toEqual([1, 2]);
  });

  it('warns about the eclipse-only task scheduled in daylight (orbit phase 0 is sunrise)', () => {
    expect(timeline.warnings.some((w) => w.code === 'eclipse-only-outside-night' && w.taskIndex === 0)).toBe(
      true,
    );
    expect(timeline.warnings.some((w) => w.code === 'eclipse-only-outside-night' && w.taskIndex !== 0)).toBe(
      false,
    );
  });

  it('reports reach per task with a socket and warns where the socket does not reach the worksite', () => {
    expect(timeline.reach.map((r) => [r.taskIndex, r.reach?.reachable])).toEqual([
      [1, true],
      [2, false],
    ]);
    expect(timeline.warnings.filter((w: { code: string }) => w.code === 'socket-out-of-reach')).toEqual([
      expect.objectContaining({ code: 'socket-out-of-reach', taskIndex: 2, crew: 'EV2' }),
    ]);
  });

  it('carries the equipment checks in the same warnings, and the planning-aid caution', () => {
    expect(timeline.warnings).toContainEqual(
      expect.objectContaining({ code: 'unused-tool', item: 'spare-tether' }),
    );
    expect(timeline.caution).toMatch(/planning aid/);
  });

  it('CSV: a header and one properly escaped row per timeline block', async () => {
    const res = await (await t.agent('viewer')).get(`/api/plans/${planId}/export.csv`).buffer(true);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?timeline-plan-v1\.csv"?$/);
    const parsed = Papa.parse<string[]>(res.text.trim(), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const [header, ...rows] = parsed.data;
    expect(header).toEqual(CSV_HEADER);
    const blockCount = timeline.crew.EV1.blocks.length + timeline.crew.EV2.blocks.length;
    expect(rows).toHaveLength(blockCount);
    expect(rows[0].slice(0, 3)).toEqual(['EV1 Ana Vidal', 'egress', '0:00']);
    expect(rows.some((r) => r[5] === 'Swap pump, "main" unit')).toBe(true);
    expect(res.text).toContain('"Swap pump, ""main"" unit"');
  });

  it('PDF: a cue-card document in Inter with the crew steps and the caution', async () => {
    const res = await getPdf(await t.agent('trainer'), `/api/plans/${planId}/export.pdf`);
    const text = pdfAnswerText(res);
    const raw = (res.body as Buffer).toString('latin1');
    expect(text).toContain('Demate power connectors');
    expect(text).toContain('Ana Vidal');
    expect(text).toContain('Bo Lindgren');
    expect(text).toContain('Inspect pump site');
    expect(text).toMatch(/Tether swap|Translate AL-1 to/);
    const pages = (raw.match(/\/Type \/Page\b/g) ?? []).length;
    expect(pages).toBeGreaterThanOrEqual(2);
    expect(text.split('This is a planning aid').length - 1).toBe(pages);
  });
});
