import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { StationGraph, StationSummary } from '@shared/schemas/station-edits';
import { countDrawCalls } from '@/features/scene-3d/builders/draw-calls';
import { buildStationObjects } from '@/features/scene-3d/builders/station-objects';
import { BOOM_DRAW_CALLS } from '@/components/scene/boom-pose';
import { buildStationDocument } from '../factories/station-document';
import { type BrowserSession, openBrowserPerTest, signInAs } from './browser';

const DRAW_CALL_TARGET = 40;

let session: BrowserSession;

openBrowserPerTest((s) => (session = s));

const signIn = (role: string) => signInAs(session, role);

/** The signed-in page's own fetch, so the test compares with what the server holds right now. */
async function apiGet<T>(pathname: string): Promise<T> {
  return session.page.evaluate(async (p) => (await fetch(p)).json(), pathname) as Promise<T>;
}

const scene = () => session.page.getByTestId('station-scene');

/** Waits until the canvas has drawn a frame since `after` frames. */
async function frameAfter(after: number) {
  await session.page.waitForFunction(
    (n) =>
      Number(document.querySelector<HTMLElement>('[data-testid="station-scene"]')?.dataset.frames ?? 0) > n,
    after,
    { timeout: 30_000 },
  );
}

const frames = async () => Number((await scene().getAttribute('data-frames')) ?? 0);
const liveCalls = async () => Number(await scene().getAttribute('data-draw-calls'));
const modelCalls = async () => Number(await scene().getAttribute('data-model-draw-calls'));

/**
 * Pixels of the WebGL canvas that differ from the scene background, read back in the page (the
 * canvas keeps its drawing buffer) and counted on a 2D canvas.
 */
async function litPixels(): Promise<{ lit: number; total: number }> {
  return session.page.evaluate(async () => {
    const gl = document.querySelector<HTMLCanvasElement>('[data-testid="station-scene"] canvas')!;
    const img = new Image();
    img.src = gl.toDataURL('image/png');
    await img.decode();
    const c = document.createElement('canvas');
    c.width = img.width;
    c.height = img.height;
    const ctx = c.getContext('2d')!;
    ctx.drawImage(img, 0, 0);
    const { data } = ctx.getImageData(0, 0, c.width, c.height);
    const bg = [data[0], data[1], data[2]];
    let lit = 0;
    for (let i = 0; i < data.length; i += 4) {
      if (Math.abs(data[i] - bg[0]) + Math.abs(data[i + 1] - bg[1]) + Math.abs(data[i + 2] - bg[2]) > 40)
        lit++;
    }
    return { lit, total: data.length / 4 };
  });
}

async function openKestrel(): Promise<StationGraph> {
  const { page } = session;
  await session.goto('/stations');
  await page.getByRole('heading', { level: 1, name: 'Stations' }).waitFor();
  await page
    .getByRole('table', { name: 'Stations' })
    .getByRole('link', { name: 'Kestrel Station', exact: true })
    .click();
  await scene().waitFor();
  await frameAfter(0);
  const stations = await apiGet<StationSummary[]>('/api/stations');
  const id = stations.find((s) => s.name === 'Kestrel Station')!.id;
  return apiGet<StationGraph>(`/api/stations/${id}/graph`);
}

/** The drawn tags' boxes the scene reports, and how many of its tags it drew. */
async function drawnLabels() {
  const rects = JSON.parse((await scene().getAttribute('data-label-rects')) ?? '[]') as number[][];
  const [drawn, all] = ((await scene().getAttribute('data-labels')) ?? '0/0').split('/').map(Number);
  return { rects, drawn, all };
}

const touching = (a: number[], b: number[]) =>
  a[0] < b[0] + b[2] && b[0] < a[0] + a[2] && a[1] < b[1] + b[3] && b[1] < a[1] + a[3];

async function canvasShare(): Promise<number> {
  const box = await scene().locator('canvas').boundingBox();
  const view = session.page.viewportSize()!;
  return (box!.width * box!.height) / (view.width * view.height);
}

describe('station view: 3D model, selection, layers, tables and import', () => {
  it('gives the window to the 3D view: panels beside it fold, tables in a drawer, labels never on top of each other', async () => {
    const { page } = session;
    await page.setViewportSize({ width: 1440, height: 900 });
    await signIn('engineer');
    const graph = await openKestrel();
    const share = await canvasShare();
    console.info(`station canvas share at 1440x900: ${(share * 100).toFixed(1)} %`);
    expect(share, 'share of a 1440 x 900 window the 3D view covers').toBeGreaterThanOrEqual(0.55);
    // the page itself does not scroll: the workspace fits the window
    expect(await page.evaluate(() => document.documentElement.scrollHeight)).toBeLessThanOrEqual(900);

    const labelsOk = async () => {
      const { rects, drawn } = await drawnLabels();
      expect(rects.length).toBe(drawn);
      for (let i = 0; i < rects.length; i++)
        for (let j = i + 1; j < rects.length; j++)
          expect(touching(rects[i], rects[j]), `labels ${i} and ${j} overlap`).toBe(false);
    };
    await labelsOk();
    await session.screenshot('station-1440');

    // a selection from the finder is framed and its label drawn first
    const worksite = graph.nodes.find((n) => n.kind === 'worksite')!;
    let before = await frames();
    const search = page.getByLabel('Find a node');
    await search.fill(worksite.key);
    await search.press('Enter');
    await expect.poll(() => scene().getAttribute('data-selected')).toBe(`node:${worksite.key}`);
    await frameAfter(before);
    await labelsOk();
    const framed = await drawnLabels();
    expect(framed.drawn).toBeGreaterThan(0);
    // the list folds away once the focus leaves the finder, giving the model back
    await search.press('Escape');
    await expect(page.getByRole('listbox', { name: 'Nodes' }).isVisible()).resolves.toBe(false);

    // folding the side panel widens the view; unfolding brings the tabs back
    const open = await canvasShare();
    await page.getByRole('button', { name: 'Hide selection and tools' }).click();
    await expect.poll(canvasShare).toBeGreaterThan(open + 0.1);
    await page.getByRole('button', { name: 'Show selection and tools' }).click();
    await page.getByRole('tab', { name: 'Details' }).waitFor();

    // the tables open in a drawer under the view, which stays on screen
    await page.getByRole('button', { name: /^Tables/ }).click();
    const tables = page.getByRole('region', { name: 'Tables' });
    await tables.getByRole('table', { name: 'Nodes' }).waitFor();
    expect(await canvasShare()).toBeGreaterThan(0.25);
    await tables.getByRole('button', { name: 'Close tables' }).click();

    await page.setViewportSize({ width: 1024, height: 768 });
    before = await frames();
    await page.getByRole('button', { name: 'Fit to view' }).click();
    await frameAfter(before);
    await labelsOk();
    console.info(`station canvas share at 1024x768: ${((await canvasShare()) * 100).toFixed(1)} %`);
    await session.screenshot('station-1024');
  });

  it('draws Kestrel Station in few draw calls, selects a node from the list and hides glyph layers', async () => {
    const { page } = session;
    await signIn('engineer');
    const graph = await openKestrel();

    const blank = await litPixels();
    expect(blank.lit / blank.total, 'share of the canvas showing the model').toBeGreaterThan(0.02);

    // the browser's renderer agrees with the builders run here in Node (the benchmark's count)
    const expected = countDrawCalls(buildStationObjects(graph).root).drawCalls;
    expect(await modelCalls()).toBe(expected);
    const live = await liveCalls();
    expect(live).toBeGreaterThanOrEqual(expected);
    // the model's budget, and a fixed few per robotic arm (each boom is its own small group)
    expect(live).toBeLessThanOrEqual(DRAW_CALL_TARGET + BOOM_DRAW_CALLS * graph.arms.length);
    await session.screenshot('station-view');

    // keyboard: search the list, arrow down to the second match, Enter selects it
    const anchors = graph.nodes
      .filter((n) => n.kind === 'anchor')
      .map((n) => n.key)
      .sort();
    const prefix = anchors[0].split('-')[0];
    const matches = graph.nodes.filter(
      (n) =>
        n.key.toLowerCase().includes(prefix.toLowerCase()) ||
        n.label?.toLowerCase().includes(prefix.toLowerCase()),
    );
    const search = page.getByLabel('Find a node');
    await search.fill(prefix);
    await search.press('ArrowDown');
    await search.press('Enter');
    const chosen = matches[1];
    const details = page.getByRole('tabpanel');
    await details.getByText(chosen.key, { exact: true }).first().waitFor();
    await expect(details.getByText('Position (ft)').isVisible()).resolves.toBe(true);
    const degree = graph.edges.filter((e) => e.from === chosen.key || e.to === chosen.key).length;
    await expect(details.getByText(`Edges (${degree})`).isVisible()).resolves.toBe(true);
    // highlighted in 3D: the scene holds the selection (its cage and label are drawn in the canvas)
    await expect.poll(() => scene().getAttribute('data-selected')).toBe(`node:${chosen.key}`);
    await expect(
      page.getByRole('option', { name: new RegExp(`^${chosen.key}\\b`) }).getAttribute('aria-selected'),
    ).resolves.toBe('true');
    await session.screenshot('station-view-selected');

    // layer toggles: every node kind off leaves fewer draw calls and fewer lit pixels
    const kinds = new Set(graph.nodes.map((n) => n.kind));
    let before = await frames();
    await page.getByRole('button', { name: 'Oblique' }).click();
    await frameAfter(before);
    const withGlyphs = await litPixels();
    const callsWithGlyphs = await liveCalls();
    await page.getByRole('button', { name: /^Layers/ }).click();
    for (const label of ['Airlocks', 'Junctions', 'Anchors', 'Sockets', 'Worksites']) {
      const toggle = page.getByRole('group', { name: 'Nodes layers' }).getByRole('button', { name: label });
      await toggle.click();
      await expect(toggle.getAttribute('aria-pressed')).resolves.toBe('false');
    }
    before = await frames();
    await page.getByRole('button', { name: 'Oblique' }).click();
    await frameAfter(before);
    await page.keyboard.press('Escape');
    expect(await modelCalls()).toBe(expected - kinds.size);
    expect(await liveCalls()).toBeLessThan(callsWithGlyphs);
    const withoutGlyphs = await litPixels();
    expect(withoutGlyphs.lit).toBeLessThan(withGlyphs.lit);
    await session.screenshot('station-view-no-glyphs');
  });

  it('filters the node table by key and shows an edge from a row', async () => {
    const { page } = session;
    await signIn('viewer');
    const graph = await openKestrel();
    await page.getByRole('button', { name: /^Tables/ }).click();
    const tables = page.getByRole('region', { name: 'Tables' });
    const key = graph.nodes.find((n) => n.kind === 'worksite')!.key;
    const expected = graph.nodes.filter((n) => n.key.toLowerCase().includes(key.toLowerCase()));
    await tables.getByLabel('Search by key').fill(key);
    await tables.getByText(`${expected.length} of ${graph.nodes.length} shown`).waitFor();
    const rows = tables.getByRole('table', { name: 'Nodes' }).locator('tbody tr');
    expect(await rows.count()).toBe(expected.length);
    for (const text of await rows.locator('td:first-child').allTextContents())
      expect(text.toLowerCase()).toContain(key.toLowerCase());
    await rows.first().getByRole('button').click();
    await page.getByRole('tabpanel').getByText(expected[0].key, { exact: true }).first().waitFor();

    await tables.getByRole('tab', { name: /^Edges/ }).click();
    await tables.getByLabel('Kind').selectOption('ride');
    const rides = graph.edges.filter((e) => e.kind === 'ride');
    await tables.getByText(`${rides.length} of ${graph.edges.length} shown`).waitFor();
    await page.getByRole('tab', { name: /^Details/ }).waitFor();
    await tables.locator('tbody tr').first().getByRole('button').click();
    await page.getByRole('tabpanel').first().getByText('Length').waitFor();
    await tables.scrollIntoViewIfNeeded();
    await session.screenshot('station-table');
  });

  it('lets the engineer import a new station and see its counts, and lists every problem of a bad file', async () => {
    const { page } = session;
    await signIn('engineer');
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tw-import-'));
    const name = `Import check ${Date.now()}`;
    const doc = buildStationDocument({ name });
    const good = path.join(dir, 'good.station.json');
    fs.writeFileSync(good, JSON.stringify(doc));
    const badDoc = buildStationDocument({ name: 'Broken' });
    badDoc.nodes = [...badDoc.nodes, { ...badDoc.nodes[0] }];
    badDoc.edges = [...badDoc.edges, { from: 'NOPE-1', to: badDoc.nodes[0].key, kind: 'handrail' }];
    const bad = path.join(dir, 'bad.station.json');
    fs.writeFileSync(bad, JSON.stringify(badDoc));

    await session.goto('/stations');
    await page.getByRole('heading', { level: 1, name: 'Stations' }).waitFor();
    await page.getByRole('button', { name: 'Import a station' }).click();
    const dialog = page.getByRole('dialog', { name: 'Import a station' });

    session.expectHttpError('/api/stations/import', 400);
    await dialog.getByLabel('Station document').setInputFiles(bad);
    await dialog.getByRole('button', { name: 'Import station' }).click();
    const problems = dialog.getByRole('list', { name: 'Import problems' });
    await problems.waitFor();
    const text = (await problems.allTextContents()).join('\n');
    expect(text).toContain(`nodes[${badDoc.nodes.length - 1}].key`);
    expect(text).toContain(`edges[${badDoc.edges.length - 1}].from`);
    await session.screenshot('station-import-problems');

    await dialog.getByLabel('Station document').setInputFiles(good);
    await dialog.getByRole('button', { name: 'Import station' }).click();
    await dialog.getByText(`Imported “${name}”`).waitFor();
    const counts = dialog.getByLabel('Imported counts');
    await expect(counts.getByTestId('count-nodes').textContent()).resolves.toBe(String(doc.nodes.length));
    await expect(counts.getByTestId('count-edges').textContent()).resolves.toBe(String(doc.edges.length));
    await expect(counts.getByTestId('count-hazards').textContent()).resolves.toBe(
      String(doc.hazards!.length),
    );
    await expect(counts.getByTestId('count-segments').textContent()).resolves.toBe(
      String(doc.segments!.length),
    );
    await session.screenshot('station-import-done');

    await dialog.getByRole('link', { name: `Open ${name}` }).click();
    await page.getByRole('heading', { level: 1, name }).waitFor();
    await scene().waitFor();
    await frameAfter(0);
    expect((await litPixels()).lit).toBeGreaterThan(0);
  });
});
