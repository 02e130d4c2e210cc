import { describe, expect, it } from 'vitest';
import { PERMISSIONS, ROLE_PERMISSIONS, type Permission } from '@shared/auth/permissions';
import { openBrowserPerTest, type BrowserSession, DEMO_PASSWORD } from './browser';

const ALL_PERMISSIONS = Object.keys(PERMISSIONS) as Permission[];

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

async function signIn(email: string, password: string) {
  const { page } = session;
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

async function signOut() {
  await session.page.getByRole('button', { name: 'Sign out' }).click();
  await session.page.waitForURL('**/sign-in');
}

describe('foundation: sign-in, home, people and mailbox in the built app', () => {
  it('sends a signed-out visitor to sign-in and brings the planner back to Home with their actions', async () => {
    const { page } = session;
    await session.goto('/');
    await page.waitForURL('**/sign-in');
    await expect(page.getByRole('heading', { level: 1, name: 'Sign in' }).isVisible()).resolves.toBe(true);
    await session.screenshot('sign-in');

    await signIn('planner@example.org', DEMO_PASSWORD);
    await page.getByRole('heading', { level: 1, name: /^Welcome, / }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/');

    const actions = await page
      .getByRole('list', { name: 'Your permissions' })
      .getByRole('listitem')
      .allTextContents();
    expect(actions).toEqual(ROLE_PERMISSIONS.planner.map((p) => PERMISSIONS[p]));
    for (const missing of ALL_PERMISSIONS.filter((p) => !ROLE_PERMISSIONS.planner.includes(p))) {
      expect(actions).not.toContain(PERMISSIONS[missing]);
    }
    const nav = page.getByRole('navigation', { name: 'Main' });
    expect(await nav.getByRole('link').allTextContents()).toEqual([
      'Home',
      'Stations',
      'Plans',
      'Walkthroughs',
    ]);
    await expect(page.getByRole('banner').getByText('Planner', { exact: true }).isVisible()).resolves.toBe(
      true,
    );
    await session.screenshot('home-planner');

    // admin pages refuse with a reason, unknown addresses say so
    await session.goto('/people');
    await page.getByRole('heading', { level: 1, name: 'Not allowed' }).waitFor();
    await page.getByText('Your role does not give access to this page.').waitFor();
    await session.goto('/no-such-page');
    await page.getByRole('heading', { level: 1, name: 'Page not found' }).waitFor();
    await session.goto('/');

    // a deep link after sign-out comes back to where it pointed
    await signOut();
    await session.goto('/plans');
    await page.waitForURL('**/sign-in?redirectTo=%2Fplans');
    await signIn('planner@example.org', DEMO_PASSWORD);
    await page.waitForURL('**/plans');
    await page.getByRole('heading', { level: 1, name: 'Plans' }).waitFor();
  });

  it('shows the server’s clear message on a wrong password and stays on sign-in', async () => {
    const { page } = session;
    await session.goto('/sign-in');
    // keyboard only: the form is reachable in order and the focused control shows a ring. The form
    // must be on screen first, or its autofocus lands after the click below and Tab starts from it.
    await page.getByLabel('E-mail', { exact: true }).waitFor();
    await page.locator('body').click({ position: { x: 5, y: 5 } });
    const focused = () =>
      page.evaluate(() => {
        const el = document.activeElement as HTMLElement;
        return {
          label:
            el.getAttribute('aria-label') ??
            (el as HTMLInputElement).labels?.[0]?.textContent ??
            el.textContent,
          outline: getComputedStyle(el).outlineStyle,
        };
      });
    await page.keyboard.press('Tab');
    expect(await focused()).toEqual({ label: 'E-mail', outline: 'solid' });
    await page.keyboard.press('Tab');
    expect(await focused()).toEqual({ label: 'Password', outline: 'solid' });
    await page.keyboard.press('Tab');
    expect(await focused()).toEqual({ label: 'Sign in', outline: 'solid' });

    await signIn('planner@example.org', 'not-the-password');
    const alert = page.getByRole('alert');
    await alert.waitFor();
    expect(await alert.textContent()).toMatch(/wrong e-mail or password/i);
    expect(new URL(page.url()).pathname).toBe('/sign-in');

    // the form's own rules run before anything is sent
    await page.getByLabel('Password', { exact: true }).fill('');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('enter your password').waitFor();
    await session.screenshot('sign-in-wrong-password');
  });

  it('lets an admin invite a person who sets a password from the mailed link and signs in', async () => {
    const { page } = session;
    const stamp = Date.now().toString(36);
    const email = `new-engineer-${stamp}@example.org`;
    const name = `Rosa Ekwueme ${stamp}`;
    const password = 'orbital-night-work-42';

    await session.goto('/people');
    await page.waitForURL('**/sign-in?redirectTo=%2Fpeople');
    await signIn('admin@example.org', DEMO_PASSWORD);
    await page.getByRole('heading', { level: 1, name: 'People' }).waitFor();
    const nav = page.getByRole('navigation', { name: 'Main' });
    expect(await nav.getByRole('link').allTextContents()).toEqual([
      'Home',
      'Stations',
      'Plans',
      'Walkthroughs',
      'People',
      'Mailbox',
    ]);
    await page.getByRole('row').filter({ hasText: 'planner@example.org' }).waitFor();

    await page.getByRole('button', { name: 'Invite a person' }).click();
    const dialog = page.getByRole('dialog', { name: 'Invite a person' });
    await dialog.getByLabel('Name').fill(name);
    await dialog.getByLabel('E-mail').fill(email);
    await dialog.getByLabel('Role').selectOption('engineer');
    await dialog.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByText(`Invitation sent to ${email}`).waitFor();
    const row = page.getByRole('row').filter({ hasText: email });
    await row.getByText('Invite pending').waitFor();
    expect(await row.getByRole('combobox').inputValue()).toBe('engineer');
    await session.screenshot('people');

    // inviting the same address again is refused with the server's reason
    session.expectHttpError('/api/users/invite', 409);
    await page.getByRole('button', { name: 'Invite a person' }).click();
    await dialog.getByLabel('Name').fill(name);
    await dialog.getByLabel('E-mail').fill(email);
    await dialog.getByRole('button', { name: 'Send invitation' }).click();
    await dialog.getByRole('alert').waitFor();
    expect(await dialog.getByRole('alert').textContent()).not.toBe('');
    await dialog.getByRole('button', { name: 'Cancel' }).click();

    await nav.getByRole('link', { name: 'Mailbox' }).click();
    await page.getByRole('heading', { level: 1, name: 'Mailbox' }).waitFor();
    const message = page.getByRole('article');
    await message.getByText(email).waitFor();
    expect(await message.getByRole('heading').textContent()).toMatch(/invit/i);
    const link = message.getByRole('link', { name: /\/set-password\?token=/ });
    const href = await link.getAttribute('href');
    expect(href && new URL(href).origin).toBe(session.baseURL);
    await session.screenshot('mailbox');

    await link.click();
    await page.waitForURL('**/set-password?token=*');
    await page.getByText(email).waitFor();
    await page.getByLabel('New password').fill('short');
    await page.getByLabel('Repeat the password').fill('short');
    await page.getByRole('button', { name: 'Set password and sign in' }).click();
    await page.getByText('use at least 10 characters').waitFor();
    await page.getByLabel('New password').fill(password);
    await page.getByLabel('Repeat the password').fill(password);
    await session.screenshot('set-password');
    await page.getByRole('button', { name: 'Set password and sign in' }).click();
    await page.getByRole('heading', { level: 1, name: `Welcome, ${name}` }).waitFor();

    await signOut();
    await signIn(email, password);
    await page.getByRole('heading', { level: 1, name: `Welcome, ${name}` }).waitFor();
    const actions = await page
      .getByRole('list', { name: 'Your permissions' })
      .getByRole('listitem')
      .allTextContents();
    expect(actions).toEqual(ROLE_PERMISSIONS.engineer.map((p) => PERMISSIONS[p]));

    // the link is spent once used
    session.expectHttpError(/^\/api\/auth\/invitations\//, 404);
    await session.goto(new URL(href!).pathname + new URL(href!).search);
    await page.getByText('The invitation has expired or was already used').waitFor();
  });
});
