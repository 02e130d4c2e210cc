import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildManifestItem, buildPlanInput, buildTask } from '../factories/plan';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { importStation } from '../setup/stations';
import { makeTestApp, type TestAgent, type TestApp } from '../setup/test-app';

interface Outside {
  item: string;
  where: { kind: string; node?: string };
  leftBy: number;
}
const outside = (list: Outside[]) => list.map((o) => [o.item, o.where.kind, o.where.node ?? null, o.leftBy]);

describe('the demo series: the approved camera boom EVA and the EVA that uses what it staged', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await makeTestApp({ seedDemo: true });
  });
  afterAll(() => t.close());

  it('EVA 2 finds the restraint and the bag where EVA 1 left them, and its day has no warning, approved too', async () => {
    const planner = await t.agent('planner');
    const [listed] = (await planner.get('/api/series')).body;
    const s = (await planner.get(`/api/series/${listed.id}`)).body;
    expect(s.evas.map((e: { title: string; status: string }) => [e.title, e.status])).toEqual([
      ['External camera boom install', 'approved'],
      ['Camera boom cabling and checkout', 'draft'],
    ]);
    const [one, two] = s.evas;
    expect(outside(one.outsideAfter)).toEqual([
      ['boom', 'at', 'PB2-W01', 0],
      ['restraint-1', 'installed', 'PB2-S05', 0],
      ['parts-bag', 'at', 'PB2-W01', 0],
    ]);
    expect(outside(two.foundOutside)).toEqual([
      ['restraint-1', 'installed', 'PB2-S05', 0],
      ['parts-bag', 'at', 'PB2-W01', 0],
    ]);
    // the boom stays mounted; the restraint and the bag come back in
    expect(outside(two.outsideAfter)).toEqual([['boom', 'at', 'PB2-W01', 0]]);
    expect(two.carriedOver).toEqual([]);
    expect(one.warningCount + two.warningCount).toBe(0);

    const day = (await planner.get(`/api/plans/${two.planId}/timeline`)).body;
    expect(day.warnings).toEqual([]);
    const restraint = day.equipment.find((e: { item: string }) => e.item === 'restraint-1');
    expect(restraint.states[0].where).toEqual({ kind: 'installed', node: 'PB2-S05' });
    expect(restraint.states.at(-1).where).toEqual({ kind: 'airlock' });

    const submitted = await planner.post(`/api/plans/${two.planId}/submit`).send({ version: two.version });
    const approved = await (
      await t.agent('planner2')
    )
      .post(`/api/plans/${two.planId}/approve`)
      .send({ version: submitted.body.version });
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    expect((await planner.get(`/api/plans/${two.planId}/timeline`)).body.warnings).toEqual([]);
  });
});

describe('series: create, reorder, add and remove (version-checked), carry-over re-checked', () => {
  let t: TestApp;
  let planner: TestAgent;
  let stationId: number;
  /** the factory station with the worksite's edge open */
  const doc = () => {
    const d = buildStationDocument();
    d.edges = d.edges.map((e) => (e.from === K.socket && e.to === K.worksite ? { ...e, closed: false } : e));
    return d;
  };
  const plan = async (title: string, more: Parameters<typeof buildPlanInput>[1] = {}) => {
    const res = await planner.post('/api/plans').send(buildPlanInput(stationId, { title, ...more }));
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body;
  };
  const restraint = { key: 'fr-1', name: 'Foot restraint', kind: 'foot-restraint' as const };
  /** EVA 1 installs the restraint and leaves it; EVA 2 works from it and brings it in */
  const staging = (install = true) => ({
    tasks: [
      buildTask({
        title: 'Install the restraint',
        actions: install ? [{ do: 'install' as const, item: 'fr-1', at: K.socket }] : [],
      }),
    ],
    manifest: [buildManifestItem({ ...restraint, carriedBy: 'EV1', leaveOutside: true })],
  });
  const using = {
    tasks: [
      buildTask({ title: 'Work from the restraint', socket: K.socket }),
      buildTask({ title: 'Take it out', actions: [{ do: 'remove' as const, item: 'fr-1', at: K.socket }] }),
    ],
    manifest: [buildManifestItem({ ...restraint, installedAt: K.socket, carriedBy: undefined })],
  };

  beforeAll(async () => {
    t = await makeTestApp();
    planner = await t.agent('planner');
    stationId = (await importStation(await t.agent('engineer'), doc())).id;
  });
  afterAll(() => t.close());

  it('creates, reorders, adds and removes EVAs; stale versions, foreign plans and other stations are refused', async () => {
    const a = await plan('A');
    const b = await plan('B');
    const c = await plan('C');
    const created = await planner.post('/api/series').send({ title: 'Three', planIds: [a.id, b.id] });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const s = created.body;
    expect(s.evas.map((e: { planId: number }) => e.planId)).toEqual([a.id, b.id]);
    const reordered = await planner
      .patch(`/api/series/${s.id}`)
      .send({ version: s.version, planIds: [b.id, a.id, c.id] });
    expect(reordered.status, JSON.stringify(reordered.body)).toBe(200);
    expect(reordered.body.evas.map((e: { planId: number }) => e.planId)).toEqual([b.id, a.id, c.id]);
    const stale = await planner.patch(`/api/series/${s.id}`).send({ version: s.version, planIds: [a.id] });
    expect(stale.status).toBe(409);
    const removed = await planner
      .patch(`/api/series/${s.id}`)
      .send({ version: reordered.body.version, planIds: [c.id] });
    expect(removed.body.evas.map((e: { planId: number }) => e.planId)).toEqual([c.id]);
    // a plan is in one series at most
    const other = await planner.post('/api/series').send({ title: 'Other', planIds: [c.id] });
    expect(other.status).toBe(409);
    expect((await planner.post('/api/series').send({ title: 'None', planIds: [99999] })).status).toBe(400);
    expect((await planner.post('/api/series').send({ title: 'Twice', planIds: [a.id, a.id] })).status).toBe(
      400,
    );
    const elsewhere = (await importStation(await t.agent('engineer'), { ...doc(), name: 'Second station' }))
      .id;
    const far = (await planner.post('/api/plans').send(buildPlanInput(elsewhere, { title: 'Far' }))).body;
    const mixed = await planner.post('/api/series').send({ title: 'Mixed', planIds: [a.id, far.id] });
    expect(mixed.status).toBe(400);
    expect(
      (await (await t.agent('viewer')).post('/api/series').send({ title: 'V', planIds: [a.id] })).status,
    ).toBe(403);

    // deleting an EVA's plan takes it out of the series and moves the series' version on
    const before = (await planner.get(`/api/series/${s.id}`)).body;
    expect((await planner.delete(`/api/plans/${c.id}?version=${c.version}`)).status).toBe(204);
    const after = (await planner.get(`/api/series/${s.id}`)).body;
    expect(after.evas).toEqual([]);
    expect(after.version).toBe(before.version + 1);
    // deleting the series keeps its plans
    expect((await planner.delete(`/api/series/${s.id}?version=${after.version}`)).status).toBe(204);
    expect((await planner.get(`/api/series/${s.id}`)).status).toBe(404);
    expect((await planner.get(`/api/plans/${a.id}`)).status).toBe(200);
  });

  it('changing EVA 1 re-checks EVA 2: without the restraint installed, EVA 2 is told, in the series and on its own timeline', async () => {
    const one = await plan('Stage', staging());
    const two = await plan('Use', using);
    const s = (await planner.post('/api/series').send({ title: 'Pair', planIds: [one.id, two.id] })).body;
    expect(s.evas[1].carriedOver, JSON.stringify(s.evas[1].carriedOver)).toEqual([]);
    const codes = async () =>
      (await planner.get(`/api/plans/${two.id}/timeline`)).body.warnings.map((w: { code: string }) => w.code);
    expect(await codes()).not.toContain('restraint-missing');

    const changed = await planner
      .patch(`/api/plans/${one.id}`)
      .send({ version: one.version, tasks: staging(false).tasks });
    expect(changed.status, JSON.stringify(changed.body)).toBe(200);
    const again = (await planner.get(`/api/series/${s.id}`)).body;
    // the restraint EVA 2 expects is in the airlock: it is not there to stand in, nor to take out
    expect(again.evas[1].carriedOver.map((w: { code: string }) => w.code)).toEqual([
      'start-differs',
      'restraint-missing',
      'item-not-there',
    ]);
    expect(await codes()).toContain('restraint-missing');
  });

  it('duplicates a plan as a new draft with the same tasks and manifest', async () => {
    const source = await plan('Source', staging());
    const res = await (await t.agent('planner2')).post(`/api/plans/${source.id}/duplicate`).send({});
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({
      title: 'Source (copy)',
      status: 'draft',
      version: 1,
      authorName: expect.any(String),
    });
    expect(res.body.id).not.toBe(source.id);
    const strip = (list: { id?: number }[]) => list.map(({ id: _id, ...x }) => x);
    expect(strip(res.body.tasks)).toEqual(strip(source.tasks));
    expect(strip(res.body.manifest)).toEqual(strip(source.manifest));
    expect((await planner.post('/api/plans/99999/duplicate').send({})).status).toBe(404);
  });
});
