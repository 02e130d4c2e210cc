import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { PlanTimeline } from '@shared/schemas/plan-views';
import type { WalkthroughSummary } from '@shared/schemas/walkthrough';
import { openBrowserPerTest, sceneSettled, signInAs, stepUntil, type BrowserSession } from './browser';
import { fromWire } from '@shared/compute/day/wire';

const DEMO_PLAN = 'External camera boom install';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

/** Every crew member's and item's state the day panel shows at the scrubber's time. */
async function dayState(page: Page): Promise<Record<string, string>> {
  return page
    .getByTestId('day-state')
    .locator('[data-testid^="day-"]')
    .evaluateAll((els) =>
      Object.fromEntries(
        els.map((el) => [
          el.getAttribute('data-testid')!,
          ['data-where', 'data-anchor', 'data-restraint', 'data-step']
            .map((a) => el.getAttribute(a) ?? '')
            .join('|'),
        ]),
      ),
    );
}

const where = (page: Page, item: string) => page.getByTestId(`day-item-${item}`).getAttribute('data-where');

describe('the day in 3D: scrub the plan, see the tether, the restraint and the items move', () => {
  it('planner scrubs the approved demo plan; the trainer’s walkthrough shows the same states', async () => {
    const { page } = session;
    await signInAs(session, 'planner');
    const plans = (await (await page.request.get('/api/plans')).json()) as { id: number; title: string }[];
    const plan = plans.find((p) => p.title === DEMO_PLAN)!;
    expect(plan, 'the approved demo plan is seeded').toBeDefined();
    const timeline = fromWire<PlanTimeline>(
      await (await page.request.get(`/api/plans/${plan.id}/timeline`)).json(),
    );
    const boom = timeline.equipment.find((e) => e.item === 'boom')!;
    const restraint = timeline.equipment.find((e) => e.item === 'restraint-1')!;
    // the boom goes out with EV2, is handed to EV1, then set down at the mount
    expect(boom.states.map((s) => s.where)).toEqual([
      { kind: 'carried', crew: 'EV2' },
      { kind: 'carried', crew: 'EV1' },
      { kind: 'at', node: 'PB2-W01' },
    ]);
    expect(restraint.states.at(-1)!.where).toEqual({ kind: 'installed', node: 'PB2-S05' });

    await page.setViewportSize({ width: 1440, height: 900 });
    await session.goto(`/plans/${plan.id}`);
    const day = page.getByTestId('plan-day');
    await day.locator('canvas').waitFor();
    await expect(page.getByLabel('Planning caution').first().isVisible()).resolves.toBe(true);
    // at 1440 x 900 the day's chart and the first tasks fit in the window together under the plan's
    // sticky header, whatever notice stands above them (other tests change the demo station, so the
    // approved plan may say its station changed since approval)
    const header = (await page.locator('main header').first().boundingBox())!;
    const chart = (await page.getByRole('group', { name: /^Timeline: the day ends/ }).boundingBox())!;
    const task3 = (await page.getByRole('listitem', { name: /^Task 3 of / }).boundingBox())!;
    expect(task3.y + task3.height - chart.y).toBeLessThanOrEqual(900 - header.height);
    await expect(where(page, 'boom')).resolves.toBe('carried:EV2');
    await expect(where(page, 'restraint-1')).resolves.toBe('carried:EV1');

    // picking EV1's first translate on the chart goes there: the tether line runs from its anchor
    const translate = timeline.crew.EV1.blocks.find((b) => b.type === 'translate' && b.tetherAtStart)!;
    await page
      .getByRole('list', { name: 'EV1 blocks' })
      .locator('[data-block-type="translate"]')
      .first()
      .click();
    await expect(page.getByTestId('timeline-cursor').getAttribute('data-t')).resolves.toBe(
      String(Math.round(translate.start)),
    );
    await expect(page.getByTestId('day-crew-EV1').getAttribute('data-anchor')).resolves.toBe(
      translate.tetherAtStart!.anchor,
    );
    await expect(page.getByTestId('paid-out-EV1').textContent()).resolves.toContain(
      `clipped at ${translate.tetherAtStart!.anchor}`,
    );

    // stepping block to block: the restraint is installed, EV1 stands in it, the boom changes hands
    await stepUntil(page, async () => (await where(page, 'restraint-1')) === 'installed:PB2-S05');
    await stepUntil(
      page,
      async () => (await page.getByTestId('day-crew-EV1').getAttribute('data-restraint')) === 'PB2-S05',
    );
    // picking the hand-over's work block frames the worksite: the restraint, the anchor and both crew
    await page
      .getByRole('list', { name: 'EV1 blocks' })
      .getByRole('listitem', { name: /^EV1 Work: Task 3:/ })
      .click();
    await expect(where(page, 'boom')).resolves.toBe('carried:EV2');
    await stepUntil(page, async () => (await where(page, 'boom')) === 'carried:EV1');
    const handedOver = await dayState(page);
    expect(handedOver['day-item-restraint-1']).toMatch(/^installed:PB2-S05\|/);
    // the whole page from its top, where the plan's sticky header sits (not over the middle)
    const fromTop = () => page.evaluate(() => window.scrollTo(0, 0));
    await sceneSettled(page);
    await fromTop();
    await session.screenshot('plan-day-1440');
    await page.setViewportSize({ width: 1024, height: 768 });
    await sceneSettled(page);
    await fromTop();
    await session.screenshot('plan-day-1024');
    await stepUntil(page, async () => (await where(page, 'boom')) === 'at:PB2-W01');

    // the trainer's walkthrough of the same plan: the same states at the same moment
    await page.setViewportSize({ width: 1440, height: 900 });
    await page.request.post('/api/auth/sign-out');
    await signInAs(session, 'trainer');
    const listed = (await (await page.request.get('/api/walkthroughs')).json()) as WalkthroughSummary[];
    const walkthrough = listed.find((w) => w.plan?.id === plan.id)!;
    expect(walkthrough, 'the demo walkthrough is seeded').toBeDefined();
    await session.goto(`/walkthroughs/${walkthrough.id}`);
    await page
      .getByRole('region', { name: /3D playback of/ })
      .locator('canvas')
      .waitFor();
    // the items' states sit in the side panel's "At this moment" tab, beside the steps
    await page.getByRole('tab', { name: 'At this moment' }).click();
    await expect(where(page, 'boom')).resolves.toBe('carried:EV2');
    await stepUntil(page, async () => (await where(page, 'boom')) === 'carried:EV1');
    expect(await dayState(page)).toEqual(handedOver);
    await sceneSettled(page);
    await session.screenshot('walkthrough-day-1440');
  });
});
