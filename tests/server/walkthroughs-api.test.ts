import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readStaleVersion } from '@shared/errors';
import type { Role } from '@shared/auth/permissions';
import { planWalkthrough, type CrewTrack } from '@shared/compute/walkthrough';
import { fromWire } from '@shared/compute/day/wire';
import type { PlanTimeline } from '@shared/schemas/plan-views';
import type { Vec3 } from '@shared/schemas/station';
import type {
  PlanPlayback,
  RoutePlayback,
  WalkthroughDetail,
  WalkthroughSummary,
} from '@shared/schemas/walkthrough';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { makeAppWithStation } from '../setup/stations';
import type { TestApp } from '../setup/test-app';
import { DEMO_WALKTHROUGH_PLAN, seedDemoWalkthroughs } from '../../server/db/seed/demo-walkthroughs';

let t: TestApp;
let stationId: number;
let planId: number;

// the factory closes the socket → worksite handrail; open it so the worksite can be reached
const doc = buildStationDocument();
doc.edges = doc.edges!.map((e) => ({ ...e, closed: false }));
const positions = new Map(doc.nodes!.map((n) => [n.key, n.position as Vec3]));

const planBody = () => ({
  title: 'Pump site rehearsal',
  stationId,
  date: '2031-04-02',
  crew: { EV1: { name: 'Ana', tetherLengthM: 7 }, EV2: { name: 'Ben', tetherLengthM: 25.9 } },
  tasks: [
    {
      title: 'Open the pump cover',
      worksite: K.worksite,
      crew: 'EV1',
      durationSeconds: 900,
      socket: K.socket,
    },
    { title: 'Swap the pump', worksite: K.worksite, crew: 'both', durationSeconds: 1200 },
  ],
});

beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(doc));
  const plan = await (await t.agent('planner')).post('/api/plans').send(planBody());
  expect(plan.status, JSON.stringify(plan.body)).toBe(201);
  planId = plan.body.id;
});
afterAll(() => t.close());

async function createPlanWalkthrough(role: Role = 'trainer', name = 'Pump day') {
  return (await t.agent(role)).post('/api/walkthroughs').send({ name, stationId, planId });
}

const stepsOf = (track: CrewTrack) =>
  track.steps.map(({ id, type, start, end, nodeKey, clipKey, releaseKey }) => ({
    id,
    type,
    start,
    end,
    nodeKey,
    clipKey,
    releaseKey,
  }));

describe('walkthroughs API', () => {
  it('creates a plan walkthrough whose playback is planWalkthrough of the timeline endpoint’s timeline', async () => {
    const res = await createPlanWalkthrough();
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const detail = res.body as WalkthroughDetail;
    expect(detail.walkthrough).toMatchObject({
      name: 'Pump day',
      kind: 'plan',
      planId,
      stationId,
      version: 1,
      notes: {},
    });
    expect(detail.changedSince).toBe(false);

    // the timeline as the client reads it: compact legs on the wire, metres to the mm, seconds to 0.01 s
    const timeline = fromWire<PlanTimeline>(
      (await (await t.agent('viewer')).get(`/api/plans/${planId}/timeline`)).body,
    );
    const plan = (await (await t.agent('viewer')).get(`/api/plans/${planId}`)).body;
    const expected = planWalkthrough(timeline, plan.tasks, timeline.airlockKey, (k) => positions.get(k)!);
    const playback = detail.playback as PlanPlayback;
    expect(playback.kind).toBe('plan');
    for (const crew of ['EV1', 'EV2'] as const) {
      expect(stepsOf(playback.crews[crew])).toEqual(stepsOf(expected.crews[crew]));
      const pieces = expected.crews[crew].pieces;
      expect(playback.crews[crew].pieces.length).toBe(pieces.length);
      playback.crews[crew].pieces.forEach((p, i) => {
        expect([p.from, p.to, p.anchorKey]).toEqual([pieces[i].from, pieces[i].to, pieces[i].anchorKey]);
        expect(p.t0).toBeCloseTo(pieces[i].t0, 1);
        expect(p.t1).toBeCloseTo(pieces[i].t1, 1);
        expect(p.paid1).toBeCloseTo(pieces[i].paid1, 2);
      });
    }
    expect(playback.endSeconds).toBeCloseTo(timeline.endSeconds, 9);
    expect(playback.nightWindows).toEqual(timeline.nightWindows);
    expect(playback.tetherLengthM).toEqual({ EV1: 7, EV2: 25.9 });
    // EV1's 7 m tether cannot span the handrail run: the playback carries the engine's swaps
    const swaps = playback.crews.EV1.steps.filter((s) => s.type === 'swap');
    expect(swaps.length).toBeGreaterThan(0);
    for (const s of swaps) expect(playback.positions[s.clipKey!]).toEqual(positions.get(s.clipKey!));
    expect(playback.crews.EV1.steps.some((s) => s.type === 'restraint-in' && s.socketKey === K.socket)).toBe(
      true,
    );
  });

  it('plays the items the way the timeline has them: equipment tracks, their places and the steps that move them', async () => {
    const planner = await t.agent('planner');
    const plan = await planner.post('/api/plans').send({
      ...planBody(),
      title: 'Restraint day',
      manifest: [{ key: 'fr-1', name: 'Portable foot restraint', kind: 'foot-restraint', carriedBy: 'EV1' }],
      tasks: [
        {
          title: 'Install the restraint',
          worksite: K.worksite,
          crew: 'EV1',
          durationSeconds: 300,
          actions: [{ do: 'install', item: 'fr-1', at: K.socket }],
        },
        { title: 'Work from it', worksite: K.worksite, crew: 'EV1', durationSeconds: 600, socket: K.socket },
      ],
    });
    expect(plan.status, JSON.stringify(plan.body)).toBe(201);
    const res = await (
      await t.agent('trainer')
    )
      .post('/api/walkthroughs')
      .send({ name: 'Restraint day', stationId, planId: plan.body.id });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const playback = (res.body as WalkthroughDetail).playback as PlanPlayback;
    const timeline = (await planner.get(`/api/plans/${plan.body.id}/timeline`)).body;
    expect(playback.equipment).toEqual(timeline.equipment);
    const states = playback.equipment[0].states.map((st) => st.where);
    expect(states).toContainEqual({ kind: 'installed', node: K.socket });
    expect(playback.positions[K.socket]).toEqual(positions.get(K.socket));
    expect(playback.normals[K.socket]).toEqual(doc.nodes!.find((n) => n.key === K.socket)!.normal);
    const install = playback.crews.EV1.steps.find((st) => st.type === 'work' && st.taskIndex === 0)!;
    expect(install.equipment).toEqual([`EV1 installs Portable foot restraint at ${K.socket}`]);
  });

  it('creates a route walkthrough; an infeasible route is a 400 with the reason, an unknown key a 404', async () => {
    const trainer = await t.agent('trainer');
    const ok = await trainer.post('/api/walkthroughs').send({
      name: 'To the socket',
      stationId,
      route: { from: K.airlock, to: K.socket, mode: 'fewest-swaps', tetherLengthM: 7 },
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
    const playback = ok.body.playback as RoutePlayback;
    expect(playback.kind).toBe('route');
    const route = (
      await trainer
        .post(`/api/stations/${stationId}/routes`)
        .send({ from: K.airlock, to: K.socket, mode: 'fewest-swaps', tetherLengthM: 7 })
    ).body;
    expect(playback.track.steps.filter((s) => s.type === 'swap').map((s) => s.clipKey)).toEqual(
      route.swaps.map((s: { node: string }) => s.node),
    );
    expect(playback.endSeconds).toBeCloseTo(route.totalSeconds, 9);
    expect(ok.body.walkthrough.basedOnVersion).toBe(1);

    const gap = await trainer.post('/api/walkthroughs').send({
      name: 'Too short',
      stationId,
      route: { from: K.airlock, to: K.socket, mode: 'fastest', tetherLengthM: 1 },
    });
    expect(gap.status).toBe(400);
    expect(gap.body.error.message).toMatch(/tether|anchor/i);

    const unknown = await trainer
      .post('/api/walkthroughs')
      .send({ name: 'x', stationId, route: { from: K.airlock, to: 'NOPE-1', mode: 'fastest' } });
    expect(unknown.status).toBe(404);
    expect(
      (await trainer.post('/api/walkthroughs').send({ name: 'x', stationId, planId: 99999 })).status,
    ).toBe(404);
    expect(
      (
        await trainer
          .post('/api/walkthroughs')
          .send({ name: 'x', stationId: 99999, route: { from: K.airlock, to: K.socket, mode: 'fastest' } })
      ).status,
    ).toBe(404);
    expect(
      (
        await trainer
          .post('/api/walkthroughs')
          .send({ name: 'x', stationId, planId, route: { from: K.airlock, to: K.socket, mode: 'fastest' } })
      ).status,
    ).toBe(400);
    expect((await trainer.get('/api/walkthroughs/99999')).status).toBe(404);
  });

  it('lets trainers and admins write, refuses planners, engineers and viewers; everyone signed in reads', async () => {
    const created = await createPlanWalkthrough('admin', 'Admin copy');
    expect(created.status).toBe(201);
    const id = created.body.walkthrough.id;
    for (const role of ['planner', 'engineer', 'viewer'] as const) {
      const agent = await t.agent(role);
      expect((await createPlanWalkthrough(role)).status, role).toBe(403);
      expect(
        (await agent.patch(`/api/walkthroughs/${id}`).send({ version: 1, name: 'no' })).status,
        role,
      ).toBe(403);
      expect((await agent.delete(`/api/walkthroughs/${id}`)).status, role).toBe(403);
      expect((await agent.get('/api/walkthroughs')).status, role).toBe(200);
      expect((await agent.get(`/api/walkthroughs/${id}`)).status, role).toBe(200);
    }
    expect((await t.anonymous().get('/api/walkthroughs')).status).toBe(401);
    const trainer = await t.agent('trainer');
    expect(
      (await trainer.patch(`/api/walkthroughs/${id}`).send({ version: 1, name: 'Renamed by trainer' }))
        .status,
    ).toBe(200);
    expect((await trainer.delete(`/api/walkthroughs/${id}?version=1`)).status).toBe(409);
    expect((await trainer.delete(`/api/walkthroughs/${id}?version=2`)).status).toBe(204);
    expect((await trainer.get(`/api/walkthroughs/${id}`)).status).toBe(404);
  });

  it('saves per-step notes with the version, and a stale write is a 409 that keeps the first write', async () => {
    const created = (await createPlanWalkthrough('trainer', 'Notes test')).body as WalkthroughDetail;
    const id = created.walkthrough.id;
    const [first, second] = (created.playback as PlanPlayback).crews.EV1.steps;
    const trainer = await t.agent('trainer');
    const saved = await trainer
      .patch(`/api/walkthroughs/${id}`)
      .send({ version: 1, notes: { [first.id]: 'Check both hooks', [second.id]: 'Call the time' } });
    expect(saved.status).toBe(200);
    expect(saved.body.walkthrough).toMatchObject({
      version: 2,
      notes: { [first.id]: 'Check both hooks', [second.id]: 'Call the time' },
    });

    const stale = await (
      await t.agent('admin')
    )
      .patch(`/api/walkthroughs/${id}`)
      .send({ version: 1, notes: { [first.id]: 'overwrite' } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('CONFLICT');
    expect(stale.body.error.message).toMatch(/version 1.*version is 2/);
    expect(readStaleVersion(stale.body.error.details)).toMatchObject({ currentVersion: 2, changedBy: null });

    // an empty note removes it; the other stays
    const cleared = await trainer
      .patch(`/api/walkthroughs/${id}`)
      .send({ version: 2, notes: { [second.id]: '  ' } });
    expect(cleared.body.walkthrough.notes).toEqual({ [first.id]: 'Check both hooks' });
    expect(
      (await trainer.patch(`/api/walkthroughs/${id}`).send({ version: 3, notes: { 'not a step': 'x' } }))
        .status,
    ).toBe(400);

    const list = (await (await t.agent('viewer')).get('/api/walkthroughs')).body as WalkthroughSummary[];
    const row = list.find((w) => w.id === id)!;
    expect(row).toMatchObject({
      name: 'Notes test',
      kind: 'plan',
      stationId,
      noteCount: 1,
      stale: false,
      authorName: expect.any(String),
    });
    expect(row.plan).toMatchObject({ id: planId, title: 'Pump site rehearsal' });
  });

  it('flags changedSince once the plan is edited, and rebase accepts the current version', async () => {
    const created = (await createPlanWalkthrough('trainer', 'Change test')).body as WalkthroughDetail;
    const id = created.walkthrough.id;
    const planner = await t.agent('planner');
    const plan = (await planner.get(`/api/plans/${planId}`)).body;
    const edited = await planner.patch(`/api/plans/${planId}`).send({
      version: plan.version,
      tasks: [
        ...planBody().tasks,
        { title: 'Close out', worksite: K.worksite, crew: 'EV2', durationSeconds: 600 },
      ],
    });
    expect(edited.status, JSON.stringify(edited.body)).toBe(200);

    const trainer = await t.agent('trainer');
    const after = (await trainer.get(`/api/walkthroughs/${id}`)).body as WalkthroughDetail;
    expect(after.changedSince).toBe(true);
    expect(after.notice).toMatch(/plan has changed/);
    expect(after.currentVersion).toBe(edited.body.version);
    // the playback follows the plan as it is now
    expect((after.playback as PlanPlayback).crews.EV2.steps.some((s) => s.title === 'Close out')).toBe(true);
    const listed = ((await trainer.get('/api/walkthroughs')).body as WalkthroughSummary[]).find(
      (w) => w.id === id,
    )!;
    expect(listed.stale).toBe(true);

    const rebased = await trainer.patch(`/api/walkthroughs/${id}`).send({ version: 1, rebase: true });
    expect(rebased.status).toBe(200);
    expect(rebased.body.changedSince).toBe(false);
    expect(rebased.body.walkthrough.basedOnVersion).toBe(edited.body.version);
  });

  it('seeds one walkthrough of the demo plan by the demo trainer, with notes, only when none exists', async () => {
    const { t: fresh, station } = await makeAppWithStation(doc);
    try {
      const plan = await (
        await fresh.agent('planner')
      )
        .post('/api/plans')
        .send({ ...planBody(), stationId: station.id, title: DEMO_WALKTHROUGH_PLAN });
      expect(plan.status).toBe(201);
      seedDemoWalkthroughs(fresh.ctx);
      seedDemoWalkthroughs(fresh.ctx);
      const list = (await (await fresh.agent('viewer')).get('/api/walkthroughs'))
        .body as WalkthroughSummary[];
      expect(list).toHaveLength(1);
      expect(list[0]).toMatchObject({ kind: 'plan', authorName: 'Jonah Abara', stale: false });
      expect(list[0].plan?.title).toBe(DEMO_WALKTHROUGH_PLAN);
      const detail = (await (await fresh.agent('viewer')).get(`/api/walkthroughs/${list[0].id}`))
        .body as WalkthroughDetail;
      const pb = detail.playback as PlanPlayback;
      const ids = new Set([...pb.crews.EV1.steps, ...pb.crews.EV2.steps].map((st) => st.id));
      expect(Object.keys(detail.walkthrough.notes).length).toBeGreaterThanOrEqual(2);
      for (const id of Object.keys(detail.walkthrough.notes)) expect(ids.has(id)).toBe(true);
    } finally {
      await fresh.close();
    }
  });
});
