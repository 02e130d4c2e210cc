import { request, type APIRequestContext, type Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import type { StationGraph, StationSummary } from '@shared/schemas/station-edits';
import {
  type BrowserSession,
  framesDrawn,
  openBrowserPerTest,
  sceneSettled,
  signInAs,
  DEMO_PASSWORD,
} from './browser';

const WORKSITES = ['SB3-W01', 'PB2-W01', 'SB1-W01'];

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

const signIn = (role: string) => signInAs(session, role);

async function apiAs(role: string): Promise<APIRequestContext> {
  const api = await request.newContext({ baseURL: session.baseURL });
  const res = await api.post('/api/auth/sign-in', {
    data: { email: `${role}@example.org`, password: DEMO_PASSWORD },
  });
  expect(res.status()).toBe(200);
  return api;
}

/** A copy of the demo station under its own name, so accepting sockets leaves the demo as other tests expect it. */
async function copyOfKestrel(api: APIRequestContext, name: string): Promise<StationSummary> {
  const stations = (await (await api.get('/api/stations')).json()) as StationSummary[];
  const demo = stations.find((s) => s.name === 'Kestrel Station');
  if (!demo) throw new Error('the demo station is not seeded');
  const doc = await (await api.get(`/api/stations/${demo.id}/export`)).json();
  const res = await api.post('/api/stations/import', {
    multipart: {
      file: {
        name: 'copy.json',
        mimeType: 'application/json',
        buffer: Buffer.from(JSON.stringify({ ...doc, name })),
      },
    },
  });
  expect(res.status()).toBe(201);
  return ((await res.json()) as { station: StationSummary }).station;
}

/**
 * What the 3D canvas shows (the scene keeps its drawing buffer), counted in the page: how many
 * distinct colours, and how many pixels of the new-socket glyph's orange hue (about 27°), which
 * nothing in the model itself uses. Only the counts cross to the test: the pixels themselves are
 * megabytes of JSON.
 */
async function canvasColours(page: Page): Promise<{ distinct: number; orange: number }> {
  return page
    .getByTestId('station-scene')
    .locator('canvas')
    .first()
    .evaluate((canvas: HTMLCanvasElement) => {
      const off = document.createElement('canvas');
      off.width = canvas.width;
      off.height = canvas.height;
      const ctx = off.getContext('2d')!;
      ctx.drawImage(canvas, 0, 0, off.width, off.height);
      const px = ctx.getImageData(0, 0, off.width, off.height).data;
      const seen = new Set<number>();
      let orange = 0;
      for (let i = 0; i < px.length; i += 4) {
        const [r, g, b] = [px[i], px[i + 1], px[i + 2]];
        seen.add((r << 16) | (g << 8) | b);
        const max = Math.max(r, g, b);
        const min = Math.min(r, g, b);
        if (max < 110 || max - min < 0.5 * max || max !== r) continue;
        const hue = (60 * (g - b)) / (max - min);
        if (hue >= 15 && hue <= 45) orange++;
      }
      return { distinct: seen.size, orange };
    });
}

describe('socket planner', () => {
  it('lets an engineer plan new sockets for three worksites on a grid, see the envelopes, accept them and find them on the station', async () => {
    const { page } = session;
    const api = await apiAs('engineer');
    const station = await copyOfKestrel(api, 'Kestrel Station (socket planning copy)');
    await signIn('engineer');
    await session.goto(`/stations/${station.id}/sockets`);
    await page.getByRole('heading', { level: 1, name: 'Socket planner' }).waitFor();
    const scene = page.getByTestId('station-scene');
    await scene.locator('canvas').waitFor();
    await sceneSettled(page);
    const before = await canvasColours(page);
    expect(before.distinct, 'the model is drawn').toBeGreaterThan(20);

    for (const key of WORKSITES) await page.getByRole('checkbox', { name: new RegExp(`^${key}\\b`) }).check();
    // new sockets only: leave the existing ones out and plan on a 1 m grid over the truss faces
    await page.getByText(/^Candidate sockets \(/).click();
    await page.getByRole('button', { name: 'None', exact: true }).click();
    await page.getByRole('checkbox', { name: 'Add grid candidates over truss faces' }).check();
    await page.getByLabel('Grid spacing', { exact: true }).fill('1');
    const framesBeforePlan = await framesDrawn(scene);
    await page.getByRole('button', { name: 'Plan sockets for 3 targets' }).click();

    const result = page.getByRole('region', { name: 'Socket plan' });
    await result.getByText(/^3 sockets for 3 targets: 0 existing, 3 new$/).waitFor();
    await result.getByText(/^exact: the fewest sockets among \d+ candidates\.$/).waitFor();
    const rows = result.getByRole('table').getByRole('row');
    await expect(rows.count()).resolves.toBe(4);
    for (const key of WORKSITES) {
      const row = rows.filter({ hasText: key });
      await expect(row.getByRole('cell').nth(1).textContent()).resolves.toMatch(/^New [123]$/);
      await expect(row.getByRole('cell').nth(3).textContent()).resolves.toBe('Yes');
      await expect(row.getByRole('cell').nth(4).textContent()).resolves.toMatch(/^-?\d+\.\d° \/ -?\d+°$/);
    }
    await sceneSettled(page, framesBeforePlan);
    await session.screenshot('socket-planner-result');
    const after = await canvasColours(page);
    expect(after.distinct).toBeGreaterThan(20);
    // framed on one new socket, its glyph and envelope fill part of the view
    const framesBeforeFraming = await framesDrawn(scene);
    await result.getByRole('button', { name: 'Show New 1' }).click();
    await sceneSettled(page, framesBeforeFraming);
    await session.screenshot('socket-planner-framed');
    const framed = await canvasColours(page);
    console.info(
      `orange pixels before ${before.orange}, whole plan ${after.orange}, framed ${framed.orange}`,
    );
    expect(framed.orange, 'the new-socket glyph is drawn').toBeGreaterThan(before.orange + 100);
    await result.getByRole('button', { name: 'Show all' }).click();
    await page.getByRole('img', { name: 'Restraint yaw and pitch' }).waitFor();
    await page.getByLabel('Planning caution').first().waitFor();
    await session.screenshot('socket-planner-result');

    // asked first: what would be added, named after the bays, each joined to a handrail node
    await result.getByRole('button', { name: 'Accept 3 new sockets…' }).click();
    const toAdd = result.getByRole('table', { name: 'Sockets to add' });
    await toAdd.waitFor();
    const addRows = toAdd.locator('tbody tr');
    await expect(addRows.count()).resolves.toBe(3);
    const unchanged = (await (await api.get(`/api/stations/${station.id}/graph`)).json()) as StationGraph;
    const kindOf = new Map(unchanged.nodes.map((n) => [n.key, n.kind]));
    for (const row of await addRows.all()) {
      const [key, label, joined] = await row.getByRole('cell').allTextContents();
      expect(key).toMatch(/^[PS]B\d-S\d{2}$/);
      expect(label).toMatch(
        /^(Port|Starboard) bay \d (zenith|nadir|fore|aft|port|starboard) foot restraint socket \(planned\)$/,
      );
      expect(['junction', 'anchor']).toContain(kindOf.get(joined.split(' ')[0]));
    }
    expect(unchanged.station.version, 'nothing is written before the confirm').toBe(station.version);
    await session.screenshot('socket-planner-confirm');
    await result.getByRole('button', { name: 'Add 3 sockets' }).click();
    const success = result.getByText(/^Added 3 sockets \(station version \d+\)$/);
    await success.waitFor();
    const links = result.getByRole('link', { name: /^[PS]B\d-S\d{2}$/ });
    await expect(links.count()).resolves.toBe(3);
    const keys = await links.allTextContents();
    await session.screenshot('socket-planner-accepted');

    // the model now has them, each joined to the handrail network by a hop
    const graph = (await (await api.get(`/api/stations/${station.id}/graph`)).json()) as StationGraph;
    for (const key of keys) {
      expect(graph.nodes.find((n) => n.key === key)?.kind).toBe('socket');
      expect(graph.edges.some((e) => e.kind === 'hop' && (e.from === key || e.to === key))).toBe(true);
    }

    // and the Station screen lists them
    await links.first().click();
    await page.waitForURL(`**/stations/${station.id}?node=${keys[0]}`);
    await page.getByTestId('station-scene').waitFor();
    // the linked socket is selected; every new socket is a node of the station now
    await page.getByRole('tabpanel').getByText(keys[0], { exact: true }).first().waitFor();
    for (const key of keys) {
      await page.getByLabel('Find a node').fill(key);
      await page.getByRole('option', { name: new RegExp(`^${key}\\b`) }).waitFor();
    }
    await session.screenshot('socket-planner-station');
    await api.dispose();
  }, 240_000);

  it('shows a viewer the plan but no Accept', async () => {
    const { page } = session;
    const api = await apiAs('admin');
    const stations = (await (await api.get('/api/stations')).json()) as StationSummary[];
    const demo = stations.find((s) => s.name === 'Kestrel Station')!;
    await signIn('viewer');
    await session.goto(`/stations/${demo.id}/sockets`);
    await page.getByRole('checkbox', { name: /^CB-W01\b/ }).check();
    await page.getByRole('checkbox', { name: 'Add grid candidates over truss faces' }).check();
    await page.getByRole('button', { name: 'Plan sockets for 1 target' }).click();
    const result = page.getByRole('region', { name: 'Socket plan' });
    await result.getByText(/^1 socket for 1 target/).waitFor();
    await expect(result.getByRole('button', { name: /^Accept/ }).count()).resolves.toBe(0);
    await api.dispose();
  });
});
