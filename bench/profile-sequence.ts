// One exact order search as the sequence bench runs it (the 10k-node truss by default), on a budget
// of this process's CPU time, with its wall and CPU time and the load average; run it under
// `node --cpu-prof` (or `tsx --cpu-prof`) to see where the search spends its time.
// Usage: tsx bench/profile-sequence.ts [demo|10k] [tasks per crew member=8] [budget ms=60000]
import fs from 'node:fs';
import os from 'node:os';
import { proposeOrder } from '@shared/compute/day/sequence';
import { generateTrussStation } from '@shared/compute/truss-generator';
import { StationDocumentSchema } from '@shared/schemas/station';
import { KESTREL_STATION_FILE } from '../server/db/seed/demo-station';
import { benchEngine } from './plans';
import { sequencePlan } from './sequence.bench';

const which = process.argv[2] ?? '10k';
const perCrew = Number(process.argv[3] ?? 8);
const budgetMs = Number(process.argv[4] ?? 60_000);

const doc =
  which === 'demo'
    ? StationDocumentSchema.parse(JSON.parse(fs.readFileSync(KESTREL_STATION_FILE, 'utf8')))
    : generateTrussStation({ nodes: 10_000, seed: 42 });
const e = benchEngine(doc);
const plan = sequencePlan(doc, e, perCrew - 1, 1, perCrew);
const cpuNow = () => {
  const c = process.cpuUsage();
  return (c.user + c.system) / 1000;
};
const c0 = cpuNow();
const t0 = performance.now();
const r = proposeOrder(plan, e.station, e.route, {
  travelSeconds: e.travelSeconds,
  exactUpTo: 10,
  budgetMs,
  now: cpuNow,
});
console.log(
  `${which}, ${perCrew} tasks per crew member: exact ${r.exact}, ${((performance.now() - t0) / 1000).toFixed(2)} s wall, ` +
    `${((cpuNow() - c0) / 1000).toFixed(2)} s CPU, load ${os.loadavg()[0].toFixed(1)}; explored ${r.explored}, ` +
    `dominated ${r.dominated}; end ${r.endSeconds} (plan order ${r.currentEndSeconds})`,
);
