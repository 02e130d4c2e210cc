import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { APIRequestContext } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import type { StationSummary } from '@shared/schemas/station-edits';
import { buildStationDocument } from '../factories/station-document';
import { buildPlanInput } from '../factories/plan';
import { type BrowserSession, openBrowserPerTest, signInAs } from './browser';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

async function kestrel(api: APIRequestContext): Promise<StationSummary> {
  const stations = (await (await api.get('/api/stations')).json()) as StationSummary[];
  const found = stations.find((s) => s.name === 'Kestrel Station');
  if (!found) throw new Error('the demo station is not seeded');
  return found;
}

async function importViaApi(api: APIRequestContext, doc: unknown): Promise<StationSummary> {
  const res = await api.post('/api/stations/import', {
    multipart: {
      file: { name: 'station.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(doc)) },
    },
  });
  expect(res.status()).toBe(201);
  return ((await res.json()) as { station: StationSummary }).station;
}

function tempFile(name: string, content: unknown) {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tw-flows-'));
  const file = path.join(dir, name);
  fs.writeFileSync(file, JSON.stringify(content));
  return file;
}

describe('flows a practitioner needs from the screens', () => {
  it('the engineer reaches the socket planner from the station, is refused deleting a station plans use (with the plans), and deletes an unused one', async () => {
    const { page } = session;
    await signInAs(session, 'engineer');
    const demo = await kestrel(page.request);

    await session.goto(`/stations/${demo.id}`);
    await page.getByTestId('station-scene').waitFor();
    await page.getByRole('link', { name: 'Plan foot-restraint sockets' }).click();
    await page.waitForURL(`**/stations/${demo.id}/sockets`);
    await page.getByRole('button', { name: /^Plan sockets/ }).waitFor();

    await session.goto(`/stations/${demo.id}`);
    await page.getByTestId('station-scene').waitFor();
    session.expectHttpError(`/api/stations/${demo.id}`, 409);
    await page.getByRole('button', { name: 'Delete station…' }).click();
    const ask = page.getByRole('dialog', { name: 'Delete Kestrel Station?' });
    await ask.getByRole('button', { name: 'Delete station' }).click();
    const using = ask.getByRole('list', { name: 'Plans using the station' });
    await using.waitFor();
    expect(await using.textContent()).toContain('External camera boom install (approved)');
    await expect(ask.getByRole('button', { name: 'Delete station' }).count()).resolves.toBe(0);
    await session.screenshot('station-delete-refused');
    await ask.getByRole('button', { name: 'Cancel' }).click();
    expect((await page.request.get(`/api/stations/${demo.id}`)).status()).toBe(200);

    const spare = await importViaApi(page.request, buildStationDocument({ name: `Spare ${Date.now()}` }));
    await session.goto(`/stations/${spare.id}`);
    await page.getByTestId('station-scene').waitFor();
    await page.getByRole('button', { name: 'Delete station…' }).click();
    const confirm = page.getByRole('dialog', { name: `Delete ${spare.name}?` });
    await confirm.getByText('go for good').waitFor();
    await session.screenshot('station-delete-confirm');
    await confirm.getByRole('button', { name: 'Delete station' }).click();
    await page.waitForURL('**/stations');
    await page.getByRole('heading', { level: 1, name: 'Stations' }).waitFor();
    expect((await page.request.get(`/api/stations/${spare.id}`)).status()).toBe(404);
  });

  it('the planner sees the truth about unsaved fields, is asked before leaving, cannot submit an empty plan, and deletes the draft', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signInAs(session, 'planner');
    const demo = await kestrel(page.request);
    const title = `Empty draft ${Date.now().toString(36)}`;
    const created = await page.request.post('/api/plans', {
      data: buildPlanInput(demo.id, { title, tasks: [] }),
    });
    expect(created.status()).toBe(201);
    const plan = (await created.json()) as { id: number };

    await session.goto(`/plans/${plan.id}`);
    const indicator = page.locator('[data-save-state]');
    await page.locator('[data-save-state="saved"]').waitFor();
    const submit = page.getByRole('button', { name: 'Submit for review' });
    expect(await submit.isDisabled()).toBe(true);
    await page.getByText('Add the day’s tasks before submitting the plan.').waitFor();

    const limit = page.getByLabel('Time limit (h:mm)');
    await limit.fill('9:99');
    await page.locator('[data-save-state="invalid"]').waitFor();
    expect(await indicator.textContent()).toContain('Not saved: fix 1 field');
    await page.getByText('Fix the marked field before submitting').waitFor();
    expect(await submit.isDisabled()).toBe(true);
    // the indicator stays in view while the field far down the page is edited
    await limit.scrollIntoViewIfNeeded();
    const box = await indicator.boundingBox();
    expect(box && box.y >= 0 && box.y + box.height <= 900, 'save indicator in view').toBe(true);
    await session.screenshot('plan-unsaved-field');

    // leaving asks first; staying keeps the page and the text typed
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Stations' }).click();
    const leave = page.getByRole('dialog', { name: 'Leave without saving?' });
    await leave.waitFor();
    await session.screenshot('plan-leave-asks');
    await leave.getByRole('button', { name: 'Stay on this page' }).click();
    await leave.waitFor({ state: 'hidden' });
    expect(new URL(page.url()).pathname).toBe(`/plans/${plan.id}`);
    expect(await limit.inputValue()).toBe('9:99');

    await limit.fill('6:15');
    await page.locator('[data-save-state="saved"]').waitFor({ timeout: 15_000 });
    const saved = (await (await page.request.get(`/api/plans/${plan.id}`)).json()) as {
      timeLimitSeconds: number;
      version: number;
    };
    expect(saved.timeLimitSeconds).toBe(6 * 3600 + 15 * 60);

    await page.getByRole('button', { name: 'Delete…' }).click();
    const del = page.getByRole('dialog', { name: `Delete “${title}”?` });
    await del.getByRole('button', { name: 'Delete plan' }).click();
    await page.waitForURL('**/plans');
    await page.getByRole('heading', { level: 1, name: 'Plans' }).waitFor();
    expect((await page.request.get(`/api/plans/${plan.id}`)).status()).toBe(404);
  });

  it('the engineer importing a document whose name is taken is asked: rename, or replace that station after a look at what it touches', async () => {
    const { page } = session;
    await signInAs(session, 'engineer');
    const name = `Twin ${Date.now().toString(36)}`;
    const existing = await importViaApi(page.request, buildStationDocument({ name }));
    const file = tempFile('twin.station.json', buildStationDocument({ name }));

    await session.goto('/stations');
    await page.getByRole('button', { name: 'Import a station' }).click();
    const dialog = page.getByRole('dialog', { name: 'Import a station' });
    await dialog.getByLabel('Station document').setInputFiles(file);
    await dialog.getByRole('button', { name: 'Import station' }).click();
    await dialog.getByText(`A station named “${name}” exists already`).waitFor();
    expect(await dialog.getByLabel("New station's name").inputValue()).toBe(`${name} (2)`);
    const count = ((await (await page.request.get('/api/stations')).json()) as unknown[]).length;
    await session.screenshot('station-import-name-taken');
    await dialog.getByRole('button', { name: `Import as “${name} (2)”` }).click();
    await dialog.getByText(`Imported “${name} (2)”`).waitFor();
    const after = (await (await page.request.get('/api/stations')).json()) as StationSummary[];
    expect(after.length).toBe(count + 1);

    // the same file again, this time replacing the first station's model: asked, then written
    await dialog.getByRole('button', { name: 'Import station' }).click();
    await dialog.getByText(`A station named “${name}” exists already`).waitFor();
    await dialog.getByRole('button', { name: `Replace the model of ${name}…` }).click();
    await dialog.getByText(`Replace the model of ${name} (version ${existing.version})?`).waitFor();
    await dialog.getByText('No plan in review or approved is touched').waitFor();
    await dialog.getByRole('button', { name: 'Replace the model', exact: true }).click();
    await dialog.getByText(`Model of ${name} replaced`).waitFor();
    const replaced = (await (
      await page.request.get(`/api/stations/${existing.id}`)
    ).json()) as StationSummary;
    expect(replaced.version).toBe(existing.version + 1);
  });

  it('replacing the demo model with one that drops a worksite an approved plan uses names that plan first, and Cancel writes nothing', async () => {
    const { page } = session;
    await signInAs(session, 'engineer');
    const demo = await kestrel(page.request);
    const doc = (await (await page.request.get(`/api/stations/${demo.id}/export`)).json()) as ReturnType<
      typeof buildStationDocument
    >;
    const dropped = {
      ...doc,
      nodes: doc.nodes.filter((n) => n.key !== 'PB2-W01'),
      edges: doc.edges.filter((e) => e.from !== 'PB2-W01' && e.to !== 'PB2-W01'),
    };
    const file = tempFile('kestrel-without-boom-site.json', dropped);

    await session.goto(`/stations/${demo.id}`);
    await page.getByTestId('station-scene').waitFor();
    await page.getByRole('button', { name: 'Replace model…' }).click();
    const dialog = page.getByRole('dialog', { name: 'Replace the model of Kestrel Station' });
    await dialog.getByLabel('Station document').setInputFiles(file);
    await dialog.getByRole('button', { name: 'Replace model' }).click();
    await dialog.getByText('This change touches reviewed plans').waitFor();
    const affected = dialog.getByRole('list', { name: 'Affected plans' });
    expect(await affected.textContent()).toContain('External camera boom install (approved)');
    await session.screenshot('station-replace-affected-plans');
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    const after = (await (await page.request.get(`/api/stations/${demo.id}`)).json()) as StationSummary;
    expect(after.version).toBe(demo.version);
  });
});
