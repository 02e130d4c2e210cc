import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { openBrowserPerTest, SCREENSHOT_DIR, type BrowserSession, DEMO_PASSWORD } from './browser';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

async function signIn(email: string) {
  const { page } = session;
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('button', { name: 'Sign out' }).waitFor();
}

async function signOut() {
  await session.page.getByRole('button', { name: 'Sign out' }).click();
  await session.page.waitForURL('**/sign-in');
}

async function waitSaved() {
  await session.page.locator('[data-save-state="saved"]').waitFor({ timeout: 15_000 });
}

interface GraphNode {
  key: string;
  kind: string;
}

describe('plan: build, time, review and export an EVA plan in the built app', () => {
  it('planner builds a three-task plan on Kestrel Station, planner2 approves it, mails and cue cards follow', async () => {
    const { page } = session;
    const stamp = Date.now().toString(36);
    const title = `Pump swap rehearsal ${stamp}`;

    await session.goto('/plans');
    await page.waitForURL('**/sign-in?redirectTo=%2Fplans');
    await signIn('planner@example.org');
    await page.getByRole('heading', { level: 1, name: 'Plans' }).waitFor();

    const stations = (await (await page.request.get('/api/stations')).json()) as {
      id: number;
      name: string;
    }[];
    const kestrel = stations.find((s) => s.name === 'Kestrel Station');
    expect(kestrel, 'the demo station is seeded').toBeDefined();
    const graph = (await (await page.request.get(`/api/stations/${kestrel!.id}/graph`)).json()) as {
      nodes: GraphNode[];
    };
    const worksites = graph.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);
    expect(worksites.length).toBeGreaterThanOrEqual(3);

    await page.getByRole('button', { name: 'New plan' }).click();
    const create = page.getByRole('dialog', { name: 'New plan' });
    await create.getByLabel('Title').fill(title);
    await create.getByLabel('Station').selectOption(String(kestrel!.id));
    await create.getByLabel('EV1 name').fill('Ada Okonkwo');
    await create.getByLabel('EV2 name').fill('Lars Vinter');
    await create.getByLabel('EV2 tether length').fill('55 ft');
    await create.getByText('= 16.8 m = 55.0 ft').waitFor();
    // the clock starts at orbital sunrise, so the first hour of the EVA is in daylight
    await create.getByLabel('Start: minutes').fill('0');
    await create.getByRole('button', { name: 'Create plan' }).click();
    await page.waitForURL(/\/plans\/\d+$/);
    const planId = Number(new URL(page.url()).pathname.split('/').pop());
    await page.getByRole('heading', { level: 1, name: title }).waitFor();
    const header = page.locator('main header').first();
    expect(await header.textContent()).toContain('Draft');

    const tasks = [
      {
        title: 'Mate pump power connectors',
        worksite: worksites[0],
        crew: 'both',
        duration: '0:20',
        eclipse: true,
      },
      {
        title: 'Inspect radiator hinge',
        worksite: worksites[1],
        crew: 'EV1',
        duration: '45',
        eclipse: false,
      },
      { title: 'Route camera cable', worksite: worksites[2], crew: 'EV2', duration: '1:00', eclipse: false },
    ];
    for (const t of tasks) {
      await page.getByRole('button', { name: 'Add task' }).click();
      const dialog = page.getByRole('dialog', { name: 'Add task' });
      await dialog.getByLabel('Task title').fill(t.title);
      await dialog.getByLabel('Find a worksite').fill(t.worksite);
      await dialog.getByLabel('Worksite', { exact: true }).selectOption(t.worksite);
      await dialog.getByLabel('Crew').selectOption(t.crew);
      await dialog.getByLabel('Duration').fill(t.duration);
      if (t.eclipse) await dialog.getByLabel(/Eclipse-only/).check();
      await dialog.getByRole('button', { name: 'Add task' }).click();
      await dialog.waitFor({ state: 'hidden' });
    }
    const taskList = page.getByRole('list', { name: 'Tasks' });
    expect(await taskList.getByRole('listitem').count()).toBe(3);
    await waitSaved();

    // keyboard reorder: Alt+↓ on the second task moves it to third, and the move is announced
    await page.locator('#plan-task-2').focus();
    await page.keyboard.press('Alt+ArrowDown');
    await page.getByText('Moved task “Inspect radiator hinge” to position 3 of 3.').waitFor();
    expect(await page.locator('#plan-task-3').getAttribute('aria-label')).toContain('Inspect radiator hinge');
    await waitSaved();

    const saved = (await (await page.request.get(`/api/plans/${planId}`)).json()) as {
      tasks: { title: string }[];
      version: number;
    };
    expect(saved.tasks.map((t) => t.title)).toEqual([tasks[0].title, tasks[2].title, tasks[1].title]);

    // the timeline of the saved version: night bands, both lanes, and the eclipse-only warning
    await page.getByText(`Computed for version ${saved.version}`).waitFor({ timeout: 15_000 });
    const timeline = (await (await page.request.get(`/api/plans/${planId}/timeline`)).json()) as {
      nightWindows: unknown[];
      warnings: { code: string }[];
    };
    expect(timeline.nightWindows.length).toBeGreaterThan(0);
    expect(await page.locator('[data-night-band]').count()).toBe(timeline.nightWindows.length);
    expect(timeline.warnings.map((w) => w.code)).toContain('eclipse-only-outside-night');
    const warnings = page.getByRole('list', { name: 'Warnings' });
    await warnings.getByText('Eclipse-only task in daylight').waitFor();
    await warnings.getByText(/next night window it fits is/).waitFor();
    expect(await page.locator('[data-block-type="translate"]').count()).toBeGreaterThan(0);
    expect(await page.locator('[data-block-type="work"]').count()).toBe(4);
    await page.getByRole('complementary', { name: 'Planning caution' }).first().waitFor();

    // focusing a translate block shows its route
    await page.locator('[data-block-type="translate"]').first().focus();
    await page.getByText(/^Whole route: /).waitFor();
    await session.screenshot('plan-editor');
    const timelinePanel = page.locator('#plan-timeline');
    await timelinePanel.screenshot({ path: path.join(SCREENSHOT_DIR, 'plan-timeline.png') });

    // the warning's link focuses the task it concerns
    await warnings.getByRole('button', { name: 'Go to task 1' }).first().click();
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe('plan-task-1');

    await page.getByRole('button', { name: 'Submit for review' }).click();
    await page.getByText('Submitted for review.').waitFor();
    await expect.poll(() => header.textContent()).toContain('In review');
    await page.getByText('Editing is locked').waitFor();
    expect(await page.getByRole('button', { name: 'Add task' }).count()).toBe(0);
    // the author cannot approve their own plan, and is told why
    expect(await page.getByRole('button', { name: 'Approve' }).isDisabled()).toBe(true);
    await page.getByText('You wrote this plan; a planner who did not change it must approve it.').waitFor();
    await signOut();

    await signIn('planner2@example.org');
    await session.goto(`/plans/${planId}`);
    await page.getByRole('heading', { level: 1, name: title }).waitFor();
    await page
      .getByLabel(/Review comment/)
      .fill('Checked the night window; fine to fly once the connector task moves.');
    await page.getByRole('button', { name: 'Approve' }).click();
    await page.getByText('Approved. The author has been e-mailed.').waitFor();
    await page.getByText(/approved by Tomas Reyes/).waitFor();
    const history = page.getByRole('list', { name: 'Review history' });
    expect(await history.getByRole('listitem').count()).toBe(2);
    // the whole page from its top, where the plan's sticky header sits (not over the middle)
    await page.evaluate(() => window.scrollTo(0, 0));
    await session.screenshot('plan-approved');

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('link', { name: /Cue cards \(PDF\)/ }).click(),
    ]);
    const pdfPath = path.join(SCREENSHOT_DIR, 'plan-cue-cards.pdf');
    await download.saveAs(pdfPath);
    const pdf = fs.readFileSync(pdfPath);
    expect(pdf.subarray(0, 4).toString('latin1')).toBe('%PDF');
    expect(pdf.length).toBeGreaterThan(2000);
    const response = await page.request.get(`/api/plans/${planId}/export.pdf`);
    expect(response.headers()['content-type']).toMatch(/^application\/pdf/);
    if (hasTool('pdftotext')) {
      const text = execFileSync('pdftotext', [pdfPath, '-']).toString();
      expect(text).toContain(tasks[0].title);
    }
    if (hasTool('pdftoppm')) {
      execFileSync('pdftoppm', [
        '-png',
        '-r',
        '60',
        '-f',
        '1',
        '-l',
        '1',
        '-singlefile',
        pdfPath,
        path.join(SCREENSHOT_DIR, 'plan-pdf-page1'),
      ]);
    }
    await signOut();

    await signIn('admin@example.org');
    await session.goto('/mailbox');
    await page.getByRole('heading', { level: 1, name: 'Mailbox' }).waitFor();
    // the list shows every message; the one opened is the article
    await page
      .getByRole('button', { name: new RegExp(`Review requested: "${title}"`) })
      .first()
      .waitFor();
    await page.getByRole('button', { name: new RegExp(`Approved: "${title}"`) }).click();
    const mail = page.getByRole('article');
    await mail.getByText('planner@example.org').waitFor();
    expect(await mail.textContent()).toContain('Tomas Reyes has approved your EVA plan');
    await session.screenshot('plan-mailbox');
  });
});

function hasTool(name: string): boolean {
  try {
    execFileSync('which', [name], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
}
