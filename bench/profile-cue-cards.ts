// The cue cards of a long day: how many steps, how long the PDF takes and how large it is.
// `npx tsx bench/profile-cue-cards.ts [nodes] [tasks]` (default 10,000 nodes, 200 tasks).
import os from 'node:os';
import { computeTimeline } from '@shared/compute/day/timeline';
import { generateTrussStation, seededRandom } from '@shared/compute/truss-generator';
import type { PlanView } from '@shared/schemas/plan-views';
import { PLANNING_CAUTION } from '@shared/caution';
import { cueCardDocument, timelinePdf } from '../server/modules/plans/plan-export.service';
import { benchEngine, benchPlanOf, benchTask, worksitesOf } from './plans';

const nodes = Number(process.argv[2] ?? 10_000);
const tasks = Number(process.argv[3] ?? 200);
const doc = generateTrussStation({ nodes, seed: 42 });
const engine = benchEngine(doc);
const rand = seededRandom(7);
const sites = worksitesOf(doc);
const crews = ['EV1', 'EV2', 'both'] as const;
const dayPlan = benchPlanOf(
  Array.from({ length: tasks }, (_, i) =>
    benchTask(rand, i, sites[Math.floor(rand() * sites.length)], crews[Math.floor(rand() * 3)]),
  ),
  [],
);
const timeline = computeTimeline(dayPlan, engine.station, engine.route);
const plan = {
  ...dayPlan,
  id: 1,
  title: 'Long day',
  stationName: doc.name,
  date: '2031-01-01',
  status: 'draft',
  version: 1,
} as unknown as PlanView;
const full = {
  ...timeline,
  planId: 1,
  planVersion: 1,
  stationId: 1,
  stationVersion: 1,
  airlockKey: engine.station.airlockKey,
  caution: PLANNING_CAUTION,
};
const steps = cueCardDocument(plan, full).cards.reduce((s, c) => s + c.steps.length, 0);
const blocks = full.crew.EV1.blocks.length + full.crew.EV2.blocks.length;
const t0 = performance.now();
const cpu0 = process.cpuUsage();
const pdf = await timelinePdf(plan, full);
const cpu = process.cpuUsage(cpu0);
console.log(
  `${nodes} nodes, ${tasks} tasks: ${blocks} blocks, ${steps} cue steps; PDF ${(pdf.length / 1e6).toFixed(2)} MB in ` +
    `${((performance.now() - t0) / 1000).toFixed(1)} s (CPU ${((cpu.user + cpu.system) / 1e6).toFixed(1)} s), load ${os.loadavg()[0].toFixed(1)}`,
);
