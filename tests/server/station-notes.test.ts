import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { fromWire } from '@shared/compute/day/wire';
import type { PlanTimeline } from '@shared/schemas/plan-views';
import type { WalkthroughDetail } from '@shared/schemas/walkthrough';
import { buildStationDocument, FIXTURE_KEYS as K } from '../factories/station-document';
import { makeAppWithStation } from '../setup/stations';
import { getPdf, pdfText } from '../setup/pdf-text';
import type { TestApp } from '../setup/test-app';

// Notes an engineer pins on the model show on the plans and walkthroughs that pass the node.
let t: TestApp;
let stationId: number;
let planId: number;

// the factory closes the socket → worksite handrail; open it so the worksite can be reached
const doc = buildStationDocument();
doc.edges = doc.edges!.map((e) => ({ ...e, closed: false }));

beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(doc));
  const plan = await (await t.agent('planner')).post('/api/plans').send({
    title: 'Pump site day',
    stationId,
    date: '2031-04-02',
    crew: { EV1: { name: 'Ana', tetherLengthM: 25.9 }, EV2: { name: 'Ben', tetherLengthM: 25.9 } },
    tasks: [{ title: 'Open the pump cover', worksite: K.worksite, crew: 'EV1', durationSeconds: 900 }],
  });
  expect(plan.status, JSON.stringify(plan.body)).toBe(201);
  planId = plan.body.id;
});
afterAll(() => t.close());

async function pin(nodeKey: string, title: string) {
  const res = await (
    await t.agent('engineer')
  )
    .post(`/api/stations/${stationId}/annotations`)
    .send({ nodeKey, title, body: 'seen on the last inspection' });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id as number;
}

async function timeline(): Promise<PlanTimeline> {
  const res = await (await t.agent('planner')).get(`/api/plans/${planId}/timeline`);
  expect(res.status).toBe(200);
  return fromWire(res.body) as PlanTimeline;
}

describe('station notes on plans and walkthroughs', () => {
  let onRoute: number;
  let atWorksite: number;
  let offRoute: number;

  beforeAll(async () => {
    onRoute = await pin(K.junction, 'Stanchion loose');
    atWorksite = await pin(K.worksite, 'Sharp edge by the pump cover');
    offRoute = await pin(K.rideEnd, 'Far end of the ride');
  });

  it('the plan’s day lists the open notes at nodes its routes and worksites use, with the blocks', async () => {
    const day = await timeline();
    const notes = day.stationNotes ?? [];
    expect(notes.map((n) => n.id).sort()).toEqual([onRoute, atWorksite].sort());
    const stanchion = notes.find((n) => n.id === onRoute)!;
    expect(stanchion).toMatchObject({ nodeKey: K.junction, title: 'Stanchion loose' });
    // out to the pump and back in: EV1 passes the stanchion twice
    const passes = stanchion.places.filter((p) => p.crew === 'EV1' && p.type === 'translate');
    expect(passes.length).toBeGreaterThanOrEqual(2);
    expect(passes[0].taskIndex).toBe(0);
    for (const p of stanchion.places) {
      const block = day.crew[p.crew].blocks[p.block];
      expect([block.type, block.start]).toEqual([p.type, p.start]);
    }
    const edge = notes.find((n) => n.id === atWorksite)!;
    expect(edge.places).toContainEqual(
      expect.objectContaining({ type: 'work', use: 'worksite', taskIndex: 0 }),
    );
  });

  it('a resolved note leaves the plan', async () => {
    const res = await (
      await t.agent('engineer')
    )
      .patch(`/api/annotations/${offRoute}`)
      .send({ status: 'resolved' });
    expect(res.status).toBe(200);
    const resolve = await (
      await t.agent('engineer')
    )
      .patch(`/api/annotations/${atWorksite}`)
      .send({ status: 'resolved' });
    expect(resolve.status).toBe(200);
    expect((await timeline()).stationNotes?.map((n) => n.id)).toEqual([onRoute]);
    await (await t.agent('engineer')).patch(`/api/annotations/${atWorksite}`).send({ status: 'open' });
  });

  it('the cue cards print each note on the steps at its node', async () => {
    const res = await getPdf(await t.agent('trainer'), `/api/plans/${planId}/export.pdf`);
    expect(res.status).toBe(200);
    const text = pdfText(res.body as Buffer);
    expect(text).toContain(`NOTE at ${K.junction}: Stanchion loose`);
    expect(text).toContain(`NOTE at ${K.worksite}: Sharp edge by the pump cover`);
    expect(text).not.toContain('Far end of the ride');
  });

  it('a walkthrough of the plan names the steps at each note’s node', async () => {
    const res = await (
      await t.agent('trainer')
    )
      .post('/api/walkthroughs')
      .send({ name: 'Pump day', stationId, planId });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const detail = res.body as WalkthroughDetail;
    const got = await (await t.agent('viewer')).get(`/api/walkthroughs/${detail.walkthrough.id}`);
    const { stationNotes, playback } = got.body as WalkthroughDetail;
    expect(stationNotes.map((n) => n.id).sort()).toEqual([onRoute, atWorksite].sort());
    if (playback?.kind !== 'plan') throw new Error('a plan walkthrough');
    const steps = new Map(playback.crews.EV1.steps.map((s) => [s.id, s]));
    const work = stationNotes.find((n) => n.id === atWorksite)!.steps.map((id) => steps.get(id)!);
    expect(work.map((s) => s.type)).toContain('work');
    for (const id of stationNotes.find((n) => n.id === onRoute)!.steps) {
      const s = steps.get(id)!;
      expect(s.type).toBe('translate');
      expect([s.fromKey, ...(s.via ?? []), s.nodeKey]).toContain(K.junction);
    }
  });

  it('a route walkthrough past the stanchion shows it too', async () => {
    const res = await (await t.agent('trainer')).post('/api/walkthroughs').send({
      name: 'To the far anchor',
      stationId,
      route: { from: K.airlock, to: K.anchorFar, mode: 'fastest' },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect((res.body as WalkthroughDetail).stationNotes.map((n) => n.id)).toEqual([onRoute]);
  });
});
