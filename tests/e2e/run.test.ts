import { afterEach, describe, expect, it } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from './browser';

const DEMO_PLAN = 'External camera boom install';
const sessions: BrowserSession[] = [];

afterEach(async () => {
  const errors = sessions.flatMap((s) => s.errors);
  for (const s of sessions.splice(0)) await s.close();
  expect(errors, 'console errors or page errors during the test').toEqual([]);
});

describe('the day of the EVA on the run screen, live on two screens', () => {
  it('the planner logs with one key; the viewer’s wall screen moves without a reload and shows who is looking', async () => {
    const wall = await openBrowser();
    const laptop = await openBrowser();
    sessions.push(wall, laptop);
    await wall.page.setViewportSize({ width: 1920, height: 1080 });
    await laptop.page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(laptop, 'planner');
    await signInAs(wall, 'viewer');

    const plans = (await (await laptop.page.request.get('/api/plans')).json()) as {
      id: number;
      title: string;
    }[];
    const plan = plans.find((p) => p.title === DEMO_PLAN)!;
    expect(plan, 'the approved demo plan is seeded').toBeDefined();

    // the planner starts a run from the approved plan's screen
    await laptop.goto(`/plans/${plan.id}`);
    await laptop.page.getByRole('button', { name: 'Start a run now' }).click();
    await laptop.page.waitForURL(/\/runs\/\d+$/);
    const runPath = new URL(laptop.page.url()).pathname;
    await laptop.page.getByTestId('run-lanes').waitFor();

    await wall.goto(runPath);
    await wall.page.getByTestId('run-lanes').waitFor();
    await expect(wall.page.getByLabel('Planning caution').first().isVisible()).resolves.toBe(true);
    // each sees the other on the same plan
    await wall.page
      .getByTestId('presence')
      .getByText(/Also looking: .*Planner/)
      .waitFor();
    await laptop.page
      .getByTestId('presence')
      .getByText(/Also looking: .*Viewer/)
      .waitFor();
    const loggedOnWall = wall.page.getByText(/ · 0 logged · /);
    await loggedOnWall.waitFor();

    // one key: EV1 out of the airlock, then the start of EV1's first task
    await expect(laptop.page.getByTestId('log-EV1').textContent()).resolves.toContain('Egress done');
    await laptop.page.keyboard.press('1');
    await laptop.page
      .getByTestId('log-EV1')
      .getByText(/Start: /)
      .waitFor();
    await wall.page.getByText(/ · 1 logged · /).waitFor({ timeout: 5000 });
    const firstTask = (await laptop.page.getByTestId('log-EV1').textContent())!.replace(/^.*Start: /, '');
    await laptop.page.keyboard.press('1');
    await laptop.page.getByTestId('log-EV1').getByText(`Done: ${firstTask}`).waitFor();
    await laptop.page.keyboard.press('1');
    await laptop.page
      .getByTestId('log-EV1')
      .getByText(/Start: /)
      .waitFor();

    // the wall screen shows all three logs, without a reload: the task is in its flown lane
    await wall.page.getByText(/ · 3 logged · /).waitFor({ timeout: 5000 });
    await expect(wall.page.evaluate(() => performance.getEntriesByType('navigation').length)).resolves.toBe(
      1,
    );
    const flown = wall.page.locator('[data-crew="EV1"] title', { hasText: firstTask });
    await expect(flown.count()).resolves.toBeGreaterThanOrEqual(2);
    await expect(wall.page.getByTestId('log-EV1').count()).resolves.toBe(0);
    await wall.page.getByTestId('plan-day').locator('canvas').waitFor();
    await wall.screenshot('run-wall-1920');
    await laptop.screenshot('run-laptop-1440');
  });
});
