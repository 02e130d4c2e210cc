import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { PlanTimeline } from '@shared/schemas/plan-views';
import type { StationSummary } from '@shared/schemas/station-edits';
import { openBrowserPerTest, sceneSettled, signInAs, stepUntil, type BrowserSession } from './browser';

/** The demo draft that uses the arm: a restraint on its end, a ride to a survey point, a hand-off. */
const ARM_PLAN = 'Coolant pump module swap';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

const armTip = (page: Page) => page.getByTestId('day-arm-ARM-1').getAttribute('data-tip');
const armRider = (page: Page) => page.getByTestId('day-arm-ARM-1').getAttribute('data-rider');

describe('the robotic arm', () => {
  it('planner adds an arm task and sees the arm lane, and the boom moving with its rider in playback', async () => {
    const { page } = session;
    await signInAs(session, 'planner');
    const plans = (await (await page.request.get('/api/plans')).json()) as { id: number; title: string }[];
    const demo = plans.find((p) => p.title === ARM_PLAN)!;
    expect(demo, 'the demo arm plan is seeded').toBeDefined();
    // a copy of it, so the seeded plan stays as other tests expect it
    const copy = await page.request.post(`/api/plans/${demo.id}/duplicate`, { data: {} });
    expect(copy.status()).toBe(201);
    const planId = ((await copy.json()) as { id: number }).id;

    await page.setViewportSize({ width: 1440, height: 900 });
    await session.goto(`/plans/${planId}`);
    await page.getByRole('button', { name: 'Add task' }).click();
    const dialog = page.getByRole('dialog', { name: 'Add task' });
    await dialog.getByLabel('Task title').fill('Second look at the mast from the arm');
    await dialog.getByLabel('Find a worksite').fill('SB1-W02');
    await dialog.getByLabel('Worksite', { exact: true }).selectOption('SB1-W02');
    await dialog.getByLabel('Crew').selectOption('EV1');
    await dialog.getByLabel('Duration').fill('10');
    await dialog.getByLabel('Done from an arm').selectOption('ARM-1');
    await dialog.getByLabel('Gets on at').fill('CB-A05');
    await dialog.getByRole('button', { name: 'Add task' }).click();
    await dialog.waitFor({ state: 'hidden' });
    await page.locator('[data-save-state="saved"]').waitFor({ timeout: 15_000 });

    const saved = (await (await page.request.get(`/api/plans/${planId}`)).json()) as {
      version: number;
      tasks: { title: string; arm?: unknown }[];
    };
    expect(saved.tasks.at(-1)).toMatchObject({ arm: { key: 'ARM-1', ingress: 'CB-A05' } });
    const timeline = (await (await page.request.get(`/api/plans/${planId}/timeline`)).json()) as PlanTimeline;
    const riders = timeline.arms[0].sessions.map((s) => s.rider);
    expect(riders).toContain('EV1');
    expect(riders).toContain('EV2');

    // the arm lane under the crew lanes: a move per block, EV1's ride among them
    const lane = page.locator('[data-arm-lane="ARM-1"]');
    const moves = timeline.arms[0].blocks.length;
    // opened afresh, the chart shows the saved version's day
    await session.goto(`/plans/${planId}`);
    await lane
      .locator('[data-arm-block]')
      .nth(moves - 1)
      .waitFor({ timeout: 60_000 });
    expect(await lane.locator('[data-arm-block]').count()).toBe(moves);
    await lane.scrollIntoViewIfNeeded();
    await session.screenshot('arm-lane-1440');

    // scrubbing: the boom's tip moves, with EV1 on it, and ends where EV1 got off
    const day = page.getByTestId('plan-day');
    await day.locator('canvas').waitFor();
    const atStart = await armTip(page);
    await stepUntil(page, async () => (await armRider(page)) === 'EV1', 160);
    const boarded = await armTip(page);
    await stepUntil(page, async () => (await armTip(page)) !== boarded);
    expect(await armRider(page)).toBe('EV1');
    await expect(page.getByTestId('day-crew-EV1').getAttribute('data-anchor')).resolves.toBe('ARM-1');
    const moved = await armTip(page);
    expect(moved).not.toBe(atStart);
    await day.scrollIntoViewIfNeeded();
    await sceneSettled(page);
    await session.screenshot('arm-playback-ev1-riding');
  });

  it('engineer adds an arm in the edit mode, shows its reach shell, and removes it', async () => {
    const { page } = session;
    await signInAs(session, 'engineer');
    const stations = (await (await page.request.get('/api/stations')).json()) as StationSummary[];
    const station = stations.find((s) => s.name === 'Kestrel Station')!;
    await page.setViewportSize({ width: 1440, height: 900 });
    await session.goto(`/stations/${station.id}`);
    await page.getByTestId('station-scene').waitFor();
    await page.getByRole('tab', { name: 'Edit' }).click();
    await page.locator('summary', { hasText: /^Arms \(/ }).click();
    const form = page.getByRole('form', { name: 'Add arm' });
    await form.getByLabel('Arm key').fill('ARM-2');
    await form.getByLabel('Base node').fill('NO-SUCH-NODE');
    await form.getByRole('button', { name: 'Add arm' }).click();
    await form.getByText('unknown node key "NO-SUCH-NODE"').waitFor();
    await form.getByLabel('Base node').fill('CB-A05');
    await form.getByLabel('Reach (m)', { exact: true }).fill('8');
    await form.getByRole('button', { name: 'Add arm' }).click();
    await page.getByText(/Saved: add arm ARM-2/).waitFor();
    const graph = (await (await page.request.get(`/api/stations/${station.id}/graph`)).json()) as {
      arms: { key: string; baseNode: string; reachM: number }[];
    };
    expect(graph.arms.find((a) => a.key === 'ARM-2')).toMatchObject({ baseNode: 'CB-A05', reachM: 8 });

    await page.getByRole('button', { name: /^Layers/ }).click();
    await page.getByRole('button', { name: 'Arm reach' }).click();
    await expect(page.getByRole('button', { name: 'Arm reach' }).getAttribute('aria-pressed')).resolves.toBe(
      'true',
    );
    await page.keyboard.press('Escape');
    await sceneSettled(page);
    await session.screenshot('arm-edit-reach-shell');

    await page.getByRole('button', { name: 'Remove arm ARM-2' }).click();
    await page.getByText(/Saved: remove arm ARM-2/).waitFor();
    const after = (await (await page.request.get(`/api/stations/${station.id}/graph`)).json()) as {
      arms: { key: string }[];
    };
    expect(after.arms.map((a) => a.key)).toEqual(['ARM-1']);
  });
});
