import { compileStation } from '@shared/compute/compiled-station';
import { findRoute } from '@shared/compute/routes';
import { dayStationOf } from '@shared/compute/day/station';
import type { DayPlan, DayRouteFn, DayStation } from '@shared/compute/day/types';
import {
  StationDocumentSchema,
  type StationDocument,
  type StationDocumentInput,
} from '@shared/schemas/station';

/**
 * A straight handrail station for day tests, small enough to work by hand: metres along x, 0.1 m/s on
 * handrails (10 s a metre), 90 s a swap, 120 s in or out of a foot restraint.
 *
 *   AL ──8── A1 ──4── W1 ──4── A2 ──4── S2 ──4── A3 ──4── W3
 *                                       │1.5
 *                                       W2 (1.5 m out from the socket, in reach)
 */
export const LINE_KEYS = {
  airlock: 'AL',
  a1: 'A1',
  w1: 'W1',
  a2: 'A2',
  s2: 'S2',
  w2: 'W2',
  a3: 'A3',
  w3: 'W3',
} as const;

export function lineStationDocument(overrides: Partial<StationDocumentInput> = {}): StationDocument {
  const K = LINE_KEYS;
  return StationDocumentSchema.parse({
    format: 'tetherwise.station',
    version: 1,
    name: 'Line station',
    orbit: { altitudeKm: 400, betaDeg: 0 },
    settings: {
      tetherLengthM: 12,
      speedsMps: { handrail: 0.1, hop: 0.1, ride: 0.05 },
      hopSeconds: 30,
      swapSeconds: 90,
      restraintSeconds: 120,
      carryFactor: 1.5,
    },
    nodes: [
      { key: K.airlock, kind: 'airlock', position: [0, 0, 0] },
      { key: K.a1, kind: 'anchor', position: [8, 0, 0] },
      { key: K.w1, kind: 'worksite', position: [12, 0, 0] },
      { key: K.a2, kind: 'anchor', position: [16, 0, 0] },
      { key: K.s2, kind: 'socket', position: [20, 0, 0], normal: [0, 0, 1] },
      { key: K.w2, kind: 'worksite', position: [20, 0, 1.5] },
      { key: K.a3, kind: 'anchor', position: [24, 0, 0] },
      { key: K.w3, kind: 'worksite', position: [28, 0, 0] },
    ],
    edges: [
      { from: K.airlock, to: K.a1, kind: 'handrail' },
      { from: K.a1, to: K.w1, kind: 'handrail' },
      { from: K.w1, to: K.a2, kind: 'handrail' },
      { from: K.a2, to: K.s2, kind: 'handrail' },
      { from: K.s2, to: K.w2, kind: 'handrail' },
      { from: K.s2, to: K.a3, kind: 'handrail' },
      { from: K.a3, to: K.w3, kind: 'handrail' },
    ],
    ...overrides,
  });
}

/** The real route engine and the day's view of a station document. */
export function dayEngine(doc: StationDocument): { station: DayStation; route: DayRouteFn } {
  const compiled = compileStation(doc);
  const station = dayStationOf(doc, compiled);
  if (!station) throw new Error('the factory station needs an airlock');
  return { station, route: (request) => findRoute(compiled, doc.settings, request) };
}

/** A plan for the line station: both crew on a 12 m tether, 10 min egress and ingress, fewest swaps. */
export function buildDayPlan(overrides: Partial<DayPlan> = {}): DayPlan {
  return {
    crew: { EV1: { name: 'Avery', tetherLengthM: 12 }, EV2: { name: 'Brook', tetherLengthM: 12 } },
    routeMode: 'fewest-swaps',
    allowRide: false,
    orbitPhaseAtStartDeg: 0,
    timeLimitSeconds: 6.5 * 3600,
    egressSeconds: 600,
    ingressSeconds: 600,
    tasks: [],
    manifest: [],
    ...overrides,
  };
}

export function dayTask(
  title: string,
  worksite: string,
  crew: 'EV1' | 'EV2' | 'both',
  durationSeconds: number,
  more: Partial<DayPlan['tasks'][number]> = {},
): DayPlan['tasks'][number] {
  return {
    title,
    worksite,
    crew,
    durationSeconds,
    eclipseOnly: false,
    carrying: false,
    tools: [],
    actions: [],
    ...more,
  };
}
