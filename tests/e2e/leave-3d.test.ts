import { describe, it } from 'vitest';
import { framesDrawn, openBrowserPerTest, sceneSettled, type BrowserSession } from './browser';

// Leaving a 3D screen (signing out, or going elsewhere) must take the scene and its labels down
// cleanly: no page error, and the next screen shows.
let session: BrowserSession;
openBrowserPerTest((s) => (session = s));

describe('leaving the 3D station view', () => {
  it('signing out from the station screen goes to sign-in without errors, three times over', async () => {
    const { page } = session;
    for (let round = 0; round < 3; round++) {
      await session.goto('/sign-in');
      await page.getByLabel('E-mail').fill('engineer@example.org');
      await page.getByLabel('Password', { exact: true }).fill('tetherwise-demo');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('heading', { level: 1, name: /^Welcome, / }).waitFor();
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Stations' }).click();
      await page.getByRole('main').getByRole('link', { name: 'Kestrel Station' }).first().click();
      await page.getByTestId('station-scene').locator('canvas').waitFor();
      // a node selected, so its label is up in the scene when the scene goes
      await page.getByLabel('Find a node').fill('AL-A01');
      const framesBefore = await framesDrawn(page.getByTestId('station-scene'));
      await page.keyboard.press('Enter');
      await page.locator('[data-testid="station-scene"][data-selected="node:AL-A01"]').waitFor();
      await sceneSettled(page, framesBefore);
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.getByRole('button', { name: 'Sign in' }).waitFor();
    }
  });
});
