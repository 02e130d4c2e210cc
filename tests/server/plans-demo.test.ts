import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoPlans } from '../../server/db/seed/demo-plans';
import { makeTestApp, type TestApp } from '../setup/test-app';
import { fromWire } from '@shared/compute/day/wire';

/** A timeline answer as the client reads it (the wire format decoded), as loosely typed as a body. */
const bodyOf = (res: { body: unknown }): ReturnType<typeof JSON.parse> => fromWire(res.body as never);

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp({ seedDemo: true });
});
afterAll(() => t.close());

interface Warning {
  code: string;
  message: string;
}

describe('demo plans on Kestrel Station', () => {
  it('seeds the draft pump swap and the approved camera boom install, once', async () => {
    const viewer = await t.agent('viewer');
    const list = (await viewer.get('/api/plans')).body;
    const byTitle = Object.fromEntries(list.map((p: { title: string }) => [p.title, p]));
    expect(byTitle['Coolant pump module swap']).toMatchObject({
      status: 'draft',
      authorName: 'Priya Lindqvist',
      stationName: 'Kestrel Station',
    });
    expect(byTitle['External camera boom install']).toMatchObject({
      status: 'approved',
      authorName: 'Priya Lindqvist',
    });
    const camera = (await viewer.get(`/api/plans/${byTitle['External camera boom install'].id}`)).body;
    expect(camera.approverName).toBe('Tomas Reyes');
    expect(camera.reviewComments.map((c: { action: string }) => c.action)).toEqual(['submit', 'approve']);
    seedDemoPlans(t.ctx);
    expect((await viewer.get('/api/plans')).body).toHaveLength(list.length);
  });

  it.each(['Coolant pump module swap', 'External camera boom install'])(
    '"%s": a day the crew could fly: no warnings, every restraint installed before use and in reach, the connector task in orbital night',
    async (title) => {
      const viewer = await t.agent('viewer');
      const plan = (await viewer.get('/api/plans')).body.find((p: { title: string }) => p.title === title);
      const timeline = bodyOf(await viewer.get(`/api/plans/${plan.id}/timeline`));
      const full = (await viewer.get(`/api/plans/${plan.id}`)).body;
      expect(full.tasks.filter((x: { eclipseOnly: boolean }) => x.eclipseOnly)).toHaveLength(1);
      expect(timeline.warnings as Warning[], JSON.stringify(timeline.warnings)).toEqual([]);
      expect(timeline.fitsTimeLimit).toBe(true);
      expect(timeline.reach.length).toBeGreaterThan(0);
      for (const r of timeline.reach) expect(r.reach.reachable, JSON.stringify(r)).toBe(true);
      // the hardware moves: a foot restraint installed, a large item handed over, a portable anchor used
      const kinds = (kind: string) =>
        full.manifest.filter((m: { kind: string }) => m.kind === kind).map((m: { key: string }) => m.key);
      const actions = full.tasks.flatMap((x: { actions: { do: string; item: string }[] }) => x.actions);
      expect(actions).toContainEqual(
        expect.objectContaining({ do: 'install', item: kinds('foot-restraint')[0] }),
      );
      expect(actions).toContainEqual(expect.objectContaining({ do: 'hand-over', item: expect.any(String) }));
      const handed = actions.find((a: { do: string }) => a.do === 'hand-over').item;
      expect(kinds('large-item')).toContain(handed);
      expect(actions).toContainEqual(
        expect.objectContaining({ do: 'install', item: kinds('tether-anchor')[0] }),
      );
      // nobody shares a restraint: each both-task names at most one socket per member, never the same
      for (const task of full.tasks) {
        if (task.sockets) expect(task.sockets.EV1).not.toBe(task.sockets.EV2);
      }
    },
  );

  it('the approved plan sets up its portable anchor early and a later route of EV2 swaps at it', async () => {
    const viewer = await t.agent('viewer');
    const plan = (await viewer.get('/api/plans')).body.find(
      (p: { title: string }) => p.title === 'External camera boom install',
    );
    const timeline = bodyOf(await viewer.get(`/api/plans/${plan.id}/timeline`));
    const anchor = timeline.equipment.find((e: { kind: string }) => e.kind === 'tether-anchor');
    const installed = anchor.states.find((s: { where: { kind: string } }) => s.where.kind === 'installed');
    const swaps = timeline.crew.EV2.blocks.filter(
      (b: { type: string; swapNode: string; start: number }) =>
        b.type === 'swap' && b.swapNode === installed.where.node,
    );
    expect(swaps.length).toBeGreaterThan(0);
    for (const b of swaps) expect(b.start).toBeGreaterThanOrEqual(installed.start);
  });
});

describe('the pump swap uses the arm as a team would', () => {
  it('a restraint fitted on its end, a ride to a worksite no socket reaches, the spare pump handed from the rider', async () => {
    const viewer = await t.agent('viewer');
    const plan = (await viewer.get('/api/plans')).body.find(
      (p: { title: string }) => p.title === 'Coolant pump module swap',
    );
    const full = (await viewer.get(`/api/plans/${plan.id}`)).body;
    const timeline = bodyOf(await viewer.get(`/api/plans/${plan.id}/timeline`));
    const graph = (await viewer.get(`/api/stations/${full.stationId}/graph`)).body;
    const actions = full.tasks.flatMap(
      (x: { actions: { do: string; item: string; at?: string }[] }) => x.actions,
    );
    expect(actions).toContainEqual(expect.objectContaining({ do: 'install', at: 'ARM-1' }));
    const armTasks = full.tasks.filter((x: { arm?: unknown }) => x.arm);
    expect(armTasks.length).toBeGreaterThanOrEqual(2);
    // some arm worksite is out of reach of every socket of the station (the reach settings' sphere)
    const { standOffM, radiusM } = graph.station.settings.reach;
    const pos = new Map(graph.nodes.map((n: { key: string; position: number[] }) => [n.key, n.position]));
    const sockets = graph.nodes.filter((n: { kind: string }) => n.kind === 'socket');
    const reachable = (site: number[]) =>
      sockets.some((s: { position: number[]; normal: number[] }) => {
        const c = s.position.map((p, k) => p + s.normal[k] * standOffM);
        return Math.hypot(...c.map((v, k) => v - site[k])) <= radiusM;
      });
    expect(armTasks.some((x: { worksite: string }) => !reachable(pos.get(x.worksite) as number[]))).toBe(
      true,
    );
    const handOver = armTasks.find((x: { crew: string }) => x.crew === 'both');
    expect(handOver.actions).toContainEqual(
      expect.objectContaining({ do: 'hand-over', by: handOver.arm.rider }),
    );
    expect(timeline.arms).toHaveLength(1);
    expect(timeline.arms[0].sessions).toHaveLength(1);
    expect(timeline.arms[0].blocks.filter((b: { rider?: string }) => b.rider).length).toBeGreaterThanOrEqual(
      3,
    );
  });
});
