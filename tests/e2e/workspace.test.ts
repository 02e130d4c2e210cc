import { describe, expect, it } from 'vitest';
import type { StationSummary } from '@shared/schemas/station-edits';
import type { WalkthroughSummary } from '@shared/schemas/walkthrough';
import { openBrowserPerTest, sceneSettled, signInAs, type BrowserSession } from './browser';

let session: BrowserSession;
openBrowserPerTest((s) => (session = s));

const scene = () => session.page.getByTestId('station-scene');

async function canvasShare(): Promise<number> {
  const box = await scene().locator('canvas').boundingBox();
  const view = session.page.viewportSize()!;
  return (box!.width * box!.height) / (view.width * view.height);
}

/** The page fits the window: nothing under the workspace to scroll to. */
const pageHeight = () => session.page.evaluate(() => document.documentElement.scrollHeight);

async function at(width: number, height: number) {
  await session.page.setViewportSize({ width, height });
  await sceneSettled(session.page, 0);
}

describe('3D workspaces fill the window', () => {
  it('gives the socket planner the window, its panel beside the view, at 1440 and 1024 px', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(session, 'engineer');
    const stations = (await (await page.request.get('/api/stations')).json()) as StationSummary[];
    const kestrel = stations.find((s) => s.name === 'Kestrel Station')!;
    await session.goto(`/stations/${kestrel.id}/sockets`);
    await page.getByRole('heading', { level: 1, name: 'Socket planner' }).waitFor();
    await at(1440, 900);
    const share = await canvasShare();
    console.info(`socket planner canvas share at 1440x900: ${(share * 100).toFixed(1)} %`);
    expect(share).toBeGreaterThanOrEqual(0.55);
    expect(await pageHeight()).toBeLessThanOrEqual(900);
    await page.getByRole('button', { name: /^Plan sockets for/ }).waitFor();
    await session.screenshot('socket-planner-1440');
    await at(1024, 768);
    expect(await pageHeight()).toBeLessThanOrEqual(768);
    await session.screenshot('socket-planner-1024');
  });

  it('keeps the walkthrough’s controls in the window at 1024 px', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1024, height: 768 });
    await signInAs(session, 'trainer');
    // a dialog opens with the focus in its first field, ready to type
    await session.goto('/walkthroughs');
    await page.getByRole('button', { name: 'New walkthrough' }).click();
    const dialog = page.getByRole('dialog', { name: 'New walkthrough' });
    await expect
      .poll(() =>
        dialog.getByRole('radio', { name: /^A whole plan/ }).evaluate((el) => el === document.activeElement),
      )
      .toBe(true);
    await page.keyboard.press('Escape');
    const listed = (await (await page.request.get('/api/walkthroughs')).json()) as WalkthroughSummary[];
    const withPlan = listed.find((w) => w.plan);
    expect(withPlan, 'the demo has a walkthrough of a plan').toBeTruthy();
    await session.goto(`/walkthroughs/${withPlan!.id}`);
    await scene().locator('canvas').waitFor();
    await at(1024, 768);
    const next = (await page.getByRole('button', { name: 'Next step' }).boundingBox())!;
    expect(next.y + next.height).toBeLessThanOrEqual(768);
    for (let i = 0; i < 5; i++) await page.getByRole('button', { name: 'Next step' }).click();
    expect(await page.evaluate(() => window.scrollY)).toBe(0);
    await sceneSettled(page, 0);
    await session.screenshot('walkthrough-1024');
  });
});
