import fs from 'node:fs';
import os from 'node:os';
import { proposeOrder } from '@shared/compute/day/sequence';
import { computeTimeline, placeDay } from '@shared/compute/day/timeline';
import type { DayPlan, DayTask } from '@shared/compute/day/types';
import { generateTrussStation, seededRandom } from '@shared/compute/truss-generator';
import { StationDocumentSchema, type StationDocument } from '@shared/schemas/station';
import { KESTREL_STATION_FILE } from '../server/db/seed/demo-station';
import { benchEngine, benchPlanOf, benchTask, worksitesOf, type BenchEngine } from './plans';

/**
 * The order search, on the demo station and the 10k-node generated truss. Exact: with the default
 * 2 s budget (and allowed up to 10 tasks per crew member here), whether the earliest day end is
 * proved and how long that took, on plans of 6, 8 and 10 tasks per crew member (one of them for
 * both, a tool fetched before use, an `after` link across the crew). Heuristic: the day end of the
 * 2 s proposal on plans of 20 and 40 tasks, on the wall clock and on CPU time (twice: whether the
 * same order comes again), against the best day end of a run six times as long on CPU time with
 * another seed, or of the short runs if one did better (the reference, same run): the gap in %. The reference for the search's speed is the whole
 * day computed on the order, against one task placed on a placed day (copied, then extended), both
 * on the 8-per-crew plan, routes asked once. Wall and CPU times are printed with the load average: on a loaded machine
 * the wall clock, and so the budget, buys less search than the CPU time says, so the exact rows also
 * run on a 2 s budget of the process's CPU time (what the budget buys on a quiet machine).
 */
const LONG_RUN_MS = 12_000;

/** `singles` tasks for each crew member and `both` for both; a tool picked up before it is used. */
export function sequencePlan(
  doc: StationDocument,
  engine: BenchEngine,
  singles: number,
  both: number,
  seed: number,
) {
  const rand = seededRandom(seed);
  const sites = worksitesOf(doc, engine);
  const tasks: DayTask[] = [];
  const add = (crew: DayTask['crew']) =>
    tasks.push(
      benchTask(rand, tasks.length, sites[Math.floor(rand() * sites.length)], crew, {
        id: tasks.length + 1,
        after: [],
      }),
    );
  for (let k = 0; k < singles; k++) {
    add('EV1');
    add('EV2');
  }
  for (let k = 0; k < both; k++) add('both');
  // EV1 fetches the driver (it waits at a worksite) before the task that uses it; EV2's night work
  // waits for that one
  tasks[0] = { ...tasks[0], actions: [{ do: 'pick-up', item: 'driver' }] };
  tasks[2] = { ...tasks[2], tools: ['driver'] };
  tasks[3] = { ...tasks[3], after: [3], eclipseOnly: true };
  const plan = benchPlanOf(tasks, [
    { key: 'driver', name: 'Power driver', kind: 'tool', startsAt: tasks[0].worksite },
  ]);
  return plan;
}

const hm = (s: number) => `${Math.floor(s / 3600)}:${String(Math.floor((s % 3600) / 60)).padStart(2, '0')}`;
const load = () => os.loadavg()[0].toFixed(1);

function timed<T>(fn: () => T): { value: T; wallMs: number; cpuMs: number } {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const value = fn();
  const wallMs = performance.now() - t0;
  const c = process.cpuUsage(c0);
  return { value, wallMs, cpuMs: (c.user + c.system) / 1000 };
}

/** Milliseconds of this process's CPU time: a budget on it is what the wall clock gives on a quiet machine. */
const cpuNow = () => {
  const c = process.cpuUsage();
  return (c.user + c.system) / 1000;
};

function propose(e: BenchEngine, plan: DayPlan, budgetMs?: number, seed?: number, now?: () => number) {
  return timed(() =>
    proposeOrder(plan, e.station, e.route, {
      travelSeconds: e.travelSeconds,
      exactUpTo: 10,
      budgetMs,
      seed,
      now,
    }),
  );
}

/** Median milliseconds of `fn` over `runs` runs. */
function medianMs(runs: number, fn: () => void): number {
  const xs = Array.from({ length: runs }, () => timed(fn).wallMs).sort((a, b) => a - b);
  return xs[Math.floor(runs / 2)];
}

export async function run(): Promise<boolean> {
  const demo = StationDocumentSchema.parse(JSON.parse(fs.readFileSync(KESTREL_STATION_FILE, 'utf8')));
  const big = generateTrussStation({ nodes: 10_000, seed: 42 });
  const stations = [
    ['demo station', demo, benchEngine(demo)],
    ['10k truss', big, benchEngine(big)],
  ] as const;
  console.log(`load average at the start ${load()} on ${os.cpus().length} cores`);

  for (const [name, doc, e] of stations) {
    const plan = sequencePlan(doc, e, 7, 1, 8);
    const order = plan.tasks.map((_, i) => i);
    // routes asked once, as in the search: both sides time the day, not the route engine
    const asked = new Map<string, ReturnType<typeof e.route>>();
    const route: typeof e.route = (r) => {
      const key = JSON.stringify(r);
      if (!asked.has(key)) asked.set(key, e.route(r));
      return asked.get(key)!;
    };
    const whole = medianMs(9, () => computeTimeline(plan, e.station, route));
    const start = placeDay(plan, e.station, route);
    order.slice(0, -1).forEach((i) => start.place(i));
    const step = medianMs(9, () => start.copy().place(order[order.length - 1]));
    console.log(
      `${name}, 8 tasks per crew member: the whole day ${whole.toFixed(2)} ms, one task placed on a placed day ` +
        `${step.toFixed(3)} ms (median of 9): ${(whole / step).toFixed(0)}× less per candidate`,
    );
  }

  console.log(
    'Exact (default 2 s budget, up to 10 tasks per crew member allowed), on the wall clock and on CPU time:',
  );
  for (const [name, doc, e] of stations) {
    for (const perCrew of [6, 8, 10]) {
      const plan = sequencePlan(doc, e, perCrew - 1, 1, perCrew);
      for (const [clock, now] of [
        ['wall', undefined],
        ['CPU', cpuNow],
      ] as const) {
        const { value: r, wallMs, cpuMs } = propose(e, plan, undefined, undefined, now);
        console.log(
          `  ${name}, ${perCrew} tasks per crew member (${plan.tasks.length} tasks), 2 s of ${clock} time: exact ${r.exact}, ` +
            `${(wallMs / 1000).toFixed(2)} s wall, ${(cpuMs / 1000).toFixed(2)} s CPU, load ${load()}; ` +
            `${r.explored.toLocaleString('en')} days and partial days, ${r.dominated.toLocaleString('en')} dominated; ` +
            `day end ${hm(r.endSeconds)} (plan order ${hm(r.currentEndSeconds)})`,
        );
      }
    }
  }

  console.log(
    `Heuristic (2 s budget, on the wall clock and on CPU time, the CPU one twice) against the best of a ` +
      `${LONG_RUN_MS / 1000} s run on CPU time with another seed (and of the short runs):`,
  );
  for (const [name, doc, e] of stations) {
    for (const total of [20, 40]) {
      const plan = sequencePlan(doc, e, (total - 2) / 2, 2, total);
      const wall = propose(e, plan);
      const cpu = propose(e, plan, undefined, undefined, cpuNow);
      const again = propose(e, plan, undefined, undefined, cpuNow);
      const long = propose(e, plan, LONG_RUN_MS, 2, cpuNow);
      const best = Math.min(...[wall, cpu, again, long].map((r) => r.value.endSeconds));
      const row = (label: string, r: typeof wall) =>
        `${label} ${hm(r.value.endSeconds)}, gap ${(((r.value.endSeconds - best) / best) * 100).toFixed(2)} % ` +
        `(${r.value.explored.toLocaleString('en')} days, ${(r.wallMs / 1000).toFixed(2)} s wall, ${(r.cpuMs / 1000).toFixed(2)} s CPU)`;
      const same = again.value.order.join() === cpu.value.order.join();
      console.log(
        `  ${name}, ${total} tasks, plan order ${hm(wall.value.currentEndSeconds)}, load ${load()}: ${row('2 s wall', wall)}; ` +
          `${row('2 s CPU', cpu)}, run again: ${same ? 'the same order' : `another order, ${hm(again.value.endSeconds)}`}; ` +
          `${row(`long run (best ${hm(best)})`, long)}`,
      );
    }
  }
  return true;
}
