import { request } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import type { StationSummary } from '@shared/schemas/station-edits';
import {
  type BrowserSession,
  framesDrawn,
  openBrowserPerTest,
  sceneSettled,
  signInAs,
  DEMO_PASSWORD,
} from './browser';

// the two worksites at the ends of the long truss: far beyond one 25.9 m tether
const FROM = 'PB4-W01';
const TO = 'SB4-W01';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

const signIn = (role: string) => signInAs(session, role);

async function kestrelId(): Promise<number> {
  const api = await request.newContext({ baseURL: session.baseURL });
  await api.post('/api/auth/sign-in', { data: { email: 'viewer@example.org', password: DEMO_PASSWORD } });
  const stations = (await (await api.get('/api/stations')).json()) as StationSummary[];
  await api.dispose();
  const station = stations.find((s) => s.name === 'Kestrel Station');
  if (!station) throw new Error('the demo station is not seeded');
  return station.id;
}

/** Counts canvas pixels of the route overlay's colours: lime path (about 83°) and orange swap markers (about 27°). */
async function overlayPixels(session: BrowserSession) {
  return session.page
    .getByTestId('station-scene')
    .locator('canvas')
    .first()
    .evaluate((canvas: HTMLCanvasElement) => {
      const off = document.createElement('canvas');
      off.width = canvas.width;
      off.height = canvas.height;
      const ctx = off.getContext('2d')!;
      ctx.drawImage(canvas, 0, 0);
      const px = ctx.getImageData(0, 0, off.width, off.height).data;
      let lime = 0;
      let orange = 0;
      let colours = new Set<number>();
      for (let i = 0; i < px.length; i += 4) {
        const [r, g, b] = [px[i], px[i + 1], px[i + 2]];
        colours.add((r << 16) | (g << 8) | b);
        const max = Math.max(r, g, b);
        const min = Math.min(r, g, b);
        if (max < 110 || max - min < 0.5 * max) continue;
        const hue =
          max === r
            ? (60 * (g - b)) / (max - min)
            : max === g
              ? 120 + (60 * (b - r)) / (max - min)
              : 240 + (60 * (r - g)) / (max - min);
        if (hue >= 65 && hue <= 95) lime++;
        if (hue >= 18 && hue <= 33) orange++;
      }
      const distinct = colours.size;
      colours = new Set();
      return { lime, orange, distinct };
    });
}

async function chooseNode(label: 'From' | 'To', key: string) {
  const { page } = session;
  const box = page.getByRole('combobox', { name: label });
  await box.fill(key.slice(0, 5));
  await page.getByRole('option', { name: new RegExp(`^${key}\\b`) }).click();
  await expect(box.inputValue()).resolves.toBe(key);
}

describe('route finder', () => {
  it('finds a planner a long route with tether swaps, shows the steps, the swaps in 3D and the three modes compared', async () => {
    const { page } = session;
    const id = await kestrelId();
    await signIn('planner');
    await session.goto(`/stations/${id}`);
    await page.getByTestId('station-scene').locator('canvas').waitFor();
    await sceneSettled(page);
    const before = await overlayPixels(session);
    await page.getByRole('tab', { name: 'Route' }).click();
    await chooseNode('From', FROM);
    await chooseNode('To', TO);
    await page.getByRole('radio', { name: /^Fastest/ }).check();
    const framesBeforeRoute = await framesDrawn(page.getByTestId('station-scene'));
    await page.getByRole('button', { name: 'Find route' }).click();

    const result = page.getByRole('region', { name: 'Route result' });
    const steps = result.getByRole('list', { name: 'Route steps' }).getByRole('listitem');
    await steps.first().waitFor();
    const texts = await steps.allTextContents();
    const swaps = texts.filter((t) =>
      /Tether swap at [A-Z0-9-]+: clip the new hook, then release the old one/.test(t),
    );
    expect(swaps.length).toBeGreaterThan(0);
    expect(texts.some((t) => /Translate \d+\.\d m along the handrail to /.test(t))).toBe(true);
    expect(texts[0]).toContain(`Start at ${FROM}`);
    expect(texts.at(-1)).toContain(`Arrive at ${TO}`);
    await result
      .getByLabel('Route summary')
      .getByText(/^\d+\.\d m \(\d+\.\d ft\)$/)
      .first()
      .waitFor();
    await page.getByLabel('Planning caution').first().waitFor();

    // the three modes compared: on the demo station all three give this same route, said once
    // (among equal travel times the fastest takes the fewest swaps, so it is no worse than the others)
    const agree = result.getByTestId('modes-agree');
    await expect(agree.textContent()).resolves.toMatch(
      /^All three modes give the same route: \d+\.\d m, \d+:\d\d min of travel, \d+ swaps?, \d+:\d\d min in all\.$/,
    );
    await expect(result.getByRole('table').count()).resolves.toBe(0);

    // the route is on the page: wait until the scene has drawn it and the camera has come to rest
    await sceneSettled(page, framesBeforeRoute);
    await session.screenshot('route-finder-fastest');
    const drawn = await overlayPixels(session);
    console.info(`route overlay pixels before ${JSON.stringify(before)}, after ${JSON.stringify(drawn)}`);
    expect(drawn.distinct, 'a drawn scene').toBeGreaterThan(50);
    expect(drawn.lime - before.lime, 'the route path').toBeGreaterThan(300);
    expect(drawn.orange - before.orange, 'the swap markers').toBeGreaterThan(20);
    await session.screenshot('route-finder-fastest');

    // switching the mode keeps the comparison
    await page.getByRole('radio', { name: /^Fewest swaps/ }).check();
    await agree.waitFor();
    const framesBeforeReach = await framesDrawn(page.getByTestId('station-scene'));
    await page.getByRole('checkbox', { name: /Show tether reach in 3D/ }).check();
    await sceneSettled(page, framesBeforeReach);
    await session.screenshot('route-finder-fewest-swaps');
  });
});
