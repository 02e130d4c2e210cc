import os from 'node:os';
import type { compileStation } from '@shared/compute/compiled-station';
import { findRoute } from '@shared/compute/routes';
import { computeTimeline } from '@shared/compute/day/timeline';
import { toWire } from '@shared/compute/day/wire';
import type { DayPlan } from '@shared/compute/day/types';
import { generateTrussStation } from '@shared/compute/truss-generator';
import type { StationDocument } from '@shared/schemas/station';
import { benchEngine, dayBenchPlan } from './plans';

/**
 * The continuous day on generated trusses. The reference, measured in the same run, is the day as
 * it was computed before routes carried the tether from one worksite to the next: every leg of each
 * crew member's day routed from a fresh clip where they stand (the clip graph answers those, once it
 * is built, as on the server). The state machine routes every leg from the tether state on arrival
 * (the clip graph answers those too, with the portable anchors installed and a limit on arrival)
 * and keeps the items, restraints and anchors as it goes.
 *
 * Targets: the 60-task plan on the 10k-node truss within 1.5× the reference (median of 5); the
 * 200-task plan on the 100k-node truss within 2 s once the clip graph is built, and its timeline
 * within 5 MB on the wire (toWire, before gzip; printed beside the timeline's JSON as computed).
 */

const RUNS = 5;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** The day as before: each leg of each lane from a fresh clip where the crew member stands. */
function freshLegs(
  doc: StationDocument,
  c: ReturnType<typeof compileStation>,
  plan: DayPlan,
  airlock: string,
) {
  let seconds = 0;
  for (const m of ['EV1', 'EV2'] as const) {
    let at = airlock;
    const stops = [
      ...plan.tasks.filter((t) => t.crew === m || t.crew === 'both').map((t) => t.worksite),
      airlock,
    ];
    for (const to of stops) {
      if (to === at) continue;
      const r = findRoute(c, doc.settings, {
        from: at,
        to,
        mode: plan.routeMode,
        tetherLengthM: plan.crew[m].tetherLengthM,
      });
      if (r.feasible) {
        seconds += r.totalSeconds;
        at = to;
      }
    }
  }
  return seconds;
}

/** Wall time of fn, ms; its CPU time (the process's, user and system) added to `cpu`. */
function time(fn: () => void, cpu?: number[]): number {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  fn();
  const wall = performance.now() - t0;
  const c = process.cpuUsage(c0);
  cpu?.push((c.user + c.system) / 1000);
  return wall;
}

const load = () =>
  os
    .loadavg()
    .map((l) => l.toFixed(1))
    .join(' ');

export async function run(): Promise<boolean> {
  let ok = true;
  for (const { nodes, tasks, target, targetMs, targetMB } of [
    { nodes: 10_000, tasks: 60, target: 1.5, targetMs: null, targetMB: null },
    { nodes: 100_000, tasks: 200, target: null, targetMs: 2000, targetMB: 5 },
  ]) {
    const doc = generateTrussStation({ nodes, seed: 42 });
    const { compiled: c, station, route, clipGraphMs: built } = benchEngine(doc);
    const plan = dayBenchPlan(doc, tasks, 7);
    // one untimed pass each, so neither side pays for first-use setup inside its timings
    freshLegs(doc, c, plan, station.airlockKey);
    const timeline = computeTimeline(plan, station, route);
    const before: number[] = [];
    const after: number[] = [];
    const beforeCpu: number[] = [];
    const afterCpu: number[] = [];
    for (let k = 0; k < RUNS; k++) {
      before.push(time(() => freshLegs(doc, c, plan, station.airlockKey), beforeCpu));
      after.push(time(() => computeTimeline(plan, station, route), afterCpu));
    }
    const ratio = median(after) / median(before);
    const bytes = Buffer.byteLength(JSON.stringify(timeline));
    const wireBytes = Buffer.byteLength(JSON.stringify(toWire(timeline)));
    const routes = timeline.routes.length;
    const verdict = (pass: boolean) => (pass ? 'PASS' : 'FAIL');
    const passes = [
      target === null || ratio <= target,
      targetMs === null || median(after) <= targetMs,
      targetMB === null || wireBytes <= targetMB * 1e6,
    ];
    if (passes.includes(false)) ok = false;
    console.log(
      `${nodes.toLocaleString('en')} nodes, ${tasks} tasks (${routes} routes; clip graph built in ${(built / 1000).toFixed(1)} s): ` +
        `state machine ${median(after).toFixed(1)} ms${targetMs === null ? '' : ` (target ≤ ${targetMs / 1000} s: ${verdict(passes[1])})`}, ` +
        `fresh-clip legs ${median(before).toFixed(1)} ms (median of ${RUNS}; CPU time ${median(afterCpu).toFixed(0)} ms against ${median(beforeCpu).toFixed(0)} ms), ` +
        `ratio ${ratio.toFixed(2)}${target === null ? '' : ` (target ≤ ${target}: ${verdict(passes[0])})`}; ` +
        `on the wire ${(wireBytes / 1e6).toFixed(2)} MB${targetMB === null ? '' : ` (target ≤ ${targetMB} MB: ${verdict(passes[2])})`}, ` +
        `${(wireBytes / bytes).toFixed(2)}× the timeline's JSON as computed (${(bytes / 1e6).toFixed(2)} MB); ` +
        `${timeline.warnings.length} warnings; load average ${load()}`,
    );
  }
  return ok;
}
