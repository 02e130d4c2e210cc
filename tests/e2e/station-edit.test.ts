import { request, type APIRequestContext } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import type { StationGraph, StationSummary } from '@shared/schemas/station-edits';
import { type BrowserSession, openBrowserPerTest, signInAs, DEMO_PASSWORD } from './browser';

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

const signIn = (role: string) => signInAs(session, role);

/** A second person's session, straight against the API: the "someone else" of a stale edit. */
async function apiAs(role: string): Promise<APIRequestContext> {
  const api = await request.newContext({ baseURL: session.baseURL });
  const res = await api.post('/api/auth/sign-in', {
    data: { email: `${role}@example.org`, password: DEMO_PASSWORD },
  });
  expect(res.status()).toBe(200);
  return api;
}

async function kestrel(api: APIRequestContext): Promise<StationSummary> {
  const stations = (await (await api.get('/api/stations')).json()) as StationSummary[];
  const station = stations.find((s) => s.name === 'Kestrel Station');
  if (!station) throw new Error('the demo station is not seeded');
  return station;
}

const graphOf = async (api: APIRequestContext, id: number) =>
  (await (await api.get(`/api/stations/${id}/graph`)).json()) as StationGraph;

async function openStation(id: number) {
  const { page } = session;
  await session.goto(`/stations/${id}`);
  await page.getByTestId('station-scene').waitFor();
}

async function selectFromList(key: string) {
  const { page } = session;
  await page.getByLabel('Find a node').fill(key);
  await page
    .getByRole('option', { name: new RegExp(`^${key}\\b`) })
    .first()
    .click();
}

/** The engineer on Kestrel Station with the Edit tab's "Add node" section open. */
async function openAddNodeAsEngineer() {
  const { page } = session;
  await signIn('engineer');
  const api = await apiAs('engineer');
  const station = await kestrel(api);
  await openStation(station.id);
  await page.getByRole('tab', { name: 'Edit' }).click();
  await page.locator('summary', { hasText: 'Add node' }).click();
  return { api, station, add: page.getByRole('form', { name: 'Add node' }) };
}

describe('station edit mode', () => {
  it('lets the engineer add a node by numbers, see it in the list and details, and move it', async () => {
    const { page } = session;
    const { api, station, add } = await openAddNodeAsEngineer();
    await add.getByLabel('Kind').selectOption('anchor');
    const key = await add.getByLabel('Key').inputValue();
    // the next free anchor key on the first segment
    expect(key).toMatch(/^[A-Z0-9]+-A\d{2,}$/);
    expect((await graphOf(api, station.id)).nodes.map((n) => n.key)).not.toContain(key);
    await add.getByLabel('Label').fill('Added in the browser');
    await add.getByLabel('x (m)').fill('-20.25');
    await add.getByLabel('y (m)').fill('1.5');
    await add.getByLabel('z (m)').fill('0.5');
    await expect(add.getByText('4.92 ft').first().isVisible()).resolves.toBe(true);
    await session.screenshot('station-edit-add-node');
    await add.getByRole('button', { name: 'Add node' }).click();
    await page.getByText(`Saved: add node ${key}`).waitFor();

    const added = (await graphOf(api, station.id)).nodes.find((n) => n.key === key);
    expect(added).toMatchObject({
      kind: 'anchor',
      label: 'Added in the browser',
      position: [-20.25, 1.5, 0.5],
    });

    // the new node is selected: the Edit tab shows it, the list and the Details tab know it
    const change = page.getByRole('form', { name: `Change node ${key}` });
    await change.waitFor();
    await change.getByRole('button', { name: 'x plus 0.1 m' }).click();
    await change.getByRole('button', { name: 'x plus 0.1 m' }).click();
    await change.getByRole('button', { name: 'z minus 0.1 m' }).click();
    await change.getByRole('button', { name: 'Save node' }).click();
    await page.getByText(`Saved: change node ${key}`).waitFor();
    const moved = (await graphOf(api, station.id)).nodes.find((n) => n.key === key);
    expect(moved?.position).toEqual([-20.05, 1.5, 0.4]);

    await page.getByRole('tab', { name: 'Details' }).click();
    await selectFromList(key);
    await page.getByRole('tabpanel').getByText('Added in the browser').first().waitFor();
    await page.getByRole('tab', { name: 'Edit' }).click();
    await page.getByRole('list', { name: 'Recent edits' }).getByText(key).first().waitFor();
    await session.screenshot('station-edit-moved');
    await api.dispose();
  });

  it('picks a point on the truss to place a new node, snapped to the face', async () => {
    const { page } = session;
    const { api, station, add } = await openAddNodeAsEngineer();
    await add.getByRole('button', { name: 'Pick a point on the truss' }).click();
    const canvas = page.getByTestId('station-scene').locator('canvas');
    const box = (await canvas.boundingBox())!;
    // the fitted view has the truss across the middle of the canvas
    for (const dx of [0, -0.1, 0.1, -0.2, 0.2]) {
      await canvas.click({ position: { x: box.width * (0.5 + dx), y: box.height * 0.5 } });
      if (await add.getByText(/Snapped to a face of/).isVisible()) break;
    }
    await add.getByText(/Snapped to a face of (\S+)/).waitFor({ timeout: 5000 });
    const segmentKey = /of (\S+?);/.exec(
      (await add.getByText(/Snapped to a face of/).textContent()) ?? '',
    )?.[1];
    const segment = (await graphOf(api, station.id)).segments.find((s) => s.key === segmentKey);
    expect(segment).toBeDefined();
    const position = await Promise.all(
      ['x (m)', 'y (m)', 'z (m)'].map(async (l) => Number(await add.getByLabel(l).inputValue())),
    );
    // on the face: one coordinate at the box's half size from its centre, the others within it
    const offsets = position.map((p, i) => Math.abs(p - segment!.center[i]) - segment!.size[i] / 2);
    expect(Math.max(...offsets)).toBeCloseTo(0, 2);
    expect(offsets.every((o) => o <= 0.002)).toBe(true);
    expect(await add.getByLabel('Key').inputValue()).toMatch(new RegExp(`^${segmentKey}-A\\d{2,}$`));
    await session.screenshot('station-edit-picked');
    await api.dispose();
  });

  it('refuses a stale edit with a clear message and overwrites nothing', async () => {
    const { page } = session;
    await signIn('engineer');
    const other = await apiAs('admin');
    const station = await kestrel(other);
    // a node of this test's own, so the demo model other tests read keeps its labels
    const target = {
      key: `E2E-J${Date.now() % 100000}`,
      kind: 'junction' as const,
      position: [0, 5, 5] as const,
    };
    const created = await other.post(`/api/stations/${station.id}/nodes`, {
      data: { version: (await graphOf(other, station.id)).station.version, node: target },
    });
    expect(created.status()).toBe(201);
    await openStation(station.id);

    await page.getByRole('tab', { name: 'Edit' }).click();
    await selectFromList(target.key);
    const change = page.getByRole('form', { name: `Change node ${target.key}` });
    await change.getByLabel('Label').fill('Engineer’s label');

    // someone else changes the station between the load and the save
    const before = await graphOf(other, station.id);
    const res = await other.patch(`/api/stations/${station.id}/nodes/${target.key}`, {
      data: { version: before.station.version, node: { label: 'Admin’s label' } },
    });
    expect(res.status()).toBe(200);
    const now = before.station.version + 1;

    session.expectHttpError(`/api/stations/${station.id}/nodes/${target.key}`, 409);
    await change.getByRole('button', { name: 'Save node' }).click();
    const alert = page.getByRole('alert').filter({ hasText: 'Your change was not saved' });
    await alert.waitFor();
    expect(await alert.textContent()).toContain(
      `Someone else changed the station (now version ${now}, by Ada Okafor). Your change was not saved.`,
    );
    await session.screenshot('station-edit-conflict');
    const after = await graphOf(other, station.id);
    expect(after.station.version).toBe(now);
    expect(after.nodes.find((n) => n.key === target.key)?.label).toBe('Admin’s label');

    await alert.getByRole('button', { name: 'Reload the model' }).click();
    await expect
      .poll(async () =>
        page
          .getByRole('form', { name: `Change node ${target.key}` })
          .getByLabel('Label')
          .inputValue(),
      )
      .toBe('Admin’s label');
    await other.dispose();
  });

  it('shows no Edit tab to a viewer', async () => {
    const { page } = session;
    await signIn('viewer');
    const api = await apiAs('viewer');
    const station = await kestrel(api);
    await openStation(station.id);
    await page.getByRole('tab', { name: 'Details' }).waitFor();
    expect(await page.getByRole('tab', { name: 'Edit' }).count()).toBe(0);
    expect(await page.getByRole('form', { name: 'Add node' }).count()).toBe(0);
    await api.dispose();
  });
});
