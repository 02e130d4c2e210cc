import fs from 'node:fs';
import { compileStation } from '@shared/compute/compiled-station';
import { excludeMaskFor, findRoute } from '@shared/compute/routes';
import { clipGraphFor } from '@shared/compute/routes-clip';
import { dayStationOf } from '@shared/compute/day/station';
import { proposeOrder } from '@shared/compute/day/sequence';
import type { DayPlan, DayTask } from '@shared/compute/day/types';
import { travelLowerBound } from '@shared/compute/travel-bound';
import { generateTrussStation, seededRandom } from '@shared/compute/truss-generator';
import { StationDocumentSchema, type StationDocument } from '@shared/schemas/station';
import { KESTREL_STATION_FILE } from '../server/db/seed/demo-station';

/**
 * The order search. Exact: the branch and bound's time to prove the earliest day end on plans of
 * 6, 8 and 10 tasks per crew member (one of them for both, a tool fetched before use, `after`
 * links, night work) on the demo station, allowed up to 10 per crew member and 30 s here. Heuristic:
 * the day end the proposal reaches in its default 2 s on plans of 20 and 40 tasks, against the best
 * day end of a run ten times as long (the reference, same run): the gap in %, on the demo station and
 * the 10k-node generated truss.
 */
const EXACT_BUDGET_MS = 30_000;
const LONG_RUN_MS = 20_000;

/** The day's engine on a station, its clip graph built first as the server's builder thread does. */
function engine(doc: StationDocument) {
  const c = compileStation(doc);
  clipGraphFor(c, c.arcSeconds, doc.settings.tetherLengthM, excludeMaskFor(false));
  const station = dayStationOf(doc, c)!;
  return {
    station,
    route: (r: Parameters<typeof findRoute>[2]) => findRoute(c, doc.settings, r),
    travelSeconds: travelLowerBound(c, doc.settings, false),
  };
}

/** `perCrew` tasks for each crew member, one of them for both; a tool picked up before it is used. */
function benchPlan(doc: StationDocument, singles: number, both: number, seed: number): DayPlan {
  const rand = seededRandom(seed);
  const sites = doc.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);
  const pick = () => sites[Math.floor(rand() * Math.min(sites.length, 24))];
  const tasks: DayTask[] = [];
  const add = (crew: DayTask['crew']) =>
    tasks.push({
      id: tasks.length + 1,
      title: `Task ${tasks.length + 1}`,
      worksite: pick(),
      crew,
      durationSeconds: 600 + Math.floor(rand() * 1800),
      eclipseOnly: tasks.length === 3,
      carrying: false,
      tools: [],
      actions: [],
      after: [],
    });
  for (let k = 0; k < singles; k++) {
    add('EV1');
    add('EV2');
  }
  for (let k = 0; k < both; k++) add('both');
  // EV1 fetches the driver (it waits at a worksite) before the task that uses it; EV2 waits for EV1
  tasks[0] = { ...tasks[0], actions: [{ do: 'pick-up', item: 'driver' }] };
  tasks[2] = { ...tasks[2], tools: ['driver'] };
  tasks[3] = { ...tasks[3], after: [3] };
  return {
    crew: { EV1: { name: 'A', tetherLengthM: 25.9 }, EV2: { name: 'B', tetherLengthM: 25.9 } },
    routeMode: 'balanced',
    allowRide: false,
    orbitPhaseAtStartDeg: 0,
    timeLimitSeconds: 100 * 3600,
    egressSeconds: 1800,
    ingressSeconds: 1800,
    manifest: [{ key: 'driver', name: 'Power driver', kind: 'tool', startsAt: tasks[0].worksite }],
    tasks,
  };
}

const hm = (s: number) => `${Math.floor(s / 3600)}:${String(Math.floor((s % 3600) / 60)).padStart(2, '0')}`;

export async function run(): Promise<boolean> {
  const demo = StationDocumentSchema.parse(JSON.parse(fs.readFileSync(KESTREL_STATION_FILE, 'utf8')));
  const demoEngine = engine(demo);
  console.log(
    `Exact (branch and bound, demo station; allowed 10 per crew member and ${EXACT_BUDGET_MS / 1000} s here):`,
  );
  for (const perCrew of [6, 8, 10]) {
    const plan = benchPlan(demo, perCrew - 1, 1, perCrew);
    const t0 = performance.now();
    const r = proposeOrder(plan, demoEngine.station, demoEngine.route, {
      travelSeconds: demoEngine.travelSeconds,
      exactUpTo: 10,
      budgetMs: EXACT_BUDGET_MS,
    });
    const ms = performance.now() - t0;
    console.log(
      `  ${perCrew} tasks per crew member (${plan.tasks.length} tasks): ${r.exact ? `proved in ${(ms / 1000).toFixed(2)} s` : `not proved within ${EXACT_BUDGET_MS / 1000} s`}, ` +
        `${r.explored.toLocaleString('en')} days computed; day end ${hm(r.endSeconds)} (plan order ${hm(r.currentEndSeconds)})`,
    );
  }
  for (const perCrew of [8]) {
    const plan = benchPlan(demo, perCrew, 0, perCrew);
    const independent = {
      ...plan,
      manifest: [],
      tasks: plan.tasks.map((t) => ({ ...t, tools: [], actions: [], after: [] })),
    };
    const t0 = performance.now();
    const r = proposeOrder(independent, demoEngine.station, demoEngine.route, {
      travelSeconds: demoEngine.travelSeconds,
    });
    const ms = performance.now() - t0;
    console.log(
      `  ${perCrew} tasks per crew member, the two days independent (default 2 s budget): ${r.exact ? `proved in ${(ms / 1000).toFixed(2)} s` : 'not proved'}, ` +
        `${r.explored.toLocaleString('en')} days computed; day end ${hm(r.endSeconds)} (plan order ${hm(r.currentEndSeconds)})`,
    );
  }
  console.log(`Heuristic (default 2 s) against the best of a ${LONG_RUN_MS / 1000} s run:`);
  const big = generateTrussStation({ nodes: 10_000, seed: 42 });
  for (const [name, doc, e] of [
    ['demo station', demo, demoEngine],
    ['10k truss', big, engine(big)],
  ] as const) {
    for (const total of [20, 40]) {
      const plan = benchPlan(doc, (total - 2) / 2, 2, total);
      const t0 = performance.now();
      const quick = proposeOrder(plan, e.station, e.route, { travelSeconds: e.travelSeconds });
      const quickMs = performance.now() - t0;
      const long = proposeOrder(plan, e.station, e.route, {
        travelSeconds: e.travelSeconds,
        budgetMs: LONG_RUN_MS,
        seed: 2,
      });
      const best = Math.min(quick.endSeconds, long.endSeconds);
      const gap = ((quick.endSeconds - best) / best) * 100;
      console.log(
        `  ${name}, ${total} tasks: plan order ${hm(quick.currentEndSeconds)}, 2 s proposal ${hm(quick.endSeconds)} ` +
          `(${(quickMs / 1000).toFixed(1)} s, ${quick.explored.toLocaleString('en')} days), long run ${hm(long.endSeconds)} ` +
          `(${long.explored.toLocaleString('en')} days): gap ${gap.toFixed(2)} %`,
      );
    }
  }
  return true;
}
