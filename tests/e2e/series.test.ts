import { describe, expect, it } from 'vitest';
import type { StationSummary } from '@shared/schemas/station-edits';
import { type BrowserSession, openBrowserPerTest, signInAs } from './browser';

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
