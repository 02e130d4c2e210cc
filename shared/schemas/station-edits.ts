import { z } from 'zod';
import {
  ArmSchema,
  EdgeKindSchema,
  EdgeSchema,
  FiniteSchema,
  HazardKindSchema,
  HazardSchema,
  KeySchema,
  MAX_ARMS,
  NodeKindSchema,
  NodeSchema,
  OrbitSettingsSchema,
  SegmentKindSchema,
  SegmentSchema,
  SegmentSizeSchema,
  Vec3Schema,
  type Arm,
  type Hazard,
  type OrbitSettings,
  type Segment,
  type StationEdge,
  type StationNode,
  type StationSettings,
} from './station';
import { VersionSchema, VersionTextSchema } from './version';
import type { StationChange } from '../compute/station-changes';

/**
 * Bodies of the station model edits. Every edit carries the station `version` the editor loaded;
 * the server refuses a stale one with 409 instead of overwriting someone else's change.
 */
/** For DELETE, where the version travels in the query string. */
export const VersionQuerySchema = z.object({ version: VersionTextSchema });

export const StationIdParamsSchema = z.object({ id: z.coerce.number().int().positive() });
export const StationKeyParamsSchema = StationIdParamsSchema.extend({ key: KeySchema });
export const StationEdgeParamsSchema = StationIdParamsSchema.extend({
  edgeId: z.coerce.number().int().positive(),
});

const label = z.string().max(200);
const notes = z.string().max(4000);

export const CreateNodeInputSchema = z.strictObject({ version: VersionSchema, node: NodeSchema });
export type CreateNodeInput = z.infer<typeof CreateNodeInputSchema>;

/** The key is a node's identity (edges and plans name it): rename by deleting and creating. */
export const NodeChangesSchema = z.strictObject({
  kind: NodeKindSchema.optional(),
  label: label.nullable().optional(),
  position: Vec3Schema.optional(),
  /** null removes the normal (refused for a socket) */
  normal: Vec3Schema.nullable().optional(),
  notes: notes.nullable().optional(),
});
export const UpdateNodeInputSchema = z.strictObject({
  version: VersionSchema,
  node: NodeChangesSchema,
});
export type UpdateNodeInput = z.infer<typeof UpdateNodeInputSchema>;

export const CreateEdgeInputSchema = z.strictObject({ version: VersionSchema, edge: EdgeSchema });
export type CreateEdgeInput = z.infer<typeof CreateEdgeInputSchema>;

export const EdgeChangesSchema = z.strictObject({
  from: KeySchema.optional(),
  to: KeySchema.optional(),
  kind: EdgeKindSchema.optional(),
  /** null: derive the length from the node positions again */
  lengthM: FiniteSchema.refine((v) => v >= 0, 'length must not be negative')
    .nullable()
    .optional(),
  closed: z.boolean().optional(),
  label: label.nullable().optional(),
});
export const UpdateEdgeInputSchema = z.strictObject({
  version: VersionSchema,
  edge: EdgeChangesSchema,
});
export type UpdateEdgeInput = z.infer<typeof UpdateEdgeInputSchema>;

export const CreateHazardInputSchema = z.strictObject({
  version: VersionSchema,
  hazard: HazardSchema,
});
export type CreateHazardInput = z.infer<typeof CreateHazardInputSchema>;

/** Changing `shape` needs the new shape's fields (center and radiusM, or min and max). */
export const HazardChangesSchema = z.strictObject({
  kind: HazardKindSchema.optional(),
  label: label.nullable().optional(),
  shape: z.enum(['sphere', 'box']).optional(),
  center: Vec3Schema.optional(),
  radiusM: FiniteSchema.optional(),
  min: Vec3Schema.optional(),
  max: Vec3Schema.optional(),
});
export const UpdateHazardInputSchema = z.strictObject({
  version: VersionSchema,
  hazard: HazardChangesSchema,
});
export type UpdateHazardInput = z.infer<typeof UpdateHazardInputSchema>;

export const CreateSegmentInputSchema = z.strictObject({
  version: VersionSchema,
  segment: SegmentSchema,
});
export type CreateSegmentInput = z.infer<typeof CreateSegmentInputSchema>;

export const SegmentChangesSchema = z.strictObject({
  label: label.nullable().optional(),
  kind: SegmentKindSchema.optional(),
  center: Vec3Schema.optional(),
  size: SegmentSizeSchema.optional(),
  rotationDeg: Vec3Schema.nullable().optional(),
});
export const UpdateSegmentInputSchema = z.strictObject({
  version: VersionSchema,
  segment: SegmentChangesSchema,
});
export type UpdateSegmentInput = z.infer<typeof UpdateSegmentInputSchema>;

/** Name, orbit and settings; nested settings objects may be partial (merged over the current ones). */
export const UpdateStationInputSchema = z.strictObject({
  version: VersionSchema,
  name: z.string().trim().min(1, 'a station needs a name').max(200).optional(),
  orbit: OrbitSettingsSchema.partial().optional(),
  settings: z
    .strictObject({
      tetherLengthM: FiniteSchema.optional(),
      speedsMps: z
        .strictObject({ handrail: FiniteSchema, hop: FiniteSchema, ride: FiniteSchema })
        .partial()
        .optional(),
      hopSeconds: FiniteSchema.optional(),
      swapSeconds: FiniteSchema.optional(),
      carryFactor: FiniteSchema.optional(),
      reach: z
        .strictObject({
          standOffM: FiniteSchema,
          radiusM: FiniteSchema,
          yawStepDeg: FiniteSchema,
          pitchStepDeg: FiniteSchema,
        })
        .partial()
        .optional(),
    })
    .optional(),
  /** the station's arms, replaced as a whole list (each base must be a node of the station) */
  arms: z.array(ArmSchema).max(MAX_ARMS, `at most ${MAX_ARMS} arms`).optional(),
});
export type UpdateStationInput = z.infer<typeof UpdateStationInputSchema>;

export const AuditQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

/** Drops the keys whose value is null (a cleared optional field) from a merged object. */
function withoutNulls<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== null && v !== undefined)) as T;
}

type Changes<T> = { [K in keyof T]?: T[K] | null };

export function mergeNodeChanges(node: StationNode, changes: Changes<StationNode>): unknown {
  return withoutNulls({ ...node, ...changes, key: node.key });
}

export function mergeEdgeChanges(edge: StationEdge, changes: Changes<StationEdge>): unknown {
  return withoutNulls({ ...edge, ...changes });
}

export function mergeSegmentChanges(segment: Segment, changes: Changes<Segment>): unknown {
  return withoutNulls({ ...segment, ...changes, key: segment.key });
}

const SHAPE_FIELDS = { sphere: ['center', 'radiusM'], box: ['min', 'max'] } as const;

/** A change of shape drops the old shape's fields, so the new ones must come with the change. */
export function mergeHazardChanges(hazard: Hazard, changes: Record<string, unknown>): unknown {
  const merged: Record<string, unknown> = { ...hazard, ...changes, key: hazard.key };
  if (changes.shape && changes.shape !== hazard.shape) {
    for (const f of SHAPE_FIELDS[hazard.shape]) if (!(f in changes)) delete merged[f];
  }
  return withoutNulls(merged);
}

export function mergeStationSettings(
  settings: StationSettings,
  changes: UpdateStationInput['settings'],
): unknown {
  if (!changes) return settings;
  return {
    ...settings,
    ...changes,
    speedsMps: { ...settings.speedsMps, ...changes.speedsMps },
    reach: { ...settings.reach, ...changes.reach },
  };
}

export function mergeOrbit(orbit: OrbitSettings, changes: UpdateStationInput['orbit']): unknown {
  return { ...orbit, ...changes };
}

/** What the API says about a station (list, detail, and the `station` of import and graph). */
export interface StationSummary {
  id: number;
  name: string;
  version: number;
  orbit: OrbitSettings;
  settings: StationSettings;
  counts: StationCounts;
  createdAt: string;
  updatedAt: string;
  updatedBy: { id: number; name: string } | null;
}

export interface StationCounts {
  nodes: number;
  edges: number;
  hazards: number;
  segments: number;
}

export interface ImportStationResult {
  station: StationSummary;
  counts: StationCounts;
}

/**
 * `POST /api/stations/import?dryRun=1`: the document read and checked, nothing written; the stations
 * already named as it is (so the importer can rename it, replace one of them, or stop).
 */
export interface ImportStationPreview {
  dryRun: true;
  name: string;
  counts: StationCounts;
  sameName: Pick<StationSummary, 'id' | 'name' | 'version'>[];
}

/** An edge in the graph view: its id for edits, and its length resolved (given, or from the positions). */
export interface GraphEdge {
  id: number;
  from: string;
  to: string;
  kind: StationEdge['kind'];
  lengthM: number;
  lengthGiven: boolean;
  closed: boolean;
  label?: string;
}

export interface StationGraph {
  station: StationSummary;
  segments: Segment[];
  nodes: StationNode[];
  edges: GraphEdge[];
  hazards: Hazard[];
  arms: Arm[];
}

export interface StationAuditEntry {
  id: number;
  action: string;
  target: string | null;
  user: { id: number; name: string } | null;
  before: unknown;
  after: unknown;
  versionAfter: number;
  createdAt: string;
}

/** A row of `GET /api/stations/:id/versions`: one kept version and what its write changed, in short. */
export interface StationVersionEntry {
  version: number;
  action: string;
  user: { id: number; name: string } | null;
  /** the change in a few words per kind ("2 nodes added", "settings changed") */
  summary: string[];
  createdAt: string;
}

/** `GET /api/stations/:id/versions/:version`: the version with its whole change. */
export interface StationVersionDetail extends StationVersionEntry {
  change: StationChange;
}

export interface StationVersionList {
  stationId: number;
  currentVersion: number;
  /** the oldest version kept (a station made before versions were kept starts its history later) */
  firstKeptVersion: number | null;
  items: StationVersionEntry[];
  total: number;
  page: number;
  pageSize: number;
}
