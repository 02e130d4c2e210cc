import { describe, expect, it } from 'vitest';
import type { APIRequestContext } from 'playwright-core';
import type { StationSummary } from '@shared/schemas/station-edits';
import type { StationGraph } from '@shared/schemas/station-edits';
import { buildPlanInput } from '../factories/plan';
import { type BrowserSession, openBrowserPerTest, signInAs } from './browser';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

async function kestrel(api: APIRequestContext): Promise<StationSummary> {
  const stations = (await (await api.get('/api/stations')).json()) as StationSummary[];
  const found = stations.find((s) => s.name === 'Kestrel Station');
  if (!found) throw new Error('the demo station is not seeded');
  return found;
}

const taskIds = async (api: APIRequestContext, id: number) =>
  ((await (await api.get(`/api/plans/${id}`)).json()) as { tasks: { id: number }[] }).tasks.map((t) => t.id);

/** Polls the saved plan until its task order is `want` (the editor saves a moment after a change). */
async function savedOrder(api: APIRequestContext, id: number, want: number[]) {
  for (let k = 0; k < 100; k++) {
    if (JSON.stringify(await taskIds(api, id)) === JSON.stringify(want)) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  expect(await taskIds(api, id)).toEqual(want);
}

describe('Suggest an order: the planner asks, compares and applies, and can undo', () => {
  it('a plan where EV2 waits an hour for a short job gets the short job first', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(session, 'planner');
    const station = await kestrel(page.request);
    const graph = (await (
      await page.request.get(`/api/stations/${station.id}/graph`)
    ).json()) as StationGraph;
    const sites = graph.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);
    const task = (title: string, worksite: string, crew: 'EV1' | 'EV2', durationSeconds: number) => ({
      title,
      worksite,
      crew,
      durationSeconds,
      eclipseOnly: false,
      carrying: false,
      tools: [],
      actions: [],
    });
    const created = await page.request.post('/api/plans', {
      data: buildPlanInput(station.id, {
        title: `Order check ${Date.now().toString(36)}`,
        tasks: [
          task('Long survey', sites[0], 'EV1', 3600),
          task('Open the cover', sites[1], 'EV1', 300),
          task('Swap the unit', sites[2], 'EV2', 3600),
        ],
      }),
    });
    expect(created.status()).toBe(201);
    const plan = (await created.json()) as { id: number; version: number; tasks: { id: number }[] };
    const [survey, cover, unit] = plan.tasks;
    // the unit swap can start only once the cover is open
    const linked = await page.request.patch(`/api/plans/${plan.id}`, {
      data: { version: plan.version, tasks: [survey, cover, { ...unit, after: [cover.id] }] },
    });
    expect(linked.status()).toBe(200);
    const before = [survey.id, cover.id, unit.id];

    await session.goto(`/plans/${plan.id}`);
    await page.locator('[data-save-state="saved"]').waitFor();
    await page.getByRole('button', { name: 'Suggest an order' }).click();
    const suggestion = page.getByRole('region', { name: 'Suggested order' });
    await suggestion.waitFor();
    await expect(suggestion.getByLabel('Planning caution').isVisible()).resolves.toBe(true);
    const table = suggestion.getByRole('table', { name: 'Current order beside the suggestion' });
    const row = (label: string) =>
      table.getByRole('row', { name: new RegExp(`^${label}`) }).getByRole('cell');
    const ends = await row('Day ends').allTextContents();
    expect(ends).toHaveLength(3);
    const [, current, suggested] = ends;
    const minutes = (hm: string) => Number(hm.split(':')[0]) * 60 + Number(hm.split(':')[1]);
    // worked by hand: the cover first spares EV2 most of the hour it waited
    expect(minutes(current) - minutes(suggested)).toBeGreaterThan(45);
    const waits = await row('Waiting').allTextContents();
    expect(minutes(waits[2])).toBeLessThan(minutes(waits[1]));
    await expect(suggestion.getByText('Proved earliest').isVisible()).resolves.toBe(true);
    await suggestion.scrollIntoViewIfNeeded();
    await session.screenshot('plan-suggest-order');

    await suggestion.getByRole('button', { name: 'Apply this order' }).click();
    await page.locator('[data-save-state="saved"]').waitFor();
    const ids = await taskIds(page.request, plan.id);
    expect(ids.indexOf(cover.id)).toBeLessThan(ids.indexOf(survey.id));
    expect(ids.indexOf(cover.id)).toBeLessThan(ids.indexOf(unit.id));
    await savedOrder(page.request, plan.id, ids);
    await session.screenshot('plan-suggest-order-applied');

    await suggestion.getByRole('button', { name: 'Undo the new order' }).click();
    await savedOrder(page.request, plan.id, before);
    await page.locator('[data-save-state="saved"]').waitFor();
  });
});
