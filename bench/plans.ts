import { compileStation } from '@shared/compute/compiled-station';
import { excludeMaskFor, findRoute } from '@shared/compute/routes';
import { clipGraphFor } from '@shared/compute/routes-clip';
import { dayStationOf } from '@shared/compute/day/station';
import type { DayItem, DayPlan, DayTask } from '@shared/compute/day/types';
import { travelLowerBound } from '@shared/compute/travel-bound';
import { seededRandom } from '@shared/compute/truss-generator';
import type { StationDocument } from '@shared/schemas/station';
import type { PlanTimeline, PlanView } from '@shared/schemas/plan-views';
import { PLANNING_CAUTION } from '@shared/caution';
import { computeTimeline } from '@shared/compute/day/timeline';

/** The benches' crew tether, metres. */
export const BENCH_TETHER_M = 25.9;

/**
 * The day's engine on a station as the server's route workers hold it: compiled, its clip graph
 * built first (as the builder thread does; `clipGraphMs` says how long that took), routes from it.
 */
export function benchEngine(doc: StationDocument) {
  const compiled = compileStation(doc);
  const t0 = performance.now();
  clipGraphFor(compiled, compiled.arcSeconds, doc.settings.tetherLengthM, excludeMaskFor(false));
  const clipGraphMs = performance.now() - t0;
  const station = dayStationOf(doc, compiled)!;
  const route = (r: Parameters<typeof findRoute>[2]) => findRoute(compiled, doc.settings, r);
  return {
    compiled,
    station,
    route,
    clipGraphMs,
    travelSeconds: travelLowerBound(compiled, doc.settings, false),
  };
}

export type BenchEngine = ReturnType<typeof benchEngine>;

/** The station's worksites; with an engine, only those a crew member can reach from the airlock and leave. */
export function worksitesOf(doc: StationDocument, engine?: BenchEngine): string[] {
  const sites = doc.nodes.filter((n) => n.kind === 'worksite').map((n) => n.key);
  if (!engine) return sites;
  const airlock = engine.station.airlockKey;
  const ask = (from: string, to: string) =>
    engine.route({ from, to, mode: 'balanced', tetherLengthM: BENCH_TETHER_M }).feasible;
  return sites.filter((s) => ask(airlock, s) && ask(s, airlock));
}

/** A bench task: 10 to 40 minutes of work at a worksite, no tools or actions unless given. */
export function benchTask(
  rand: () => number,
  i: number,
  worksite: string,
  crew: DayTask['crew'],
  extra: Partial<DayTask> = {},
): DayTask {
  return {
    title: `Task ${i + 1}`,
    worksite,
    crew,
    durationSeconds: 600 + Math.floor(rand() * 1800),
    eclipseOnly: false,
    carrying: false,
    tools: [],
    actions: [],
    ...extra,
  };
}

/** A bench plan around its tasks and manifest: two crew members, a balanced mode, a 100 h limit. */
export function benchPlanOf(tasks: DayTask[], manifest: DayItem[]): DayPlan {
  return {
    crew: {
      EV1: { name: 'A', tetherLengthM: BENCH_TETHER_M },
      EV2: { name: 'B', tetherLengthM: BENCH_TETHER_M },
    },
    routeMode: 'balanced',
    allowRide: false,
    orbitPhaseAtStartDeg: 0,
    timeLimitSeconds: 100 * 3600,
    egressSeconds: 1800,
    ingressSeconds: 1800,
    manifest,
    tasks,
  };
}

/** A plan over the station's worksites, with a restraint, a portable anchor, a large item and tools. */
export function dayBenchPlan(doc: StationDocument, tasks: number, seed: number): DayPlan {
  const rand = seededRandom(seed);
  const sites = worksitesOf(doc);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)];
  const crews = ['EV1', 'EV2', 'both'] as const;
  return benchPlanOf(
    Array.from({ length: tasks }, (_, i) => {
      const crew = pick(crews);
      const worksite = pick(sites);
      const actions: DayPlan['tasks'][number]['actions'] = [];
      if (i === 1 && crew !== 'EV1') actions.push({ do: 'install', item: 'anchor', by: 'EV2' });
      if (i === 2 && crew === 'both') actions.push({ do: 'hand-over', item: 'pump', by: 'EV1' });
      return benchTask(rand, i, worksite, crew, { tools: crew === 'EV2' ? [] : ['driver'], actions });
    }),
    [
      { key: 'driver', name: 'Power driver', kind: 'tool', carriedBy: 'EV1' },
      { key: 'bag', name: 'Tool bag', kind: 'bag', carriedBy: 'EV2' },
      { key: 'anchor', name: 'Portable anchor', kind: 'tether-anchor', carriedBy: 'EV2' },
      { key: 'pump', name: 'Spare pump module', kind: 'large-item', carriedBy: 'EV1' },
    ],
  );
}

/**
 * A bench plan's day as the server's exports see it: the plan as a saved draft (id 1, version 1)
 * and its timeline with what the server adds, computed on the engine.
 */
export function exportedDay(
  doc: StationDocument,
  engine: BenchEngine,
  dayPlan: DayPlan,
  title: string,
): { plan: PlanView; timeline: PlanTimeline } {
  const timeline = {
    ...computeTimeline(dayPlan, engine.station, engine.route),
    planId: 1,
    planVersion: 1,
    stationId: 1,
    stationVersion: 1,
    airlockKey: engine.station.airlockKey,
    caution: PLANNING_CAUTION,
  };
  const plan = {
    ...dayPlan,
    id: 1,
    title,
    stationName: doc.name,
    date: '2031-01-01',
    status: 'draft',
    version: 1,
  } as unknown as PlanView;
  return { plan, timeline };
}
