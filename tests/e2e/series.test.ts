import { describe, expect, it } from 'vitest';
import type { StationSummary } from '@shared/schemas/station-edits';
import { type BrowserSession, framesDrawn, openBrowserPerTest, signInAs } from './browser';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

describe('change control and series', () => {
  it('the engineer is asked before a change that touches the approved camera boom plan, and nothing is written on cancel', async () => {
    const { page } = session;
    await signInAs(session, 'engineer');
    const stations = (await (await page.request.get('/api/stations')).json()) as StationSummary[];
    const station = stations.find((s) => s.name === 'Kestrel Station')!;
    await session.goto(`/stations/${station.id}`);
    await page.getByTestId('station-scene').waitFor();
    await page.getByLabel('Find a node').fill('PB2-W01');
    await page
      .getByRole('option', { name: /^PB2-W01\b/ })
      .first()
      .click();
    await page.getByRole('tab', { name: 'Edit' }).click();
    const change = page.getByRole('form', { name: 'Change node PB2-W01' });
    await change.waitFor();
    await change.getByRole('button', { name: 'x plus 0.1 m' }).click();
    await change.getByRole('button', { name: 'Save node' }).click();

    const prompt = page.getByText('This change touches reviewed plans');
    await prompt.waitFor();
    const affected = page.getByRole('list', { name: 'Affected plans' });
    await affected.getByText('External camera boom install').waitFor();
    expect(await affected.textContent()).toContain('(approved)');
    await session.screenshot('station-edit-affected-plans');

    await page.getByRole('button', { name: 'Cancel' }).click();
    await prompt.waitFor({ state: 'detached' });
    const after = (await (await page.request.get(`/api/stations/${station.id}`)).json()) as StationSummary;
    expect(after.version).toBe(station.version);
  });

  it('the planner opens the demo series and sees the strip of its EVAs with what stays outside between them', async () => {
    const { page } = session;
    await signInAs(session, 'planner');
    await session.goto('/plans');
    await page.getByRole('link', { name: 'Camera boom install, two EVAs' }).click();
    const strip = page.getByRole('list', { name: 'EVAs of the series' });
    await strip.waitFor();
    await strip.getByRole('link', { name: 'External camera boom install' }).waitFor();
    await strip.getByRole('link', { name: 'Camera boom cabling and checkout' }).waitFor();
    const between = page.getByRole('listitem', { name: 'Outside after EVA 1' });
    const text = await between.textContent();
    expect(text).toContain('Portable foot restraint');
    expect(text).toContain('installed at PB2-S05');
    expect(text).toContain('Boom parts bag');
    expect(await page.getByRole('listitem', { name: 'EVA 2', exact: true }).textContent()).toContain(
      'No warnings',
    );
    await session.screenshot('series-strip');
  });
});

describe('a series built on the screens', () => {
  it('the planner duplicates the boom EVAs, makes them a series, puts them in order, sees what the first leaves outside on the model, and adds and removes an EVA', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(session, 'planner');
    const stamp = Date.now().toString(36);
    const plans = (await (await page.request.get('/api/plans')).json()) as { id: number; title: string }[];
    const install = plans.find((p) => p.title === 'External camera boom install')!;
    const cabling = plans.find((p) => p.title === 'Camera boom cabling and checkout')!;

    // a duplicate from the plan screen: a new draft with the same tasks and manifest
    await session.goto(`/plans/${cabling.id}`);
    await page.getByRole('button', { name: 'Duplicate' }).click();
    await page.getByRole('heading', { level: 1, name: 'Camera boom cabling and checkout (copy)' }).waitFor();
    const second = Number(/\/plans\/(\d+)/.exec(page.url())![1]);
    expect(second).not.toBe(cabling.id);
    const copy = async (id: number, title: string) => {
      const res = await page.request.post(`/api/plans/${id}/duplicate`, { data: { title } });
      expect(res.status()).toBe(201);
      return ((await res.json()) as { id: number }).id;
    };
    const first = await copy(install.id, `Boom install ${stamp}`);
    const extra = await copy(install.id, `Spare EVA ${stamp}`);

    // a new series, the EVAs ticked in the wrong order
    await session.goto('/plans');
    await page.getByRole('button', { name: 'New series' }).click();
    const dialog = page.getByRole('dialog', { name: 'New series' });
    await dialog.getByLabel('Series title').fill(`Boom series ${stamp}`);
    await dialog.getByRole('checkbox', { name: /Camera boom cabling and checkout \(copy\)/ }).check();
    await dialog.getByRole('checkbox', { name: new RegExp(`Boom install ${stamp}`) }).check();
    await dialog.getByRole('button', { name: 'Create series' }).click();
    await page.getByRole('heading', { level: 1, name: `Boom series ${stamp}` }).waitFor();
    const strip = page.getByRole('list', { name: 'EVAs of the series' });
    const eva = (n: number) => strip.getByRole('listitem', { name: `EVA ${n}`, exact: true });
    expect(await eva(1).textContent()).toContain('cabling');

    // put the install first: the cabling EVA then finds the restraint and the bag where it left them
    await eva(2).getByRole('button', { name: 'Move EVA 2 earlier' }).click();
    await expect
      .poll(async () => eva(1).textContent(), { timeout: 30_000 })
      .toContain(`Boom install ${stamp}`);
    const between = strip.getByRole('listitem', { name: 'Outside after EVA 1' });
    await expect
      .poll(async () => between.textContent(), { timeout: 30_000 })
      .toContain('installed at PB2-S05');
    expect(await between.textContent()).toContain('Boom parts bag');
    expect(await eva(2).textContent()).toContain('Starts with');

    const shown = page.getByRole('group', { name: 'Show what stays outside' });
    const scene = page.getByTestId('station-scene');
    await scene.waitFor();
    await shown.getByRole('button', { name: 'After EVA 2' }).click();
    await shown.getByText(/after EVA 2/).waitFor();
    const drawn = await framesDrawn(scene);
    await shown.getByRole('button', { name: 'After EVA 1' }).click();
    const said = shown.getByText(/outside after EVA 1/);
    await expect
      .poll(async () => said.textContent(), { timeout: 30_000 })
      .toContain('Portable foot restraint installed at PB2-S05');
    await expect.poll(async () => framesDrawn(scene), { timeout: 30_000 }).toBeGreaterThan(drawn);
    await session.screenshot('series-outside-on-model');

    // a third EVA added at the end, then taken out again
    const add = page.getByLabel('Add a plan as the next EVA');
    const value = await add.locator('option', { hasText: `Spare EVA ${stamp}` }).getAttribute('value');
    await add.selectOption(value!);
    await page.getByRole('button', { name: 'Add EVA' }).click();
    await eva(3).waitFor();
    expect(await eva(3).textContent()).toContain(`Spare EVA ${stamp}`);
    await session.screenshot('series-three-evas');
    await eva(3).getByRole('button', { name: 'Remove EVA 3 from the series' }).click();
    await eva(3).waitFor({ state: 'detached' });

    const list = (await (await page.request.get('/api/series')).json()) as {
      title: string;
      planIds: number[];
    }[];
    expect(list.find((s) => s.title === `Boom series ${stamp}`)?.planIds).toEqual([first, second]);
    expect(extra).toBeGreaterThan(0);
  }, 240_000);
});
