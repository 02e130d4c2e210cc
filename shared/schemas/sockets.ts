import { z } from 'zod';
import { FiniteSchema, KeySchema, Vec3Schema, keyListSchema, type StationNode } from './station';
import { VersionSchema } from './version';
import type { AffectedPlan } from './plan-views';

export const MAX_PLAN_TARGETS = 500;
export const MIN_GRID_SPACING_M = 0.25;
export const MAX_GRID_SPACING_M = 50;
/**
 * Candidate sockets of one plan at the most (listed or all of the station's, plus grid points): the
 * planner's work grows with candidates × targets.
 */
export const MAX_SOCKET_CANDIDATES = 20_000;

/** Body of `POST /api/stations/:id/reach`: a socket's key and a target point. */
export const ReachRequestSchema = z.strictObject({
  socket: KeySchema,
  target: Vec3Schema,
});
export type ReachRequest = z.infer<typeof ReachRequestSchema>;

/** Body of `POST /api/stations/:id/socket-plan`. */
export const SocketPlanRequestSchema = z
  .strictObject({
    targets: z
      .array(Vec3Schema)
      .min(1, 'give at least one target')
      .max(MAX_PLAN_TARGETS, `at most ${MAX_PLAN_TARGETS} targets`),
    /** socket node keys; absent means every socket of the station, empty means none (grid only) */
    candidates: keyListSchema(MAX_SOCKET_CANDIDATES, 'candidates').optional(),
    /** also try candidates on a grid of this spacing over the truss faces */
    gridSpacingM: FiniteSchema.refine(
      (v) => v >= MIN_GRID_SPACING_M && v <= MAX_GRID_SPACING_M,
      `grid spacing must be between ${MIN_GRID_SPACING_M} and ${MAX_GRID_SPACING_M} m`,
    ).optional(),
  })
  .refine((r) => !(r.candidates?.length === 0 && r.gridSpacingM === undefined), {
    path: ['candidates'],
    message: 'give at least one candidate socket or a grid spacing',
  });
export type SocketPlanRequest = z.infer<typeof SocketPlanRequestSchema>;

/** Angles follow the conventions documented in shared/compute/reach.ts. */
const anglesShape = {
  distanceM: z.number(),
  yawDeg: z.number(),
  pitchDeg: z.number(),
  yawSetDeg: z.number(),
  pitchSetDeg: z.number(),
};

export const ReachResultSchema = z.object({
  reachable: z.boolean(),
  ...anglesShape,
  socket: KeySchema,
  workPoint: Vec3Schema,
  standOffM: z.number(),
  radiusM: z.number(),
});
export type ReachResult = z.infer<typeof ReachResultSchema>;

/** A socket the plan uses: an existing socket by key, or a new one on a truss face. */
export const PlannedSocketSchema = z.union([
  KeySchema,
  z.object({ position: Vec3Schema, normal: Vec3Schema }),
]);
export type PlannedSocket = z.infer<typeof PlannedSocketSchema>;

export const SocketAssignmentSchema = z.object({
  /** index into the request's targets */
  target: z.number().int(),
  /** index into the result's sockets */
  socket: z.number().int(),
  ...anglesShape,
});
export type SocketAssignment = z.infer<typeof SocketAssignmentSchema>;

export const SocketPlanResultSchema = z.object({
  sockets: z.array(PlannedSocketSchema),
  /** true: no smaller set of these candidates reaches every coverable target; false: greedy */
  exact: z.boolean(),
  /** indices of targets that no candidate reaches */
  uncovered: z.array(z.number().int()),
  /** one per covered target, to its nearest chosen socket, in target order */
  assignments: z.array(SocketAssignmentSchema),
  candidateCount: z.number().int(),
});
export type SocketPlanResult = z.infer<typeof SocketPlanResultSchema>;

const NonZeroVec3Schema = Vec3Schema.refine(
  (v) => Math.hypot(...v) > 1e-9,
  'a normal must not be the zero vector',
);

/**
 * Body of `POST /api/stations/:id/socket-plan/accept`: the planned sockets to add to the model, with
 * the station version the plan was computed on (a later edit makes the accept a 409).
 */
export const AcceptSocketPlanInputSchema = z.strictObject({
  version: VersionSchema,
  sockets: z
    .array(
      z.strictObject({
        position: Vec3Schema,
        normal: NonZeroVec3Schema,
        key: KeySchema.optional(),
        label: z.string().trim().max(200, 'label must be at most 200 characters').optional(),
        /** what the socket is for, kept on the node (e.g. the targets it was planned to serve) */
        notes: z.string().trim().max(4000, 'notes must be at most 4000 characters').optional(),
      }),
    )
    .min(1, 'give at least one socket')
    .max(500, 'at most 500 sockets at once'),
});
export type AcceptSocketPlanInput = z.infer<typeof AcceptSocketPlanInputSchema>;

/** A socket the accept added, joined by a hop edge to the nearest handrail node. */
export interface AcceptedSocket extends StationNode {
  /** the handrail node the new socket is joined to */
  joinedTo: string;
  hopM: number;
}

export interface AcceptSocketPlanResult {
  version: number;
  sockets: AcceptedSocket[];
  /** the plans in review or approved the new sockets touch (named only when there are some) */
  affectedPlans?: AffectedPlan[];
}

/** `?dryRun=1`: what the accept would add and the reviewed plans it would touch; nothing is written. */
export interface AcceptSocketPlanPreview {
  dryRun: true;
  version: number;
  sockets: AcceptedSocket[];
  affectedPlans: AffectedPlan[];
}
