import { z } from 'zod';
import { KeySchema } from './station';

export const ROUTE_MODES = ['fastest', 'fewest-swaps', 'balanced'] as const;
export const RouteModeSchema = z.enum(ROUTE_MODES);
export type RouteMode = z.infer<typeof RouteModeSchema>;

/** Extra attach points one route request may name (installed portable anchors, say). */
export const MAX_EXTRA_ATTACH = 500;

/**
 * Body of `POST /api/stations/:id/routes`. The start state (`startAnchor`, `startPaidOutM`) says
 * where the crew member at `from` is clipped and how much tether is already out; `extraAttach`
 * names nodes that count as attach points for this query. How the fields go together and with
 * the station (do the keys exist, is `startAnchor` given with `startPaidOutM` and an attach point,
 * is `startPaidOutM` below the tether) is checked by `routeRequestProblems` in
 * shared/compute/routes.ts, so this stays a plain object schema others can extend.
 */
export const RouteRequestSchema = z.strictObject({
  from: KeySchema,
  to: KeySchema,
  mode: RouteModeSchema,
  tetherLengthM: z
    .number()
    .refine(Number.isFinite, 'must be a finite number')
    .refine((v) => v > 0 && v <= 1000, 'tether length must be greater than 0 and at most 1000 m')
    .optional(),
  carrying: z.boolean().optional(),
  allowRide: z.boolean().optional(),
  startAnchor: KeySchema.optional(),
  startPaidOutM: z
    .number()
    .refine(Number.isFinite, 'must be a finite number')
    .refine((v) => v >= 0, 'the paid-out length must be 0 m or more')
    .optional(),
  /** arrive with at most this many metres out since the last clip (room to reach an attach point after) */
  endPaidOutMaxM: z
    .number()
    .refine(Number.isFinite, 'must be a finite number')
    .refine((v) => v >= 0, 'must be 0 m or more')
    .optional(),
  extraAttach: z
    .array(KeySchema)
    .max(MAX_EXTRA_ATTACH, `at most ${MAX_EXTRA_ATTACH} extra attach points`)
    .optional(),
});
export type RouteRequest = z.infer<typeof RouteRequestSchema>;

/** A tether state: the attach point the crew member is clipped to, and the metres paid out since it. */
export interface TetherState {
  anchor: string;
  paidOutM: number;
}

/** One tether swap: clip the new hook at `node`, then release the old one. */
export interface TetherSwap {
  node: string;
  /** distance along the route from its start, metres */
  atM: number;
  /** tether paid out from the previous clip just before the swap, metres (the start's paid-out length included) */
  paidOutM: number;
}

/** One edge of the walk, in travel order. */
export interface RouteLeg {
  from: string;
  to: string;
  kind: 'handrail' | 'hop' | 'ride';
  lengthM: number;
  seconds: number;
  /** distance along the route at the start of this leg */
  startM: number;
}

export type InfeasibleReason =
  'same-node' | 'disconnected' | 'blocked-by-hazard' | 'anchor-gap' | 'start-not-attachable';

export interface RouteFeasible {
  feasible: true;
  mode: RouteMode;
  /** node keys in walk order (a node may repeat: a route is a walk) */
  nodes: string[];
  legs: RouteLeg[];
  lengthM: number;
  travelSeconds: number;
  swapCount: number;
  swaps: TetherSwap[];
  swapSeconds: number;
  totalSeconds: number;
  tetherLengthM: number;
  /** the largest paid-out length anywhere on the route */
  maxPaidOutM: number;
  warnings: string[];
  /** keys of caution hazards the route passes through */
  cautionHazards: string[];
  /**
   * no start state was given and the start is not an attach point: the route assumes a tether
   * clipped where the crew member stands
   */
  startNotAttachable?: boolean;
  /**
   * The tether state at `from`: the request's start state, else clipped at `from` with 0 m out.
   * findRoute always sets it and tetherAtEnd (optional in the type only while hand-made routes in
   * older tests lack them).
   */
  tetherAtStart?: TetherState;
  /** the tether state at `to`: the last swap's node (else the start's anchor) and the metres out since it */
  tetherAtEnd?: TetherState;
}

export interface RouteInfeasible {
  feasible: false;
  mode: RouteMode;
  reason: string;
  reasonCode: InfeasibleReason;
  /** keep-out hazards that block every otherwise possible route, when that is the cause */
  blockingHazards?: string[];
}

export type RouteResult = RouteFeasible | RouteInfeasible;

/** Nodes one route matrix may name: rows and columns both. */
export const MAX_MATRIX_NODES = 200;

/**
 * Body of `POST /api/stations/:id/route-matrix`: the route between every ordered pair of `nodes`,
 * each from a fresh clip where it starts, as the routes endpoint answers it without a start state.
 */
export const RouteMatrixRequestSchema = RouteRequestSchema.pick({
  mode: true,
  tetherLengthM: true,
  carrying: true,
  allowRide: true,
}).extend({
  nodes: z
    .array(KeySchema)
    .min(1, 'name at least one node')
    .max(MAX_MATRIX_NODES, `at most ${MAX_MATRIX_NODES} nodes`),
});
export type RouteMatrixRequest = z.infer<typeof RouteMatrixRequestSchema>;

/** Row `i`, column `j`: the route from `nodes[i]` to `nodes[j]`; null where it is infeasible. */
export interface RouteMatrix {
  nodes: string[];
  seconds: (number | null)[][];
  swaps: (number | null)[][];
}
