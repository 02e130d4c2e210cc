// Opening a station in the browser as a user meets it: a production build served by the real server
// in its own process on loopback, Debian's Chromium (headless, software WebGL, as the browser tests
// run it) signed in as the engineer, and the Station screen opened by URL. For the demo station and
// generated 10k- and 100k-node trusses: the time from navigation to the first 3D frame drawn with
// the model in it, the longest main-thread task meanwhile (what a user feels as a frozen tab), and
// the graph's bytes on the wire. Reference measured in the same run: the graph endpoint's JSON
// (GET …/graph, gzipped as a browser asks for it) beside the compact columnar graph the screen
// reads (GET …/graph/columns), and the time the browser takes to parse each (JSON.parse in the page)
// and to read the columns back into the graph (fromGraphColumns, here in Node's engine). The demo's
// open is the reference for the rest: software WebGL compiles its shaders on the main thread, which
// takes seconds on a loaded machine whatever the station, so what a station's size adds is its
// first frame and longest task beyond the demo's. Target: the 100k station's longest task no longer
// than the demo's. The triangles and dots of the first frame are the scene's own counters. Then,
// after the last open, the tables drawer: from the click on Tables to the first frame with the node
// table's rows drawn, and from the click on its Edges tab to the edge table's, each with the longest
// main-thread task meanwhile, against the demo's in the same run.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { fromGraphColumns, type GraphColumns } from '../shared/compute/graph-columns';
import { send } from '../tests/setup/loopback';
import {
  importGeneratedStation,
  median,
  signedInChromium,
  signIn,
  startLoopbackServer,
  timedRequest,
} from './serve';

const SIZES = [10_000, 100_000];
const OPENS = Number(process.env.BENCH_OPENS ?? 3);
const OPEN_TIMEOUT_MS = 240_000;

declare global {
  interface Window {
    __twOpen?: { firstFrame?: number; longest: number; tasks: number };
  }
}

/** Watches the page from its first script: when the station scene first says it drew a frame, and the longest task. */
function watchOpening() {
  const state = { firstFrame: undefined as number | undefined, longest: 0, tasks: 0 };
  window.__twOpen = state;
  new PerformanceObserver((list) => {
    for (const e of list.getEntries()) {
      state.tasks++;
      state.longest = Math.max(state.longest, e.duration);
    }
  }).observe({ type: 'longtask', buffered: true });
  new MutationObserver(() => {
    if (state.firstFrame !== undefined) return;
    const scene = document.querySelector('[data-testid="station-scene"][data-frames]');
    if (scene && Number(scene.getAttribute('data-model-draw-calls') ?? 0) > 0)
      state.firstFrame = performance.now();
  }).observe(document, {
    subtree: true,
    attributes: true,
    attributeFilter: ['data-frames'],
    childList: true,
  });
}

interface Opened {
  firstFrameMs: number;
  longestTaskMs: number;
  triangles: number;
}

async function openOnce(page: Page, url: string): Promise<Opened> {
  await page.goto(url);
  await page.waitForFunction(() => window.__twOpen?.firstFrame !== undefined, null, {
    timeout: OPEN_TIMEOUT_MS,
    polling: 100,
  });
  // a task running when the frame was drawn ends before it is reported
  await page.waitForTimeout(300);
  const state = await page.evaluate(() => window.__twOpen!);
  const triangles = await page.getAttribute('[data-testid="station-scene"]', 'data-triangles');
  return { firstFrameMs: state.firstFrame!, longestTaskMs: state.longest, triangles: Number(triangles) };
}

interface Clicked {
  ms: number;
  longestMs: number;
}

/**
 * Clicks the button whose text starts with `text` inside `within` (a selector) and waits for the
 * first frame drawn after a row of the table captioned `caption` is in the page: the time from the
 * click and the longest task meanwhile.
 */
async function clickUntilRows(page: Page, within: string, text: string, caption: string): Promise<Clicked> {
  // tsx names the functions it compiles through a helper of its own, which the page lacks
  await page.evaluate('globalThis.__name ??= (f) => f');
  return page.evaluate(
    ([within, text, caption]) =>
      new Promise<Clicked>((resolve, reject) => {
        const button = [...document.querySelectorAll<HTMLButtonElement>(`${within} button`)].find((b) =>
          b.textContent?.startsWith(text),
        );
        if (!button) return reject(new Error(`no button ${text}`));
        let longestMs = 0;
        const seen = (entries: PerformanceEntryList) => {
          for (const e of entries) longestMs = Math.max(longestMs, e.duration);
        };
        const observer = new PerformanceObserver((list) => seen(list.getEntries()));
        observer.observe({ type: 'longtask' });
        const rowsShown = () =>
          [...document.querySelectorAll('table')].some(
            (t) => t.caption?.textContent === caption && t.querySelector('tbody tr td button'),
          );
        const t0 = performance.now();
        button.click();
        const check = () => {
          if (!rowsShown()) return void requestAnimationFrame(check);
          // the frame after the rows were made is the one that draws them
          requestAnimationFrame(() => {
            const ms = performance.now() - t0;
            setTimeout(() => {
              seen(observer.takeRecords());
              observer.disconnect();
              resolve({ ms, longestMs });
            }, 100);
          });
        };
        requestAnimationFrame(check);
      }),
    [within, text, caption] as const,
  );
}

/** JSON.parse of an answer's text in the page, the fastest of three (ms). */
async function parseInPage(page: Page, url: string): Promise<number> {
  return page.evaluate(async (u) => {
    const text = await (await fetch(u)).text();
    let best = Infinity;
    for (let i = 0; i < 3; i++) {
      const t0 = performance.now();
      JSON.parse(text);
      best = Math.min(best, performance.now() - t0);
    }
    return best;
  }, url);
}

async function bytesOf(agent: http.Agent, url: string, cookie: string) {
  const r = await timedRequest(agent, url, 'GET', { cookie, 'accept-encoding': 'gzip' });
  if (r.status !== 200) throw new Error(`${url}: ${r.status}`);
  return r.bytes;
}

export async function run(): Promise<boolean> {
  execFileSync('npx', ['vite', 'build', '--logLevel', 'error'], {
    stdio: 'inherit',
    env: { ...process.env, NODE_ENV: 'production' },
  });
  const server = await startLoopbackServer({ NODE_ENV: 'production' }, { quiet: true });
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), 'tetherwise-bench-chromium-'));
  const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  let ok = true;
  try {
    const cookie = await signIn(server.base, 'engineer@example.org');
    const stations: { name: string; id: number }[] = [];
    const listed = await send(server.base, 'GET', '/api/stations', { cookie }, '');
    stations.push({ name: 'demo', id: (JSON.parse(listed.text) as { id: number }[])[0].id });
    for (const nodes of SIZES) {
      const { stationId } = await importGeneratedStation(server.base, cookie, nodes);
      stations.push({ name: `${nodes / 1000}k`, id: stationId });
    }

    const context = await signedInChromium(profile, server.base, cookie);
    await context.addInitScript(watchOpening);
    const page = context.pages()[0] ?? (await context.newPage());

    console.log(
      `median of ${OPENS} opens after one to warm up; load average ${os.loadavg()[0].toFixed(1)} on ${os.cpus().length} cores`,
    );
    console.log(
      'station'.padEnd(8),
      'first frame'.padStart(12),
      'longest task'.padStart(13),
      'triangles'.padStart(10),
      '/graph gz'.padStart(11),
      'columns gz'.padStart(11),
      'ratio'.padStart(7),
      'parse /graph'.padStart(13),
      'columns+read'.padStart(13),
    );
    let demo: { firstFrame: number; longest: number } | null = null;
    const tables: { name: string; nodes: Clicked; edges: Clicked }[] = [];
    for (const s of stations) {
      const base = `${server.base}/api/stations/${s.id}`;
      const graphBytes = await bytesOf(agent, `${base}/graph`, cookie);
      const columnBytes = await bytesOf(agent, `${base}/graph/columns`, cookie);
      const opens: Opened[] = [];
      for (let i = 0; i <= OPENS; i++) {
        const opened = await openOnce(page, `${server.base}/stations/${s.id}`);
        if (i > 0) opens.push(opened);
      }
      const longest = median(opens.map((o) => o.longestTaskMs));
      const firstFrame = median(opens.map((o) => o.firstFrameMs));
      demo ??= { firstFrame, longest };
      // the page is on the station after its last open: the tables drawer, then its Edges tab
      const nodesTable = await clickUntilRows(page, 'body', 'Tables', 'Nodes');
      const edgesTable = await clickUntilRows(page, 'section[aria-label="Tables"]', 'Edges', 'Edges');
      tables.push({ name: s.name, nodes: nodesTable, edges: edgesTable });
      const met = s.name !== '100k' || longest <= demo.longest;
      ok &&= met;
      const parseGraph = await parseInPage(page, `${base}/graph`);
      const parseColumns = await parseInPage(page, `${base}/graph/columns`);
      const columns = JSON.parse(
        (await timedRequest(agent, `${base}/graph/columns`, 'GET', { cookie })).body.toString(),
      ) as GraphColumns;
      let readMs = Infinity;
      for (let i = 0; i < 3; i++) {
        const t0 = performance.now();
        fromGraphColumns(columns);
        readMs = Math.min(readMs, performance.now() - t0);
      }
      console.log(
        s.name.padEnd(8),
        `${(firstFrame / 1000).toFixed(2)} s`.padStart(12),
        `${longest.toFixed(0)} ms`.padStart(13),
        opens[0].triangles.toLocaleString('en').padStart(10),
        `${(graphBytes / 1e6).toFixed(2)} MB`.padStart(11),
        `${(columnBytes / 1e6).toFixed(2)} MB`.padStart(11),
        `${(columnBytes / graphBytes).toFixed(2)}×`.padStart(7),
        `${parseGraph.toFixed(0)} ms`.padStart(13),
        `${parseColumns.toFixed(0)}+${readMs.toFixed(0)} ms`.padStart(13),
        s === stations[0]
          ? '(reference)'
          : `first frame ${(firstFrame / demo.firstFrame).toFixed(1)}× the demo's, longest task ${(longest / demo.longest).toFixed(2)}× the demo's` +
              (s.name === '100k' ? (met ? ' PASS' : " FAIL (longer than the demo's)") : ''),
      );
    }
    console.log(
      `\ntables drawer, after the last open; load average ${os.loadavg()[0].toFixed(1)} on ${os.cpus().length} cores`,
    );
    console.log(
      'station'.padEnd(8),
      'open: rows drawn'.padStart(17),
      'longest task'.padStart(13),
      'edges tab'.padStart(10),
      'longest task'.padStart(13),
    );
    const ref = tables[0];
    for (const t of tables) {
      console.log(
        t.name.padEnd(8),
        `${t.nodes.ms.toFixed(0)} ms`.padStart(17),
        `${t.nodes.longestMs.toFixed(0)} ms`.padStart(13),
        `${t.edges.ms.toFixed(0)} ms`.padStart(10),
        `${t.edges.longestMs.toFixed(0)} ms`.padStart(13),
        t === ref
          ? '(reference)'
          : `open ${(t.nodes.ms / ref.nodes.ms).toFixed(1)}× the demo's, edges tab ${(t.edges.ms / ref.edges.ms).toFixed(1)}×`,
      );
    }
    await context.close();
  } finally {
    agent.destroy();
    fs.rmSync(profile, { recursive: true, force: true });
    await server.stop();
  }
  return ok;
}
