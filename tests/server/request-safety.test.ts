import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FIXTURE_KEYS as K, stationDocumentFile } from '../factories/station-document';
import { makeTestApp, type TestApp } from '../setup/test-app';

/**
 * Holes a hostile test of the running server found, one test each: the answer is a clear 4xx in the
 * error shape, never a 500, and what a person may do is what the rules say.
 */

const ORIGIN = 'http://tetherwise.test';

let t: TestApp;
let stationId: number;

beforeAll(async () => {
  t = await makeTestApp({ publicOrigin: ORIGIN });
  const res = await (
    await t.agent('engineer')
  )
    .post('/api/stations/import')
    .attach('file', stationDocumentFile(), 'station.json');
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  stationId = res.body.station.id;
});
afterAll(() => t.close());

function planBody(title: string) {
  return {
    title,
    stationId,
    date: '2031-05-02',
    crew: { EV1: { name: 'Ana Vidal' }, EV2: { name: 'Bo Lindgren' } },
    tasks: [{ title: 'Inspect the pump site', worksite: K.worksite, crew: 'EV1', durationSeconds: 600 }],
  };
}

describe('plan CSV export', () => {
  it('formula injection does not survive a line break in a cell', async () => {
    const planner = await t.agent('planner');
    const title = '=HYPERLINK("http://evil.example/x","Open")\nthen the pump';
    const plan = await planner.post('/api/plans').send({
      ...planBody('Formula plan'),
      tasks: [{ ...planBody('x').tasks[0], title }],
    });
    expect(plan.status, JSON.stringify(plan.body)).toBe(201);
    const csv = await planner.get(`/api/plans/${plan.body.id}/export.csv`).buffer(true);
    expect(csv.status).toBe(200);
    const rows = Papa.parse<string[]>(csv.text.trim(), { skipEmptyLines: true }).data;
    const cells = rows.flat();
    expect(cells).toContain(`'${title}`);
    // no cell a spreadsheet would evaluate: none starts with = + - @ or a tab or line break
    for (const cell of cells) expect(cell, JSON.stringify(cell)).not.toMatch(/^[=+\-@\t\r\n]/);
  });
});

describe('four-eyes review', () => {
  it('nobody who changed the submitted plan approves it: planner B edits A’s plan, submits it and cannot approve it', async () => {
    const a = await t.agent('planner');
    const b = await t.agent('planner2');
    const created = await a.post('/api/plans').send(planBody('Four eyes'));
    expect(created.status).toBe(201);
    const id = created.body.id;
    const edited = await b.patch(`/api/plans/${id}`).send({
      version: created.body.version,
      tasks: [{ ...planBody('x').tasks[0], durationSeconds: 1200 }],
    });
    expect(edited.status, JSON.stringify(edited.body)).toBe(200);
    expect(edited.body.editors.map((e: { name: string }) => e.name).sort()).toEqual([
      'Priya Lindqvist',
      'Tomas Reyes',
    ]);
    const submitted = await b.post(`/api/plans/${id}/submit`).send({ version: edited.body.version });
    expect(submitted.status).toBe(200);
    const approve = (agent: typeof a, version: number) =>
      agent.post(`/api/plans/${id}/approve`).send({ version });
    const byB = await approve(b, submitted.body.version);
    expect(byB.status).toBe(403);
    expect(byB.body.error.message).toMatch(/changed this plan/);
    expect((await approve(a, submitted.body.version)).status).toBe(403);

    // someone who changed nothing approves; once approved and reopened, B's old edit was reviewed
    const admin = await t.agent('admin');
    const approved = await approve(admin, submitted.body.version);
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    expect(approved.body.editors).toEqual([]);
    const reopened = await admin
      .post(`/api/plans/${id}/return`)
      .send({ version: approved.body.version, comment: 'one more look' });
    const resubmitted = await a.post(`/api/plans/${id}/submit`).send({ version: reopened.body.version });
    expect((await approve(b, resubmitted.body.version)).status).toBe(200);
  });
});
