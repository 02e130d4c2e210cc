import { describe, expect, it } from 'vitest';
import { fromWire, type WireTimeline } from '@shared/compute/day/wire';
import type { PlanTimeline } from '@shared/schemas/plan-views';
import type { WalkthroughDetail, WalkthroughSummary } from '@shared/schemas/walkthrough';
import { openBrowserPerTest, signInAs, type BrowserSession, DEMO_PASSWORD } from './browser';

const DEMO_PLAN = 'External camera boom install';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

async function apiAs(role: string) {
  const { request } = session.page;
  await request.post('/api/auth/sign-out');
  const res = await request.post('/api/auth/sign-in', {
    data: { email: `${role}@example.org`, password: DEMO_PASSWORD },
  });
  expect(res.status()).toBe(200);
  return request;
}

async function signOut() {
  await session.goto('/');
  await session.page.getByRole('button', { name: 'Sign out' }).click();
  await session.page.waitForURL('**/sign-in');
}

describe('station notes where the work is', () => {
  it('an engineer pins a note on a node; the planner sees it on the plan that passes there, the trainer in the walkthrough', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    // a node in the middle of EV1's way out to the first task of the demo plan
    let api = await apiAs('planner');
    const plans = (await (await api.get('/api/plans')).json()) as {
      id: number;
      title: string;
      stationId: number;
    }[];
    const plan = plans.find((p) => p.title === DEMO_PLAN)!;
    const day = fromWire(
      (await (await api.get(`/api/plans/${plan.id}/timeline`)).json()) as WireTimeline<PlanTimeline>,
    );
    const out = day.crew.EV1.blocks.find((b) => b.type === 'translate' && b.taskIndex !== undefined)!;
    const route = day.routes[out.routeIndex!];
    const node = route.nodes[Math.floor(((out.legStart ?? 0) + (out.legEnd ?? route.nodes.length - 1)) / 2)];
    const title = `Loose handrail clamp ${Date.now()}`;
    await api.post('/api/auth/sign-out');

    // the engineer pins it on the model
    await signInAs(session, 'engineer');
    await session.goto(`/stations/${plan.stationId}`);
    await page.getByTestId('station-scene').waitFor();
    await page.getByLabel('Find a node').fill(node);
    await page
      .getByRole('option', { name: new RegExp(`^${node}\\b`) })
      .first()
      .click();
    await page.getByRole('tab', { name: 'Annotations' }).click();
    await page.getByRole('button', { name: 'New note' }).click();
    const form = page.getByRole('form', { name: 'New note' });
    await expect(form.getByLabel(new RegExp(`the selected node ${node}`)).isChecked()).resolves.toBe(true);
    await form.getByLabel('Title').fill(title);
    await form.getByLabel('Note').fill('Clamp turns by hand; keep the tether clear of it.');
    await form.getByRole('button', { name: 'Pin note' }).click();
    await page.getByRole('article', { name: title }).waitFor();
    await signOut();

    // the planner sees it on the plan: in the short list and on the block of the chart
    await signInAs(session, 'planner');
    await session.goto(`/plans/${plan.id}`);
    const list = page.getByRole('list', { name: 'Station notes on this day' });
    const item = list.getByRole('listitem').filter({ hasText: title });
    await item.waitFor();
    await item.getByText('Clamp turns by hand').waitFor();
    await item.getByRole('link', { name: node }).waitFor();
    const onBlock = page.locator(`[data-station-notes][aria-label*="${title}"]`);
    await expect(onBlock.count()).resolves.toBeGreaterThan(0);
    await expect(onBlock.first().getAttribute('aria-label')).resolves.toMatch(/^EV1 Translate/);
    await item
      .getByRole('button', { name: /EV1 passes \(task \d+\)/ })
      .first()
      .click();
    await item.scrollIntoViewIfNeeded();
    await session.screenshot('station-notes-plan');
    await onBlock.first().focus();
    await page.getByText(`Station note at ${node}: ${title}`).waitFor();
    await page.locator('svg[aria-label^="Timeline"]').scrollIntoViewIfNeeded();
    await session.screenshot('station-notes-plan-block');
    await signOut();

    // the trainer sees it in the walkthrough of the plan, on the step at that node
    await signInAs(session, 'trainer');
    api = page.request;
    const walks = (await (await api.get('/api/walkthroughs')).json()) as WalkthroughSummary[];
    let walkId = walks.find((w) => w.plan?.id === plan.id)?.id;
    if (walkId === undefined) {
      const made = await api.post('/api/walkthroughs', {
        data: { name: 'Camera boom notes', stationId: plan.stationId, planId: plan.id },
      });
      expect(made.status()).toBe(201);
      walkId = ((await made.json()) as WalkthroughDetail).walkthrough.id;
    }
    await session.goto(`/walkthroughs/${walkId}`);
    await page
      .getByRole('region', { name: /3D playback of/ })
      .locator('canvas')
      .waitFor();
    await page.getByRole('tab', { name: /^Station notes \(\d+\)$/ }).click();
    const walkNotes = page.getByRole('list', { name: 'Station notes on this walkthrough' });
    const walkItem = walkNotes.getByRole('listitem').filter({ hasText: title }).first();
    await walkItem.waitFor();
    await walkItem
      .getByRole('button', { name: /^Step \d+/ })
      .first()
      .click();
    const callout = page.getByTestId('step-callout');
    await expect.poll(() => callout.textContent()).toContain(`Station note at ${node}:`);
    await expect(callout.textContent()).resolves.toContain(title);
    const current = page.locator('[aria-current="step"]').filter({ hasText: title });
    await expect(current.count()).resolves.toBeGreaterThan(0);
    await session.screenshot('station-notes-walkthrough');

    // leave the demo as it was: the note resolved
    const notes = (await (await api.get(`/api/stations/${plan.stationId}/annotations`)).json()) as {
      id: number;
      title: string;
    }[];
    const pinned = notes.find((n) => n.title === title)!;
    expect(
      (await api.patch(`/api/annotations/${pinned.id}`, { data: { status: 'resolved' } })).status(),
    ).toBe(200);
  });
});
