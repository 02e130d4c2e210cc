import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildPlanInput, buildTask } from '../factories/plan';
import { buildStationDocument, FIXTURE_KEYS as K, stationDocumentFile } from '../factories/station-document';
import { importStation } from '../setup/stations';
import { makeTestApp, type TestAgent, type TestApp } from '../setup/test-app';

const NEAR_SITE = 'T2-W2';

let t: TestApp;
let engineer: TestAgent;
let planner: TestAgent;
let planner2: TestAgent;

/** The factory station with the worksite's edge open and a second worksite in reach of the socket. */
function stationDoc(dropWorksite = false) {
  const doc = buildStationDocument();
  doc.edges = doc.edges.map((e) =>
    e.from === K.socket && e.to === K.worksite ? { ...e, closed: false } : e,
  );
  doc.nodes.push({ key: NEAR_SITE, kind: 'worksite', label: 'Valve panel', position: [9, 2.5, 0.4] });
  doc.edges.push({ from: K.socket, to: NEAR_SITE, kind: 'handrail' });
  if (dropWorksite) {
    doc.nodes = doc.nodes.filter((n) => n.key !== K.worksite);
    doc.edges = doc.edges.filter((e) => e.from !== K.worksite && e.to !== K.worksite);
  }
  return doc;
}

const newStation = async () => (await importStation(engineer, stationDoc())).id;

const planBody = (stationId: number, title: string) =>
  buildPlanInput(stationId, {
    title,
    tasks: [
      buildTask({ title: 'Open the valve panel', worksite: NEAR_SITE }),
      buildTask({ title: 'Photograph the panel', worksite: NEAR_SITE, crew: 'EV2', durationSeconds: 300 }),
      buildTask({ title: 'Swap the pump', durationSeconds: 900 }),
    ],
  });

/** A plan by `planner`, submitted, and approved by `planner2` (who did not write it). */
async function approvedPlan(stationId: number, title: string) {
  const created = await planner.post('/api/plans').send(planBody(stationId, title));
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  const id = created.body.id;
  const submitted = await planner.post(`/api/plans/${id}/submit`).send({ version: created.body.version });
  expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
  const approved = await planner2.post(`/api/plans/${id}/approve`).send({ version: submitted.body.version });
  expect(approved.status, JSON.stringify(approved.body)).toBe(200);
  return approved.body;
}

async function mailbox(): Promise<{ to: string; subject: string; text: string }[]> {
  const admin = await t.agent('admin');
  const res = await admin.get('/api/mailbox');
  await admin.delete('/api/mailbox');
  return res.body;
}

const stationVersionOf = async (id: number) =>
  (await engineer.get(`/api/stations/${id}`)).body.version as number;

beforeAll(async () => {
  t = await makeTestApp();
  engineer = await t.agent('engineer');
  planner = await t.agent('planner');
  planner2 = await t.agent('planner2');
});
afterAll(() => t.close());

describe('an approval stays true: the plan is pinned to the station version it was approved on', () => {
  it('a model replaced without a worksite the approved plan uses: the engineer is told first, the plan is flagged, its day is unchanged, its author mailed', async () => {
    const stationId = await newStation();
    const plan = await approvedPlan(stationId, 'Pump swap');
    const draft = (await planner.post('/api/plans').send(planBody(stationId, 'Draft on the same station')))
      .body;
    const v1 = await stationVersionOf(stationId);
    expect(plan.submittedStationVersion).toBe(v1);
    expect(plan.approvedStationVersion).toBe(v1);
    const dayBefore = (await planner.get(`/api/plans/${plan.id}/timeline`)).body;
    expect(dayBefore.warnings).toEqual([]);
    await mailbox();

    // asked first: a dry run names the plan and writes nothing
    const dry = await engineer
      .put(`/api/stations/${stationId}/import?dryRun=1&version=${v1}`)
      .attach('file', stationDocumentFile(stationDoc(true)), 's.json');
    expect(dry.status, JSON.stringify(dry.body)).toBe(200);
    expect(dry.body).toEqual({
      dryRun: true,
      version: v1,
      affectedPlans: [{ id: plan.id, title: 'Pump swap', status: 'approved' }],
    });
    expect(await stationVersionOf(stationId)).toBe(v1);
    expect(await mailbox()).toEqual([]);

    const res = await engineer
      .put(`/api/stations/${stationId}/import?version=${v1}`)
      .attach('file', stationDocumentFile(stationDoc(true)), 's.json');
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.affectedPlans).toEqual([{ id: plan.id, title: 'Pump swap', status: 'approved' }]);
    expect(res.body.affectedPlans.map((p: { id: number }) => p.id)).not.toContain(draft.id);

    const after = (await planner.get(`/api/plans/${plan.id}`)).body;
    expect(after.status).toBe('approved');
    expect(after.stationChangedSinceApproval).toBe(true);
    expect(after.stationVersion).toBe(v1);
    expect(after.currentStationVersion).toBe(v1 + 1);
    const removed = after.stationChanges.find((c: { id: string }) => c.id === K.worksite);
    expect(removed).toMatchObject({ what: 'node', change: 'removed' });
    expect(removed.touches).toContain('worksite of task 3');
    expect(after.stationChanges.some((c: { what: string }) => c.what === 'edge')).toBe(true);
    expect(after.stationNotices).toHaveLength(1);
    expect(after.stationNotices[0]).toMatchObject({ stationVersion: v1 + 1, planStatus: 'approved' });

    // the approved day is computed on the version it was approved on: nothing moved under it
    const dayAfter = (await planner.get(`/api/plans/${plan.id}/timeline`)).body;
    expect(dayAfter.stationVersion).toBe(v1);
    expect(dayAfter.endSeconds).toBe(dayBefore.endSeconds);
    expect(dayAfter.warnings).toEqual([]);
    expect(dayAfter.stationChangedSinceApproval).toBe(true);

    const mails = await mailbox();
    expect(mails.map((m) => [m.to, m.subject])).toEqual([
      ['planner@example.org', 'Station changed under "Pump swap"'],
    ]);
    expect(mails[0].text).toContain(`node ${K.worksite} removed: worksite of task 3`);

    // reopened, the plan is computed on the station as it is: the missing worksite shows
    const returned = await planner2
      .post(`/api/plans/${plan.id}/return`)
      .send({ version: after.version, comment: 'station changed' });
    expect(returned.status).toBe(200);
    const reopened = (await planner.get(`/api/plans/${plan.id}/timeline`)).body;
    expect(reopened.stationVersion).toBe(v1 + 1);
    expect(reopened.warnings.map((w: { code: string }) => w.code)).toContain('unknown-worksite');
    expect((await planner.get(`/api/plans/${plan.id}`)).body.stationChangedSinceApproval).toBe(false);
  });

  it('a change that touches none of the plan is not put to the engineer, but the plan still says its station moved on', async () => {
    const stationId = await newStation();
    const plan = await approvedPlan(stationId, 'Untouched');
    const v = await stationVersionOf(stationId);
    const res = await engineer
      .post(`/api/stations/${stationId}/nodes`)
      .send({ version: v, node: { key: 'FAR-A1', kind: 'anchor', position: [40, 0, 0] } });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.affectedPlans).toBeUndefined();
    const after = (await planner.get(`/api/plans/${plan.id}`)).body;
    expect(after.stationChangedSinceApproval).toBe(true);
    expect(after.stationChanges).toEqual([]);
    expect(after.stationNotices).toEqual([]);
  });

  it('moving a node on a route or a hazard across it touches the plan; a dry-run edit writes nothing', async () => {
    const stationId = await newStation();
    const plan = await approvedPlan(stationId, 'Routes');
    let v = await stationVersionOf(stationId);
    const move = { version: v, node: { position: [5, 0, 1.6] } };
    const dry = await engineer.patch(`/api/stations/${stationId}/nodes/${K.junction}?dryRun=1`).send(move);
    expect(dry.status, JSON.stringify(dry.body)).toBe(200);
    expect(dry.body.affectedPlans.map((p: { id: number }) => p.id)).toEqual([plan.id]);
    expect(await stationVersionOf(stationId)).toBe(v);
    const moved = await engineer.patch(`/api/stations/${stationId}/nodes/${K.junction}`).send(move);
    expect(moved.body.affectedPlans.map((p: { id: number }) => p.id)).toEqual([plan.id]);
    v = moved.body.version;
    const hazard = await engineer.post(`/api/stations/${stationId}/hazards`).send({
      version: v,
      hazard: { key: 'NEW-1', kind: 'caution', shape: 'sphere', center: [3, 0, 1.5], radiusM: 0.5 },
    });
    expect(hazard.status, JSON.stringify(hazard.body)).toBe(201);
    expect(hazard.body.affectedPlans.map((p: { id: number }) => p.id)).toEqual([plan.id]);
    const flagged = (await planner.get(`/api/plans/${plan.id}`)).body;
    expect(
      flagged.stationChanges.map((c: { what: string; id: string }) => `${c.what} ${c.id}`).sort(),
    ).toEqual(['hazard NEW-1', `node ${K.junction}`]);
    expect(flagged.stationNotices.map((n: { stationVersion: number }) => n.stationVersion)).toEqual([
      v + 1,
      v,
    ]);
  });

  it('approval against a station that moved while the reviewer looked is refused (409) when the reviewer says which version they saw', async () => {
    const stationId = await newStation();
    const created = (await planner.post('/api/plans').send(planBody(stationId, 'Stale look'))).body;
    const submitted = (
      await planner.post(`/api/plans/${created.id}/submit`).send({ version: created.version })
    ).body;
    const seen = await stationVersionOf(stationId);
    const edit = await engineer
      .post(`/api/stations/${stationId}/nodes`)
      .send({ version: seen, node: { key: 'FAR-A2', kind: 'anchor', position: [40, 1, 0] } });
    expect(edit.status).toBe(201);
    const stale = await planner2
      .post(`/api/plans/${created.id}/approve`)
      .send({ version: submitted.version, stationVersion: seen });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('CONFLICT');
    const ok = await planner2
      .post(`/api/plans/${created.id}/approve`)
      .send({ version: submitted.version, stationVersion: seen + 1 });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.submittedStationVersion).toBe(seen);
    expect(ok.body.approvedStationVersion).toBe(seen + 1);
    // a stale plan version is refused as before
    const again = await planner2
      .post(`/api/plans/${created.id}/approve`)
      .send({ version: submitted.version });
    expect(again.status).toBe(409);
  });
});
