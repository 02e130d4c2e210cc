import { describe, expect, it } from 'vitest';
import type { PlanPlayback, WalkthroughDetail, WalkthroughSummary } from '@shared/schemas/walkthrough';
import { framesDrawn, openBrowserPerTest, sceneSettled, type BrowserSession, DEMO_PASSWORD } from './browser';

const DEMO_PLAN = 'External camera boom install';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

async function apiSignIn(email: string) {
  const res = await session.page.request.post('/api/auth/sign-in', {
    data: { email, password: DEMO_PASSWORD },
  });
  expect(res.status()).toBe(200);
}

/**
 * The demo plan, as the seed makes it. Until the demo plans seed step exists, a planner makes a
 * plan of that name on the demo station so the walkthrough flow can still be driven end to end.
 */
async function ensureDemoPlan(): Promise<number> {
  const { request } = session.page;
  await apiSignIn('planner@example.org');
  const plans = (await (await request.get('/api/plans')).json()) as { id: number; title: string }[];
  const existing = plans.find((p) => p.title === DEMO_PLAN);
  if (existing) return existing.id;
  const stations = (await (await request.get('/api/stations')).json()) as { id: number; name: string }[];
  const kestrel = stations.find((s) => s.name === 'Kestrel Station')!;
  const created = await request.post('/api/plans', {
    data: {
      title: DEMO_PLAN,
      stationId: kestrel.id,
      date: '2031-05-14',
      crew: {
        EV1: { name: 'Rhea Quint', tetherLengthM: 25.9 },
        EV2: { name: 'Idris Vale', tetherLengthM: 25.9 },
      },
      tasks: [
        {
          title: 'Install the camera boom',
          worksite: 'PB3-W01',
          crew: 'EV1',
          durationSeconds: 3600,
          socket: 'PB3-S01',
        },
        { title: 'Route the camera cable', worksite: 'PB2-W01', crew: 'EV2', durationSeconds: 2400 },
      ],
    },
  });
  expect(created.status()).toBe(201);
  return ((await created.json()) as { id: number }).id;
}

async function signIn(email: string) {
  const { page } = session;
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('heading', { level: 1, name: /^Welcome, / }).waitFor();
}

describe('walkthrough: 3D playback, tether swap call-out and printable step cards', () => {
  it('lets a trainer open the demo plan’s walkthrough, step to the first tether swap and print the cards', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    const planId = await ensureDemoPlan();
    await session.page.request.post('/api/auth/sign-out');
    await session.goto('/sign-in');
    await signIn('trainer@example.org');

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Walkthroughs' }).click();
    await page.getByRole('heading', { level: 1, name: 'Walkthroughs' }).waitFor();
    const listed = (await (await page.request.get('/api/walkthroughs')).json()) as WalkthroughSummary[];
    const demo = listed.find((w) => w.plan?.id === planId);
    if (demo) {
      await page.getByRole('link', { name: demo.name }).click();
    } else {
      // no seeded walkthrough yet: the trainer makes one from the list page
      await page.getByRole('button', { name: 'New walkthrough' }).click();
      const dialog = page.getByRole('dialog', { name: 'New walkthrough' });
      await dialog.getByLabel('Plan').selectOption(String(planId));
      await expect(dialog.getByLabel('Name').inputValue()).resolves.toBe(`Rehearsal: ${DEMO_PLAN}`);
      await dialog.getByRole('button', { name: 'Save walkthrough' }).click();
    }
    await page.waitForURL(/\/walkthroughs\/\d+/);
    const id = Number(new URL(page.url()).pathname.split('/').pop());
    const detail = (await (await page.request.get(`/api/walkthroughs/${id}`)).json()) as WalkthroughDetail;
    const playback = detail.playback as PlanPlayback;
    const stepCount = playback.crews.EV1.steps.length + playback.crews.EV2.steps.length;
    const firstSwap = [...playback.crews.EV1.steps, ...playback.crews.EV2.steps]
      .filter((s) => s.type === 'swap')
      .sort((a, b) => a.start - b.start)[0];
    expect(firstSwap, 'the demo plan has at least one tether swap').toBeTruthy();

    await page
      .getByRole('region', { name: /3D playback of/ })
      .locator('canvas')
      .waitFor();
    await expect(page.getByRole('list', { name: 'Steps' }).getByRole('listitem').count()).resolves.toBe(
      stepCount,
    );
    await expect(page.getByLabel('Planning caution').first().isVisible()).resolves.toBe(true);

    // at the start both crew stand at the airlock: no tag is drawn over another or over a marker
    const scene = page.getByTestId('station-scene');
    await sceneSettled(page, 0);
    const rects = JSON.parse((await scene.getAttribute('data-label-rects')) ?? '[]') as number[][];
    expect(rects.length).toBeGreaterThan(0);
    for (let i = 0; i < rects.length; i++)
      for (let j = i + 1; j < rects.length; j++) {
        const [a, b] = [rects[i], rects[j]];
        const overlap = a[0] < b[0] + b[2] && b[0] < a[0] + a[2] && a[1] < b[1] + b[3] && b[1] < a[1] + a[3];
        expect(overlap, `tags ${i} and ${j} overlap at the start`).toBe(false);
      }
    await session.screenshot('walkthrough-1440');
    const canvasTop = async () => (await scene.locator('canvas').boundingBox())!.y;
    const topBefore = await canvasTop();

    // step through events until the first swap is under way
    const callout = page.getByTestId('step-callout');
    const swapText = `Tether swap at ${firstSwap.clipKey}: clip the new hook at ${firstSwap.clipKey}, then release the old one at ${firstSwap.releaseKey}`;
    for (let i = 0; i < 80 && !(await callout.textContent())?.includes(swapText); i++) {
      await page.getByRole('button', { name: 'Next step' }).click();
    }
    await expect(callout.textContent()).resolves.toContain(swapText);
    // stepping moved neither the page nor the model: Play and Next are still in the window
    expect(await page.evaluate(() => window.scrollY)).toBe(0);
    expect(await canvasTop()).toBe(topBefore);
    for (const name of ['Next step', 'Previous step']) {
      const box = (await page.getByRole('button', { name }).boundingBox())!;
      expect(box.y + box.height).toBeLessThanOrEqual(900);
    }
    const crew = firstSwap.crew!;
    await expect(page.getByTestId(`paid-out-${crew}`).textContent()).resolves.toContain(
      `clipped at ${firstSwap.releaseKey}`,
    );
    await expect(page.getByTestId('elapsed').textContent()).resolves.toMatch(/^\d+:\d\d:\d\d$/);
    await expect(page.getByTestId('orbit-phase').textContent()).resolves.toMatch(/^.\s*(Day|Night)$/);
    const framesBeforeCamera = await framesDrawn(page.getByTestId('station-scene'));
    await page.getByRole('combobox', { name: 'Camera' }).selectOption(crew);
    await sceneSettled(page, framesBeforeCamera);
    await session.screenshot('walkthrough-first-swap');

    // a trainer's note is saved with the walkthrough and shown on the step
    const current = page.locator('[aria-current="step"]').first();
    await current.getByRole('button', { name: /note/ }).click();
    await current
      .getByLabel('Trainer note')
      .fill('Partner confirms the new hook is locked before the old one opens.');
    await current.getByRole('button', { name: 'Save note' }).click();
    await current.getByText('Trainer note: Partner confirms').waitFor();

    // the shareable link to a step opens the walkthrough at that step
    const number = await page
      .getByRole('list', { name: 'Steps' })
      .locator('[data-step-id]')
      .evaluateAll(
        (rows, stepId) => rows.findIndex((r) => r.getAttribute('data-step-id') === stepId) + 1,
        firstSwap.id,
      );
    await session.goto(`/walkthroughs/${id}?step=${number}`);
    await expect(page.getByTestId('step-callout').textContent()).resolves.toContain(swapText);
    await expect(page.locator(`[data-step-id="${firstSwap.id}"]`).getAttribute('aria-current')).resolves.toBe(
      'step',
    );

    await page.getByRole('button', { name: 'Print cards' }).click();
    await page.getByTestId('step-cards').waitFor();
    expect(new URL(page.url()).searchParams.get('print')).toBe('1');
    await expect(page.getByTestId('step-card').count()).resolves.toBe(stepCount);
    await expect(page.getByTestId('step-card').locator('svg').count()).resolves.toBe(stepCount);
    const cards = page.getByTestId('step-cards');
    await expect(cards.getByText(swapText).first().isVisible()).resolves.toBe(true);
    await expect(cards.getByText('Trainer note: Partner confirms').isVisible()).resolves.toBe(true);
    await expect(page.getByRole('list', { name: 'Steps' }).isVisible()).resolves.toBe(false);
    await session.screenshot('walkthrough-step-cards');
  });
});
