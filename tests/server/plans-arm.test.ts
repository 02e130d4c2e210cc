import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LINE_KEYS as K, lineStationDocument } from '../factories/day';
import { getPdf, pdfText } from '../setup/pdf-text';
import { importStation, makeAppWithStation } from '../setup/stations';
import type { TestAgent, TestApp } from '../setup/test-app';
import { fromWire } from '@shared/compute/day/wire';

/**
 * The line station with an arm based at A2 (16, 0, 0), reach 1–20 m, and a worksite WX at (8, 6, 8)
 * off every handrail; a keep-out sphere between A1 and WX can be switched on by a second station.
 */
const ARM = { key: 'ARM-1', baseNode: K.a2, reachM: 20, minReachM: 1, tipSpeedMps: 0.1, settleSeconds: 30 };
const withArm = (over: object = {}) =>
  lineStationDocument({
    nodes: [...lineStationDocument().nodes, { key: 'WX', kind: 'worksite', position: [8, 6, 8] }],
    arms: [ARM],
    ...over,
  });

let t: TestApp;
let planner: TestAgent;
let stationId: number;
let blockedId: number;
let bareId: number;
let shortId: number;

beforeAll(async () => {
  ({
    t,
    station: { id: stationId },
  } = await makeAppWithStation(withArm()));
  planner = await t.agent('planner');
  const engineer = await t.agent('engineer');
  blockedId = (
    await importStation(
      engineer,
      withArm({
        hazards: [{ key: 'RAD', kind: 'keep-out', shape: 'sphere', center: [8, 3, 4], radiusM: 1 }],
      }),
    )
  ).id;
  bareId = (await importStation(engineer, lineStationDocument())).id;
  shortId = (await importStation(engineer, withArm({ arms: [{ ...ARM, reachM: 12 }] }))).id;
});
afterAll(() => t.close());

const task = (title: string, worksite: string, crew: string, more: Record<string, unknown> = {}) => ({
  title,
  worksite,
  crew,
  durationSeconds: 300,
  ...more,
});
const armRestraint = {
  key: 'afr',
  name: 'Arm foot restraint',
  kind: 'foot-restraint',
  installedAt: 'ARM-1',
  leaveOutside: true,
};
const onArm = (ingress: string, more: object = {}) => ({ arm: { key: 'ARM-1', ingress, ...more } });

function planBody(tasks: unknown[], manifest: unknown[] = [armRestraint], station = stationId) {
  return {
    title: 'Arm day',
    stationId: station,
    date: '2031-05-01',
    crew: { EV1: { name: 'Avery', tetherLengthM: 12 }, EV2: { name: 'Brook', tetherLengthM: 12 } },
    routeMode: 'fewest-swaps',
    tasks,
    manifest,
  };
}

async function day(tasks: unknown[], manifest?: unknown[], station?: number) {
  const created = await planner.post('/api/plans').send(planBody(tasks, manifest, station));
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  const res = await planner.get(`/api/plans/${created.body.id}/timeline`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return {
    id: created.body.id as number,
    codes: [...new Set(res.body.warnings.map((w: { code: string }) => w.code))].sort() as string[],
    body: fromWire(res.body) as ReturnType<typeof JSON.parse>,
  };
}

describe('arm warnings, each with the plan that triggers it and the one that clears it', () => {
  it('arm-out-of-reach: a worksite beyond the arm; cleared by a worksite inside its shell', async () => {
    // on a 12 m arm: WX (8, 6, 8) is √164 ≈ 12.81 m from the base, W3 (28, 0, 0) 12 m
    const bad = await day([task('Far', 'WX', 'EV1', onArm(K.a1))], undefined, shortId);
    expect(bad.codes).toEqual(['arm-out-of-reach']);
    const w = bad.body.warnings.find((x: { code: string }) => x.code === 'arm-out-of-reach');
    expect(w).toMatchObject({ taskIndex: 0, crew: 'EV1', arm: 'ARM-1' });
    expect(w.message).toContain('0.81 m beyond its 12 m reach');
    const good = await day([task('Far', K.w3, 'EV1', onArm(K.a1))], undefined, shortId);
    expect(good.codes).toEqual([]);
  });

  it('arm-path-keep-out: the straight tip path crosses a keep-out; cleared by going round it', async () => {
    const bad = await day([task('Off the truss', 'WX', 'EV1', onArm(K.a1))], undefined, blockedId);
    expect(bad.codes).toEqual(['arm-path-keep-out']);
    // worked by hand: W1 (12, 0, 0) → WX passes the sphere's centre (8, 3, 4) 1.86 m off, WX → A3 4.2 m off
    const good = await day(
      [task('Off the truss', 'WX', 'EV1', onArm(K.w1, { egress: K.a3 }))],
      undefined,
      blockedId,
    );
    expect(good.codes).toEqual([]);
  });

  it('arm-busy: two riders at once, the later waits; cleared when the second session comes later', async () => {
    const bad = await day([
      task('EV1 rides', 'WX', 'EV1', onArm(K.a1)),
      task('EV2 rides', 'WX', 'EV2', onArm(K.a1)),
    ]);
    expect(bad.codes).toEqual(['arm-busy']);
    const wait = bad.body.crew.EV2.blocks.find((b: { type: string }) => b.type === 'wait');
    expect(wait.label).toContain('Wait for ARM-1: EV1 rides it');
    const good = await day([
      task('EV1 rides', 'WX', 'EV1', onArm(K.a1)),
      task('EV2 works first', K.w3, 'EV2', { durationSeconds: 1800 }),
      task('EV2 rides', 'WX', 'EV2', onArm(K.a3)),
    ]);
    expect(good.codes).toEqual([]);
    expect(good.body.arms[0].sessions.map((s: { rider: string }) => s.rider)).toEqual(['EV1', 'EV2']);
  });

  it('arm-egress-not-attach: getting off at a worksite; cleared by getting off at an anchor', async () => {
    const bad = await day([task('Off the truss', 'WX', 'EV1', onArm(K.a1, { egress: K.w1 }))]);
    expect(bad.codes).toEqual(['arm-egress-not-attach']);
    const good = await day([task('Off the truss', 'WX', 'EV1', onArm(K.a1, { egress: K.a3 }))]);
    expect(good.codes).toEqual([]);
  });

  it('restraint-missing on the arm: none installed on its end; cleared by installing one first', async () => {
    const carried = { ...armRestraint, installedAt: undefined, carriedBy: 'EV1' };
    const bad = await day([task('Off the truss', 'WX', 'EV1', onArm(K.a1))], [carried]);
    expect(bad.codes).toEqual(['restraint-missing']);
    const good = await day(
      [
        task('Fit the arm restraint', K.w1, 'EV1', {
          actions: [{ do: 'install', item: 'afr', at: 'ARM-1' }],
        }),
        task('Off the truss', 'WX', 'EV1', onArm(K.a1)),
      ],
      [carried],
    );
    expect(good.codes).toEqual([]);
  });

  it('the timeline answers the arm lane, and the CSV and cue cards carry the arm steps', async () => {
    const { id, body } = await day([task('Off the truss', 'WX', 'EV1', onArm(K.a1))]);
    expect(body.arms).toHaveLength(1);
    expect(
      body.arms[0].blocks.map((b: { type: string; rider: string; to: string }) => [b.type, b.rider, b.to]),
    ).toEqual([
      ['arm-move', 'EV1', 'WX'],
      ['arm-move', 'EV1', K.a1],
    ]);
    const csv = await planner.get(`/api/plans/${id}/export.csv`);
    expect(csv.status).toBe(200);
    // A1 → WX is 10 m at 0.1 m/s plus 30 s settle: 130 s, 0:02 as h:mm
    expect(csv.text).toContain('ARM-1 carries EV1 to WX, 0:02');
    expect(csv.text).toContain('EV1 gets off ARM-1 at A1 and clips the tether there');
    const pdf = await getPdf(planner, `/api/plans/${id}/export.pdf`);
    expect(pdf.status).toBe(200);
    expect(pdfText(pdf.body as Buffer)).toContain('ARM-1 carries EV1 to WX, 0:02');
  });
});

describe('bad arm tasks are 400s with the path', () => {
  it('an arm the station does not have', async () => {
    const res = await planner
      .post('/api/plans')
      .send(planBody([task('Off', K.w1, 'EV1', onArm(K.a1))], [], bareId));
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { path: 'body.tasks[0].arm.key', message: 'the station "Line station" has no arm "ARM-1"' },
    ]);
  });

  it('an ingress or egress that is not a node', async () => {
    const res = await planner
      .post('/api/plans')
      .send(planBody([task('Off', 'WX', 'EV1', onArm('NOWHERE', { egress: 'ELSEWHERE' }))]));
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toEqual([
      'body.tasks[0].arm.ingress',
      'body.tasks[0].arm.egress',
    ]);
  });

  it('a rider who is not on the task, and a rider who also names a socket', async () => {
    const res = await planner
      .post('/api/plans')
      .send(
        planBody([
          task('Off', 'WX', 'EV1', { ...onArm(K.a1, { rider: 'EV2' }) }),
          task('S', K.w2, 'EV1', { socket: K.s2, ...onArm(K.a1) }),
        ]),
      );
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toEqual([
      'body.tasks[0].arm.rider',
      'body.tasks[1].socket',
    ]);
  });
});

describe('a large item handed between the arm rider and the partner, through the API', () => {
  it('EV1, brought by the arm, hands the pump to EV2 who came by handrail; the walkthrough plays it', async () => {
    const pump = { key: 'pump', name: 'Pump module', kind: 'large-item', carriedBy: 'EV1' };
    const { id, codes, body } = await day(
      [
        task('Hand the pump over', K.w1, 'both', {
          ...onArm(K.a1, { rider: 'EV1' }),
          actions: [{ do: 'hand-over', item: 'pump', by: 'EV1' }],
        }),
      ],
      [armRestraint, pump],
    );
    expect(codes).toEqual([]);
    const track = body.equipment.find((e: { item: string }) => e.item === 'pump');
    expect(track.states.map((s: { where: unknown }) => s.where)).toEqual([
      { kind: 'carried', crew: 'EV1' },
      { kind: 'carried', crew: 'EV2' },
      { kind: 'airlock' },
    ]);
    const riderHands = track.states[0].end;
    const work = body.crew.EV1.blocks.find((b: { type: string }) => b.type === 'work');
    // the hand-over takes effect when the task's work ends, the rider still on the arm
    expect(riderHands).toBe(work.end);
    expect(body.arms[0].sessions.map((s: { rider: string }) => s.rider)).toEqual(['EV1']);
    const trainer = await t.agent('trainer');
    const walk = await trainer.post('/api/walkthroughs').send({ name: 'Hand-over', stationId, planId: id });
    expect(walk.status, JSON.stringify(walk.body)).toBe(201);
    expect(walk.body.playback.arms.map((a: { key: string }) => a.key)).toEqual(['ARM-1']);
    const steps = walk.body.playback.crews.EV1.steps.map((s: { type: string }) => s.type);
    expect(steps).toContain('arm-ride');
  });
});
