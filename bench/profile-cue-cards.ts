// The cue cards of a long day: how many steps, how long the PDF takes and how large it is.
// `npx tsx bench/profile-cue-cards.ts [nodes] [tasks]` (default 10,000 nodes, 200 tasks).
import os from 'node:os';
import { generateTrussStation, seededRandom } from '@shared/compute/truss-generator';
import { cueCardDocument, timelinePdf } from '../server/modules/plans/plan-export.service';
import { benchEngine, benchPlanOf, benchTask, exportedDay, worksitesOf } from './plans';

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
const { plan, timeline: full } = exportedDay(doc, engine, dayPlan, 'Long day');
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
