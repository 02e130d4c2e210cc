import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoPlans } from '../../server/db/seed/demo-plans';
import { makeTestApp, type TestApp } from '../setup/test-app';

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
    '"%s": both crew reach every worksite, every restraint reaches its task, the connector task is in orbital night, the day fits the limit',
    async (title) => {
      const viewer = await t.agent('viewer');
      const plan = (await viewer.get('/api/plans')).body.find((p: { title: string }) => p.title === title);
      const timeline = (await viewer.get(`/api/plans/${plan.id}/timeline`)).body;
      const full = (await viewer.get(`/api/plans/${plan.id}`)).body;
      expect(full.tasks.filter((x: { eclipseOnly: boolean }) => x.eclipseOnly)).toHaveLength(1);
      const codes = (timeline.warnings as Warning[]).map((w) => w.code);
      expect(codes, JSON.stringify(timeline.warnings)).not.toContain('route-infeasible');
      expect(codes, JSON.stringify(timeline.warnings)).not.toContain('eclipse-only-outside-night');
      expect(timeline.fitsTimeLimit).toBe(true);
      expect(timeline.inventoryWarnings, JSON.stringify(timeline.inventoryWarnings)).toEqual([]);
      // every task's foot restraint reaches its worksite with the station's default reach settings
      expect(timeline.reachWarnings, JSON.stringify(timeline.reachWarnings)).toEqual([]);
      expect(timeline.reach.length).toBeGreaterThan(0);
      for (const r of timeline.reach) expect(r.reach.reachable, JSON.stringify(r)).toBe(true);
    },
  );
});
