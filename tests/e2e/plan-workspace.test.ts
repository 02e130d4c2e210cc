import { describe, expect, it } from 'vitest';
import { orbitSummary, phaseOfOrbitStart } from '@shared/compute/orbit';
import type { Locator } from 'playwright-core';
import { openBrowserPerTest, signInAs, type BrowserSession } from './browser';

let session: BrowserSession;
openBrowserPerTest((s) => (session = s));

interface StationRow {
  id: number;
  name: string;
  orbit: { altitudeKm: number; betaDeg: number };
}

async function kestrel(): Promise<StationRow> {
  const stations = (await (await session.page.request.get('/api/stations')).json()) as StationRow[];
  const station = stations.find((s) => s.name === 'Kestrel Station');
  expect(station, 'the demo station is seeded').toBeDefined();
  return station!;
}

async function planOf(id: number) {
  return (await (await session.page.request.get(`/api/plans/${id}`)).json()) as {
    version: number;
    title: string;
    orbitPhaseAtStartDeg: number;
  };
}

const saved = () => session.page.locator('[data-save-state="saved"]').waitFor({ timeout: 15_000 });

describe('plan workspace: the planner’s screen in the built app', () => {
  it('the start is given and shown as minutes from orbital sunrise or sunset, stored as the phase', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(session, 'planner');
    const station = await kestrel();
    const arcs = orbitSummary(station.orbit);

    await session.goto('/plans');
    await page.getByRole('button', { name: 'New plan' }).click();
    const create = page.getByRole('dialog', { name: 'New plan' });
    await create.getByLabel('Title').fill(`Start by the clock ${Date.now().toString(36)}`);
    await create.getByLabel('Station').selectOption(String(station.id));
    await create.getByLabel('EV1 name').fill('Ada Okonkwo');
    await create.getByLabel('EV2 name').fill('Lars Vinter');
    await create.getByLabel('Start: minutes').fill('12');
    await create.getByLabel('Start: after or before').selectOption('after');
    await create.getByLabel('Start: orbit event').selectOption('sunrise');
    const phase12 = phaseOfOrbitStart({ event: 'sunrise', offsetSeconds: 720 }, arcs);
    await create
      .getByText(new RegExp(`in daylight, sunset [\\d.]+ min later · phase ${phase12.toFixed(1)}°`))
      .waitFor();
    await session.screenshot('plan-start-create-form');
    await create.getByRole('button', { name: 'Create plan' }).click();
    await page.waitForURL(/\/plans\/\d+$/);
    const planId = Number(new URL(page.url()).pathname.split('/').pop());

    const header = page.locator('main header').first();
    await header.getByText('starts 12 min after orbital sunrise').waitFor();
    const created = await planOf(planId);
    expect(created.orbitPhaseAtStartDeg).toBeCloseTo(phase12, 9);

    // the planner moves the start to just before sunset, in the plan's own settings
    const settings = page.getByRole('group', { name: 'Start in the orbit' });
    await settings.getByLabel('Start: minutes').fill('5');
    await settings.getByLabel('Start: after or before').selectOption('before');
    await settings.getByLabel('Start: orbit event').selectOption('sunset');
    await header.getByText('starts 5 min before orbital sunset').waitFor();
    await saved();
    expect((await planOf(planId)).orbitPhaseAtStartDeg).toBeCloseTo(
      phaseOfOrbitStart({ event: 'sunset', offsetSeconds: -300 }, arcs),
      9,
    );
    await settings.scrollIntoViewIfNeeded();
    await session.screenshot('plan-start-settings');

    // read back after a reload: the same words, the planner's controls as they left them
    await page.reload();
    await header.getByText('starts 5 min before orbital sunset').waitFor();
    const again = page.getByRole('group', { name: 'Start in the orbit' });
    expect(await again.getByLabel('Start: minutes').inputValue()).toBe('5');
    expect(await again.getByLabel('Start: after or before').inputValue()).toBe('before');
    expect(await again.getByLabel('Start: orbit event').inputValue()).toBe('sunset');
  });
});

async function newPlan(title: string, more: Record<string, unknown> = {}): Promise<number> {
  const station = await kestrel();
  const response = await session.page.request.post('/api/plans', {
    data: {
      title,
      stationId: station.id,
      date: '2026-12-20',
      crew: {
        EV1: { name: 'Ada Okonkwo', tetherLengthM: 25.9 },
        EV2: { name: 'Lars Vinter', tetherLengthM: 25.9 },
      },
      ...more,
    },
  });
  expect(response.status()).toBe(201);
  return ((await response.json()) as { id: number }).id;
}

describe('plan workspace: autosave counts a person’s saves and never drops an edit', () => {
  it('typing in several fields makes one version; leaving or reloading right after typing keeps the edit', async () => {
    const { page } = session;
    await signInAs(session, 'planner');
    const first = `Autosave burst ${Date.now().toString(36)}`;
    const planId = await newPlan(first);
    await session.goto(`/plans/${planId}`);
    const header = page.locator('main header').first();
    await header.getByText('All changes saved').waitFor();
    const before = (await planOf(planId)).version;

    // a burst of work: the title and both crew names typed at a person's pace
    const title = page.getByLabel('Title', { exact: true });
    await title.click();
    await title.press('End');
    await title.pressSequentially(' (rev)', { delay: 90 });
    await page.getByLabel('EV1 name').fill('');
    await page.getByLabel('EV1 name').pressSequentially('Ada O.', { delay: 90 });
    await page.getByLabel('EV2 name').fill('');
    await page.getByLabel('EV2 name').pressSequentially('Lars V.', { delay: 90 });
    await header.getByText('Unsaved changes').waitFor();
    await saved();
    const afterBurst = await planOf(planId);
    expect(afterBurst.title).toBe(`${first} (rev)`);
    expect(afterBurst.version, 'one burst of typing, one version').toBe(before + 1);

    // leaving for another screen right after typing saves first, and asks nothing
    await title.press('End');
    await title.pressSequentially(' left', { delay: 30 });
    await page.getByRole('link', { name: 'Plans', exact: true }).click();
    await page.getByRole('heading', { level: 1, name: 'Plans' }).waitFor();
    expect(await page.getByRole('dialog', { name: 'Leave without saving?' }).count()).toBe(0);
    expect((await planOf(planId)).title).toBe(`${first} (rev) left`);

    // reloading right after typing: the save goes out as the page goes
    await session.goto(`/plans/${planId}`);
    await header.getByText('All changes saved').waitFor();
    await page.getByLabel('Title', { exact: true }).press('End');
    await page.getByLabel('Title', { exact: true }).pressSequentially(' reloaded', { delay: 30 });
    await page.reload();
    await expect
      .poll(() => page.getByLabel('Title', { exact: true }).inputValue(), { timeout: 15_000 })
      .toBe(`${first} (rev) left reloaded`);
    expect((await planOf(planId)).version, 'three saves a person made').toBe(before + 3);
  });
});

/** Presses Tab (Shift+Tab with `back`) until `target` has the focus: the keyboard's way to a control. */
async function tabTo(target: Locator, { back = false, max = 120 } = {}) {
  const { page } = session;
  for (let k = 0; k < max; k++) {
    if (await target.evaluate((el) => el === document.activeElement).catch(() => false)) return k;
    await page.keyboard.press(back ? 'Shift+Tab' : 'Tab');
  }
  throw new Error(`${String(target)} not reached in ${max} Tab presses`);
}

describe('plan workspace: a planner’s core job without a mouse', () => {
  it('opens a plan, adds a task with a tool from the manifest and a new one, edits it (asked before dropping an edit), submits', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(session, 'planner');
    const title = `Keyboard day ${Date.now().toString(36)}`;
    const station = await kestrel();
    const graph = (await (await page.request.get(`/api/stations/${station.id}/graph`)).json()) as {
      nodes: { key: string; kind: string }[];
    };
    const worksite = graph.nodes.find((n) => n.kind === 'worksite')!.key;
    const planId = await newPlan(title, {
      manifest: [{ key: 'tool-bag', name: 'Tool bag', kind: 'bag', carriedBy: 'EV1' }],
    });

    // open the plan from the list
    await session.goto('/plans');
    const link = page.getByRole('link', { name: title });
    await tabTo(link);
    await page.keyboard.press('Enter');
    await page.waitForURL(`**/plans/${planId}`);
    await saved();

    // add a task: the dialog opens in its first field
    const tabs = await tabTo(page.getByRole('button', { name: 'Add task' }));
    await page.keyboard.press('Enter');
    const dialog = page.getByRole('dialog', { name: 'Add task' });
    await dialog.waitFor();
    await page.keyboard.type('Swap the pump module');
    await tabTo(dialog.getByLabel('Find a worksite'));
    await page.keyboard.type(worksite);
    await tabTo(dialog.getByLabel('Worksite', { exact: true }));
    await page.keyboard.press('ArrowDown');
    expect(await dialog.getByLabel('Worksite', { exact: true }).inputValue()).toBe(worksite);
    await tabTo(dialog.getByLabel('Duration'));
    await page.keyboard.press('ControlOrMeta+a');
    await page.keyboard.type('0:40');
    // the tools: one from the manifest, one added inline to it
    await tabTo(
      dialog.getByRole('group', { name: 'Manifest items' }).getByRole('button', { name: 'Tool bag' }),
    );
    await page.keyboard.press('Space');
    await tabTo(dialog.getByLabel('New tool for the manifest'));
    await page.keyboard.type('Power driver');
    await page.keyboard.press('Enter');
    await dialog
      .getByRole('group', { name: 'Manifest items' })
      .getByRole('button', { name: 'Power driver' })
      .waitFor();
    await session.screenshot('plan-keyboard-task-form');
    await tabTo(dialog.getByRole('button', { name: 'Add task' }));
    await page.keyboard.press('Enter');
    await dialog.waitFor({ state: 'hidden' });
    await page.getByRole('listitem', { name: /Task 1 of 1: Swap the pump module/ }).waitFor();

    // edit it; Escape with an edit not applied asks first, and keeping on editing keeps the edit
    await tabTo(page.getByRole('button', { name: 'Edit task 1' }), { back: true });
    await page.keyboard.press('Enter');
    const edit = page.getByRole('dialog', { name: 'Edit task 1' });
    await edit.waitFor();
    await tabTo(edit.getByLabel('Duration'));
    await page.keyboard.press('ControlOrMeta+a');
    await page.keyboard.type('0:50');
    await page.keyboard.press('Escape');
    const drop = page.getByRole('dialog', { name: 'Drop the edits to this task?' });
    await drop.waitFor();
    await session.screenshot('plan-keyboard-drop-ask');
    await page.keyboard.press('Enter');
    await drop.waitFor({ state: 'hidden' });
    expect(await edit.getByLabel('Duration').inputValue()).toBe('0:50');
    await tabTo(edit.getByRole('button', { name: 'Apply changes' }));
    await page.keyboard.press('Enter');
    await edit.waitFor({ state: 'hidden' });
    await saved();
    const plan = (await (await page.request.get(`/api/plans/${planId}`)).json()) as {
      tasks: { title: string; durationSeconds: number; tools: string[] }[];
      manifest: { key: string; name: string }[];
    };
    expect(plan.tasks).toHaveLength(1);
    expect(plan.tasks[0].durationSeconds).toBe(50 * 60);
    const driver = plan.manifest.find((m) => m.name === 'Power driver');
    expect(driver, 'the new tool went on the manifest with the task').toBeDefined();
    expect(plan.tasks[0].tools.sort()).toEqual(['tool-bag', driver!.key].sort());

    // submit for review
    await tabTo(page.getByRole('button', { name: 'Submit for review' }));
    await page.keyboard.press('Enter');
    await page.locator('main header').first().getByText('In review').waitFor();
    await session.screenshot('plan-keyboard-submitted');
    expect(tabs, 'Add task is a few Tab stops into the plan').toBeLessThan(60);
  });
});
