import { z } from 'zod';
import { KeySchema } from './station';

export const ROUTE_MODES = ['fastest', 'fewest-swaps', 'balanced'] as const;
export const RouteModeSchema = z.enum(ROUTE_MODES);
export type RouteMode = z.infer<typeof RouteModeSchema>;

/** Body of `POST /api/stations/:id/routes` (DESIGN §8). */
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
});
export type RouteRequest = z.infer<typeof RouteRequestSchema>;

/** One tether swap: clip the new hook at `node`, then release the old one. */
export interface TetherSwap {
  node: string;
  /** distance along the route from its start, metres */
  atM: number;
  /** tether paid out from the previous attach point just before the swap, metres */
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
  /** the start is not an attach point: the route assumes a tether clipped where the crew member stands */
  startNotAttachable?: boolean;
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
