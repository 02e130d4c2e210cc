import fs from 'node:fs';
import path from 'node:path';
import {
  chromium,
  type Browser,
  type BrowserContext,
  type ConsoleMessage,
  type Locator,
  type Page,
} from 'playwright-core';
import { afterAll, afterEach, beforeEach, expect, inject } from 'vitest';

const root = path.resolve(import.meta.dirname, '../..');
/** Screenshots of each run land here (not tracked); screenshots/ holds the ones kept as evidence. */
export const SCREENSHOT_DIR = process.env.SCREENSHOT_DIR ?? path.join(root, 'test-results', 'screenshots');

const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--use-angle=swiftshader',
  '--enable-unsafe-swiftshader',
];

/**
 * Chromium logs every 4xx response as a console error. These two are answers the app asks for on
 * purpose ("not signed in", "wrong password"); any other failed response still fails the test.
 */
interface ExpectedHttpError {
  path: string | RegExp;
  status: number;
}
const APP_HTTP_ANSWERS: ExpectedHttpError[] = [
  { path: '/api/auth/me', status: 401 },
  { path: '/api/auth/sign-in', status: 401 },
];

export interface BrowserSession {
  page: Page;
  context: BrowserContext;
  baseURL: string;
  /** console errors and uncaught page errors seen so far */
  errors: string[];
  /** a test that provokes a refusal on purpose (a 409, a spent link) declares it here */
  expectHttpError: (path: string | RegExp, status: number) => void;
  goto: (pathname: string) => Promise<void>;
  screenshot: (name: string) => Promise<string>;
  close: () => Promise<void>;
}

function isExpectedHttpError(message: ConsoleMessage, expected: ExpectedHttpError[]): boolean {
  const status = /status of (\d{3})/.exec(message.text())?.[1];
  if (!status) return false;
  const url = message.location().url;
  const pathname = url ? new URL(url).pathname : '';
  return expected.some(
    (e) =>
      String(e.status) === status &&
      (typeof e.path === 'string' ? e.path === pathname : e.path.test(pathname)),
  );
}

/**
 * One Chromium per test file, started on the first session it asks for; every session is a fresh
 * context of it (its own cookies, storage and cache), which opens in milliseconds where a new
 * browser takes seconds. Registered here, at the import by the test file, so it closes with the file.
 */
let browser: Promise<Browser> | undefined;
afterAll(async () => {
  const started = browser;
  browser = undefined;
  if (started) await (await started).close();
});

export async function openBrowser(): Promise<BrowserSession> {
  const baseURL = inject('baseURL');
  browser ??= chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: CHROMIUM_ARGS,
  });
  const context = await (await browser).newContext({ viewport: { width: 1360, height: 860 }, baseURL });
  const page = await context.newPage();
  const errors: string[] = [];
  const expected = [...APP_HTTP_ANSWERS];
  page.on('console', (message) => {
    if (message.type() === 'error' && !isExpectedHttpError(message, expected)) {
      errors.push(`console.error: ${message.text()} (${message.location().url})`);
    }
  });
  page.on('pageerror', (error) => errors.push(`page error: ${error.stack ?? error.message}`));

  return {
    page,
    context,
    baseURL,
    errors,
    expectHttpError: (path, status) => expected.push({ path, status }),
    goto: async (pathname) => {
      await page.goto(new URL(pathname, baseURL).href);
    },
    screenshot: async (name) => {
      fs.mkdirSync(SCREENSHOT_DIR, { recursive: true });
      const file = path.join(SCREENSHOT_DIR, `${name}.png`);
      await page.screenshot({ path: file, fullPage: true });
      return file;
    },
    close: () => context.close(),
  };
}

/** The one demo password (README). */
export const DEMO_PASSWORD = 'tetherwise-demo';

/**
 * A fresh browser for every test of the file, handed to `assign`; after each test the browser closes
 * and the test fails if any console error or page error happened.
 */
export function openBrowserPerTest(assign: (session: BrowserSession) => void) {
  let current: BrowserSession | undefined;
  beforeEach(async () => {
    current = await openBrowser();
    assign(current);
  });
  afterEach(async () => {
    if (!current) return;
    const errors = [...current.errors];
    await current.close();
    expect(errors, 'console errors or page errors during the test').toEqual([]);
  });
}

/**
 * Signs the session in as `<role>@example.org` through the sign-in endpoint: the session cookie lands
 * in the browser context, and the page stays where it was (a fresh session: blank), so the test opens
 * the screen it needs with one page load. The sign-in form itself has its own browser test.
 */
export async function signInAs(session: BrowserSession, role: string) {
  const res = await session.context.request.post('/api/auth/sign-in', {
    data: { email: `${role}@example.org`, password: DEMO_PASSWORD },
  });
  expect(res.status(), `sign-in as ${role}`).toBe(200);
}

/** How many frames the 3D scene in `scene` has drawn (the counter it keeps in `data-frames`). */
export async function framesDrawn(scene: Locator): Promise<number> {
  return Number((await scene.getAttribute('data-frames')) ?? 0);
}

/**
 * Waits until the 3D scene in `scene` (the page's station scene unless given) has drawn a frame after
 * its `data-frames` counter read `after`, and then drew none for three browser animation frames: what
 * the last action set going (a route drawn, the camera's move) is on the canvas, ready to be counted.
 * The scene draws on demand, so a still scene draws nothing and a moving one a frame each time.
 */
export async function sceneSettled(page: Page, after = 0, scene = page.getByTestId('station-scene')) {
  await scene.evaluate(
    (el, since) =>
      new Promise<void>((resolve) => {
        let last = -1;
        let still = 0;
        const tick = () => {
          const frames = Number((el as HTMLElement).dataset.frames ?? 0);
          still = frames > since && frames === last ? still + 1 : 0;
          last = frames;
          if (still >= 3) resolve();
          else requestAnimationFrame(tick);
        };
        requestAnimationFrame(tick);
      }),
    after,
  );
}

/** Steps the scrubber block by block with the arrow key until `done` holds (at most `max` steps). */
export async function stepUntil(page: Page, done: () => Promise<boolean>, max = 120): Promise<void> {
  const scrub = page.getByRole('slider', { name: 'Elapsed time' });
  await scrub.focus();
  for (let i = 0; i < max; i++) {
    if (await done()) return;
    await scrub.press('ArrowRight');
  }
  expect(await done(), 'reached the state by stepping block to block').toBe(true);
}
