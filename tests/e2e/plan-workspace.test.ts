import { describe, expect, it } from 'vitest';
import { orbitSummary, phaseOfOrbitStart } from '@shared/compute/orbit';
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
    const settings = page.getByRole('group', { name: 'EVA starts' });
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
    const again = page.getByRole('group', { name: 'EVA starts' });
    expect(await again.getByLabel('Start: minutes').inputValue()).toBe('5');
    expect(await again.getByLabel('Start: after or before').inputValue()).toBe('before');
    expect(await again.getByLabel('Start: orbit event').inputValue()).toBe('sunset');
  });
});
