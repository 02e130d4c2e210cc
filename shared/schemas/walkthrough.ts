import { z } from 'zod';
import type { ArmLane, EquipmentTrack } from '../compute/day/types';
import type { CrewTrack } from '../compute/walkthrough';
import type { StepNote } from '../compute/station-notes';
import type { OrbitWindow } from '../compute/orbit';
import type { CrewMember, PlanStatus } from './plan';
import { RouteRequestSchema, type RouteMode } from './route';
import type { Vec3 } from './station';
import { VersionSchema, VersionTextSchema } from './version';

/** The walkthrough API contract: a walkthrough of a plan or a route, its playback and trainer notes. */

export const MAX_NOTE_LENGTH = 2000;
export const MAX_NOTES = 2000;

const IdSchema = z.number().int('must be a whole number').positive('must be positive');
const NameSchema = z
  .string()
  .trim()
  .min(1, 'name must not be empty')
  .max(200, 'name must be at most 200 characters');

/** Step ids as `shared/compute/walkthrough.ts` makes them: `EV1-3`, `EV2-10`, `r-4`. */
export const StepIdSchema = z
  .string()
  .regex(/^(EV1|EV2|r)-[1-9]\d{0,4}$/, 'not a step id (like EV1-3 or r-4)');

/** A route rehearsed on its own: the same body as `POST /api/stations/:id/routes`. */
export const WalkthroughRouteSpecSchema = RouteRequestSchema;
export type WalkthroughRouteSpec = z.infer<typeof WalkthroughRouteSpecSchema>;

export const CreateWalkthroughInputSchema = z
  .strictObject({
    name: NameSchema,
    stationId: IdSchema,
    planId: IdSchema.optional(),
    route: WalkthroughRouteSpecSchema.optional(),
  })
  .refine((v) => (v.planId === undefined) !== (v.route === undefined), {
    message: 'give either planId or route, not both',
    path: ['planId'],
  });
export type CreateWalkthroughInput = z.infer<typeof CreateWalkthroughInputSchema>;

const NotesSchema = z
  .record(
    StepIdSchema,
    z.string().max(MAX_NOTE_LENGTH, `a note must be at most ${MAX_NOTE_LENGTH} characters`),
  )
  .refine((v) => Object.keys(v).length <= MAX_NOTES, `at most ${MAX_NOTES} notes`);
export type WalkthroughNotes = z.infer<typeof NotesSchema>;

/**
 * PATCH body. `notes` is merged into the saved notes; an empty (or blank) text removes that step's
 * note. `rebase` accepts the current plan (or station) version as the one the notes are based on.
 */
export const UpdateWalkthroughInputSchema = z.strictObject({
  version: VersionSchema,
  name: NameSchema.optional(),
  notes: NotesSchema.optional(),
  rebase: z.literal(true).optional(),
});
export type UpdateWalkthroughInput = z.infer<typeof UpdateWalkthroughInputSchema>;

export const DeleteWalkthroughQuerySchema = z.strictObject({
  version: VersionTextSchema.optional(),
});

export type WalkthroughKind = 'plan' | 'route';

export interface WalkthroughPlanRef {
  id: number;
  title: string;
  status: PlanStatus;
  version: number;
}

/** A saved walkthrough as stored. */
export interface Walkthrough {
  id: number;
  name: string;
  kind: WalkthroughKind;
  stationId: number;
  stationName: string;
  planId: number | null;
  plan: WalkthroughPlanRef | null;
  route: WalkthroughRouteSpec | null;
  basedOnVersion: number;
  notes: WalkthroughNotes;
  version: number;
  authorId: number | null;
  authorName: string | null;
  createdAt: string;
  updatedAt: string;
}

/** A row of `GET /api/walkthroughs`. */
export interface WalkthroughSummary {
  id: number;
  name: string;
  kind: WalkthroughKind;
  stationId: number;
  stationName: string;
  plan: WalkthroughPlanRef | null;
  /** e.g. "AL-1 → T2-W1, fewest swaps" */
  routeSummary: string | null;
  authorName: string | null;
  updatedAt: string;
  noteCount: number;
  /** the plan (or station, for a route) has a newer version than the notes were written against */
  stale: boolean;
}

interface PlaybackCommon {
  endSeconds: number;
  /** positions of every node the playback names */
  positions: Record<string, Vec3>;
  /** orbital night windows in EVA elapsed time (a route alone has no clock: empty) */
  nightWindows: OrbitWindow[];
  warnings: string[];
}

export interface PlanPlayback extends PlaybackCommon {
  kind: 'plan';
  crews: Record<CrewMember, CrewTrack>;
  crewNames: Record<CrewMember, string>;
  tetherLengthM: Record<CrewMember, number>;
  timeLimitSeconds: number;
  airlockKey: string;
  /** every manifest item through the day, as the timeline has it (states tile [0, day end]) */
  equipment: EquipmentTrack[];
  /** outward normals of the sockets an item is installed in, to stand the restraint on */
  normals: Record<string, Vec3>;
  /** the arms the day uses: base, shell and every move of the tip (absent in older answers) */
  arms?: ArmLane[];
}

export interface RoutePlayback extends PlaybackCommon {
  kind: 'route';
  track: CrewTrack;
  tetherLengthM: number;
  mode: RouteMode;
  lengthM: number;
  swapCount: number;
}

export type WalkthroughPlayback = PlanPlayback | RoutePlayback;

/** `GET /api/walkthroughs/:id`: the saved walkthrough and its playback, derived now. */
export interface WalkthroughDetail {
  walkthrough: Walkthrough;
  /** null when the route cannot be found on the current station model any more */
  playback: WalkthroughPlayback | null;
  unavailableReason?: string;
  changedSince: boolean;
  /** what changed and what to do, when `changedSince` */
  notice?: string;
  /** version of the plan (or station) now */
  currentVersion: number;
  /** the station's open notes pinned to nodes the steps pass through or use, with those steps */
  stationNotes: StepNote[];
  caution: string;
}

const MODE_WORDS: Record<RouteMode, string> = {
  fastest: 'fastest',
  'fewest-swaps': 'fewest swaps',
  balanced: 'balanced',
};

export function routeSummaryText(route: WalkthroughRouteSpec): string {
  return `${route.from} → ${route.to}, ${MODE_WORDS[route.mode]}${route.carrying ? ', carrying' : ''}`;
}
