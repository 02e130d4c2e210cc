// The day's legs on the 100k-node truss, replayed outside the bench for profiling:
// `npx tsx bench/profile-day.ts [nodes] [tasks]` (100,000 and 200 by default). The clip graph is
// built once and kept in the system's temporary folder (`--rebuild` builds it afresh, as it must be
// after a change to how clip graphs are built); the timeline is computed once with every leg
// recorded as the state machine asked it, then the legs are replayed `--runs N` times (3 by
// default; `--timeline` times the whole timeline after each), printing the process's CPU time and
// the wall time with the load average beside them, and a fingerprint of the answers, so two
// versions of the search can be compared. `--legs` lists what the day asks (capped legs, searches
// again without the cap, repeats) and its slowest legs. Run it under `node --cpu-prof --import tsx`
// for a profile.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { serialize, deserialize } from 'node:v8';
import { compileStation } from '@shared/compute/compiled-station';
import { computeTimeline } from '@shared/compute/day/timeline';
import { dayStationOf } from '@shared/compute/day/station';
import { findRoute, wantsClipGraph } from '@shared/compute/routes';
import { adoptClipGraph, buildClipGraphParts, type ClipGraphParts } from '@shared/compute/routes-clip';
import { generateTrussStation } from '@shared/compute/truss-generator';
import type { RouteRequest, RouteResult } from '@shared/schemas/route';
import { BENCH_TETHER_M, dayBenchPlan } from './plans';

const args = process.argv.slice(2);
const flag = (name: string) => args.includes(name);
const option = (name: string, fallback: number) => {
  const i = args.indexOf(name);
  return i >= 0 ? Number(args[i + 1]) : fallback;
};
const [nodes = 100_000, tasks = 200] = args
  .filter((a, i) => /^\d+$/.test(a) && !args[i - 1]?.startsWith('--'))
  .map(Number);
const runs = option('--runs', 3);
const load = () =>
  os
    .loadavg()
    .map((l) => l.toFixed(1))
    .join(' ');

const doc = generateTrussStation({ nodes, seed: 42 });
const compiled = compileStation(doc);
const station = dayStationOf(doc, compiled)!;
const plan = dayBenchPlan(doc, tasks, 7);
const terms = wantsClipGraph(compiled, doc.settings, {
  from: station.airlockKey,
  to: station.airlockKey,
  mode: 'balanced',
  tetherLengthM: BENCH_TETHER_M,
});
if (terms) {
  const file = path.join(
    os.tmpdir(),
    `tetherwise-clip-${nodes}-${terms.tetherLengthM}-${terms.excludeMask}.v8`,
  );
  let parts: ClipGraphParts;
  if (fs.existsSync(file) && !flag('--rebuild')) {
    parts = deserialize(fs.readFileSync(file)) as ClipGraphParts;
  } else {
    const t0 = performance.now();
    const { settings } = doc;
    parts = buildClipGraphParts(compiled, terms.weights, terms.tetherLengthM, terms.excludeMask, [
      settings.swapSeconds,
      settings.swapSeconds / settings.carryFactor,
    ]).parts;
    console.log(`clip graph built in ${((performance.now() - t0) / 1000).toFixed(1)} s (load ${load()})`);
    fs.writeFileSync(file, serialize(parts));
  }
  adoptClipGraph(terms.weights, parts);
}

const asked: RouteRequest[] = [];
const route = (r: RouteRequest) => {
  asked.push(r);
  return findRoute(compiled, doc.settings, r);
};
const t0 = performance.now();
const timeline = computeTimeline(plan, station, route);
console.log(
  `${nodes.toLocaleString('en')} nodes, ${tasks} tasks: timeline ${(performance.now() - t0).toFixed(0)} ms, ` +
    `${asked.length} legs asked (${timeline.routes.length} routes kept), load ${load()}`,
);

/** A short digest of every answer: its time, walk, swaps and tether at the end, or why it fails. */
function fingerprint(results: RouteResult[]): string {
  let h = 0;
  const mix = (s: string) => {
    for (let i = 0; i < s.length; i++) h = (Math.imul(h, 31) + s.charCodeAt(i)) | 0;
  };
  for (const r of results) {
    mix(r.feasible ? JSON.stringify([r.totalSeconds, r.nodes, r.swaps, r.tetherAtEnd]) : r.reason);
  }
  return (h >>> 0).toString(16);
}

for (let k = 0; k < runs; k++) {
  const cpu0 = process.cpuUsage();
  const w0 = performance.now();
  const results = asked.map((r) => findRoute(compiled, doc.settings, r));
  const wall = performance.now() - w0;
  const cpu = process.cpuUsage(cpu0);
  console.log(
    `legs ${k + 1}: CPU ${((cpu.user + cpu.system) / 1000).toFixed(0)} ms, wall ${wall.toFixed(0)} ms, ` +
      `answers ${fingerprint(results)}, load ${load()}`,
  );
  if (!flag('--timeline')) continue;
  const tc0 = process.cpuUsage();
  const tw0 = performance.now();
  computeTimeline(plan, station, (r) => findRoute(compiled, doc.settings, r));
  const tw = performance.now() - tw0;
  const tc = process.cpuUsage(tc0);
  console.log(
    `timeline ${k + 1}: CPU ${((tc.user + tc.system) / 1000).toFixed(0)} ms, wall ${tw.toFixed(0)} ms, load ${load()}`,
  );
}

if (flag('--legs')) {
  // per leg: its time, whether capped, whether it answered, and repeats of an earlier request
  const seenBefore = new Set<string>();
  let capped = 0;
  let cappedFailed = 0;
  let retried = 0;
  let repeats = 0;
  const rows: { i: number; ms: number; r: RouteRequest; res: RouteResult }[] = [];
  asked.forEach((r, i) => {
    const key = JSON.stringify(r);
    if (seenBefore.has(key)) repeats++;
    seenBefore.add(key);
    const w0 = performance.now();
    const res = findRoute(compiled, doc.settings, r);
    rows.push({ i, ms: performance.now() - w0, r, res });
    if (r.endPaidOutMaxM !== undefined) {
      capped++;
      if (!res.feasible) cappedFailed++;
    }
    const prev = asked[i - 1];
    if (
      prev &&
      prev.endPaidOutMaxM !== undefined &&
      r.endPaidOutMaxM === undefined &&
      prev.to === r.to &&
      prev.from === r.from
    )
      retried++;
  });
  const total = rows.reduce((n, x) => n + x.ms, 0);
  console.log(
    `${asked.length} legs, ${total.toFixed(0)} ms: ${capped} capped (${cappedFailed} of them infeasible, ${retried} asked again uncapped), ` +
      `${repeats} repeats of an earlier request, ${rows.filter((x) => !x.res.feasible).length} infeasible in all`,
  );
  const slow = [...rows].sort((a, b) => b.ms - a.ms).slice(0, 15);
  for (const x of slow) {
    const res = x.res;
    console.log(
      `  #${x.i} ${x.ms.toFixed(0)} ms ${x.r.from}→${x.r.to} cap ${x.r.endPaidOutMaxM?.toFixed(2) ?? '-'} out ${x.r.startPaidOutM?.toFixed(2)} extras ${x.r.extraAttach?.length ?? 0}` +
        (res.feasible
          ? ` ${res.totalSeconds.toFixed(0)} s, ${res.swapCount} swaps, ${res.lengthM.toFixed(0)} m`
          : ` infeasible: ${res.reasonCode}`),
    );
  }
}
