// Profiles one open of a generated station's Station screen in headless Chromium (as the open-station
// bench opens it, after one open to warm up) against a production build in dist/ (`npx vite build
// --minify false` keeps the names): the main thread's tasks over 50 ms with what took them (a
// trace), then self and total time per function (a CPU profile, also written to out if given).
// Usage: tsx bench/profile-open.ts [nodes=100000] [out.cpuprofile]
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { importGeneratedStation, signedInChromium, signIn, startLoopbackServer } from './serve';

const nodes = Number(process.argv[2] ?? 100_000);
const out = process.argv[3];

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number };
  children?: number[];
}
interface Profile {
  nodes: ProfileNode[];
  samples: number[];
  timeDeltas: number[];
}

interface TraceEvent {
  name: string;
  cat: string;
  ph: string;
  ts: number;
  dur?: number;
  pid: number;
  tid: number;
  args?: Record<string, unknown>;
}

/** The main thread's tasks over 50 ms, each with what took most of it (events one level down). */
function summariseTasks(events: TraceEvent[]) {
  const main = events.find(
    (e) => e.name === 'thread_name' && (e.args as { name?: string })?.name === 'CrRendererMain',
  );
  if (!main) return console.log('no renderer main thread in the trace');
  const mine = events.filter((e) => e.pid === main.pid && e.tid === main.tid && e.ph === 'X' && e.dur);
  const tasks = mine.filter((e) => e.name === 'RunTask' && e.dur! > 50_000);
  for (const t of tasks) {
    const inside = mine.filter(
      (e) => e !== t && e.ts >= t.ts && e.ts + e.dur! <= t.ts + t.dur! && e.dur! > 20_000,
    );
    // the outermost events inside the task
    const top = inside.filter(
      (e) =>
        !inside.some((o) => o !== e && o.ts <= e.ts && o.ts + o.dur! >= e.ts + e.dur! && o.dur! > e.dur!),
    );
    console.log(`task ${(t.dur! / 1000).toFixed(0)} ms at ${((t.ts - tasks[0].ts) / 1000).toFixed(0)} ms`);
    for (const e of top.slice(0, 12)) {
      const kids = inside
        .filter((o) => o !== e && o.ts >= e.ts && o.ts + o.dur! <= e.ts + e.dur!)
        .sort((a, b) => b.dur! - a.dur!);
      console.log(
        `   ${(e.dur! / 1000).toFixed(0).padStart(6)} ms ${e.name} ${JSON.stringify(e.args?.data ?? '').slice(0, 80)}` +
          kids
            .slice(0, 4)
            .map((k) => `\n        ${(k.dur! / 1000).toFixed(0).padStart(6)} ms ${k.name}`)
            .join(''),
      );
    }
  }
}

const server = await startLoopbackServer({ NODE_ENV: 'production' }, { quiet: true });
const profileDir = fs.mkdtempSync(path.join(os.tmpdir(), 'tetherwise-prof-chromium-'));
try {
  const cookie = await signIn(server.base, 'engineer@example.org');
  const { stationId } = await importGeneratedStation(server.base, cookie, nodes);
  const context = await signedInChromium(profileDir, server.base, cookie);
  const page = context.pages()[0] ?? (await context.newPage());
  const url = `${server.base}/stations/${stationId}`;
  const frame = () =>
    page.waitForFunction(
      () =>
        Number(
          document.querySelector('[data-testid="station-scene"]')?.getAttribute('data-model-draw-calls') ?? 0,
        ) > 0,
      null,
      { timeout: 240_000, polling: 100 },
    );
  await page.goto(url);
  await frame();
  const cdp = await context.newCDPSession(page);
  await cdp.send('Profiler.enable');
  await cdp.send('Profiler.setSamplingInterval', { interval: 500 });
  await page.goto(`${server.base}/`);
  await cdp.send('Profiler.start');
  const traceEvents: TraceEvent[] = [];
  cdp.on('Tracing.dataCollected', (e) => traceEvents.push(...(e.value as unknown as TraceEvent[])));
  const traced = new Promise<void>((resolve) => cdp.once('Tracing.tracingComplete', () => resolve()));
  await cdp.send('Tracing.start', {
    categories: 'devtools.timeline,disabled-by-default-devtools.timeline,toplevel,blink,gpu,v8',
    transferMode: 'ReportEvents',
  });
  const t0 = performance.now();
  await page.goto(url);
  await frame();
  await page.waitForTimeout(500);
  const { profile } = (await cdp.send('Profiler.stop')) as unknown as { profile: Profile };
  await cdp.send('Tracing.end');
  await traced;
  summariseTasks(traceEvents);
  console.log(
    `open to first frame (seen by the bench) ${((performance.now() - t0) / 1000).toFixed(2)} s; load ${os.loadavg()[0].toFixed(1)}`,
  );
  if (out) fs.writeFileSync(out, JSON.stringify(profile));
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const parent = new Map<number, number>();
  for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
  const self = new Map<number, number>();
  profile.samples.forEach((s, i) => self.set(s, (self.get(s) ?? 0) + profile.timeDeltas[i] / 1000));
  const label = (n: ProfileNode) =>
    `${n.callFrame.functionName || '(anon)'} ${n.callFrame.url.split('/').pop()}:${n.callFrame.lineNumber + 1}:${n.callFrame.columnNumber + 1}`;
  const selfBy = new Map<string, number>();
  const totalBy = new Map<string, number>();
  for (const [id, ms] of self) {
    const n = byId.get(id)!;
    selfBy.set(label(n), (selfBy.get(label(n)) ?? 0) + ms);
    const seen = new Set<string>();
    for (let at: number | undefined = id; at !== undefined; at = parent.get(at)) {
      const l = label(byId.get(at)!);
      if (seen.has(l)) continue;
      seen.add(l);
      totalBy.set(l, (totalBy.get(l) ?? 0) + ms);
    }
  }
  const top = (m: Map<string, number>, k: number) =>
    [...m]
      .sort((a, b) => b[1] - a[1])
      .slice(0, k)
      .map(([l, ms]) => `${ms.toFixed(0).padStart(7)} ms  ${l}`)
      .join('\n');
  console.log('self:\n' + top(selfBy, 30));
  console.log('total:\n' + top(totalBy, 50));
  await context.close();
} finally {
  fs.rmSync(profileDir, { recursive: true, force: true });
  await server.stop();
}
