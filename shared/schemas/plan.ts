import { z } from 'zod';
import { DEFAULT_SETTINGS, FiniteSchema, KeySchema } from './station';
import { RouteModeSchema } from './route';
import { VersionSchema } from './version';

/** The plan API contract (DESIGN §2 Plan and Task, §8 plans endpoints). Times in seconds. */

const DAY_S = 24 * 3600;

/** Planned EVA length, about 6 h 30 min (CHECKS.md: space agency mission blogs). */
export const DEFAULT_TIME_LIMIT_SECONDS = 6.5 * 3600;
/** Planning defaults, from memory: suit checks and airlock depress/repress folded into one block each. */
export const DEFAULT_EGRESS_SECONDS = 30 * 60;
export const DEFAULT_INGRESS_SECONDS = 30 * 60;
export const MAX_TASKS = 200;
export const MAX_MANIFEST_ITEMS = 200;
export const MAX_TOOLS_PER_TASK = 50;

export const CREW_MEMBERS = ['EV1', 'EV2'] as const;
export const CrewMemberSchema = z.enum(CREW_MEMBERS);
export type CrewMember = z.infer<typeof CrewMemberSchema>;

export const TaskCrewSchema = z.enum(['EV1', 'EV2', 'both']);
export type TaskCrew = z.infer<typeof TaskCrewSchema>;

export const PLAN_STATUSES = ['draft', 'in-review', 'approved'] as const;
export const PlanStatusSchema = z.enum(PLAN_STATUSES);
export type PlanStatus = z.infer<typeof PlanStatusSchema>;

export const MANIFEST_KINDS = ['tool', 'bag'] as const;
export const ManifestKindSchema = z.enum(MANIFEST_KINDS);
export type ManifestKind = z.infer<typeof ManifestKindSchema>;

/** `endsAt` / `startsAt` value meaning "the station's airlock", whatever its node key. */
export const AIRLOCK_LOCATION = 'airlock';

const IdSchema = z.number().int('must be a whole number').positive('must be positive');
const text = (what: string, max: number) =>
  z.string().trim().min(1, `${what} must not be empty`).max(max, `${what} must be at most ${max} characters`);
const notes = z.string().max(4000, 'notes must be at most 4000 characters');
const seconds = (what: string, min: number) =>
  FiniteSchema.refine((v) => v >= min && v <= DAY_S, `${what} must be between ${min} and ${DAY_S} s (24 h)`);

export const CrewSlotSchema = z.strictObject({
  name: text('name', 100),
  tetherLengthM: FiniteSchema.refine(
    (v) => v > 0 && v <= 1000,
    'tether length must be greater than 0 and at most 1000 m',
  ).default(DEFAULT_SETTINGS.tetherLengthM),
});
export type CrewSlot = z.infer<typeof CrewSlotSchema>;

export const CrewSchema = z.strictObject({ EV1: CrewSlotSchema, EV2: CrewSlotSchema });
export type Crew = z.infer<typeof CrewSchema>;

export const TaskSchema = z.strictObject({
  id: IdSchema.optional(),
  title: text('title', 200),
  /** node key of the worksite */
  worksite: KeySchema,
  crew: TaskCrewSchema,
  durationSeconds: seconds('duration', 1).refine(
    Number.isInteger,
    'duration must be a whole number of seconds',
  ),
  /** e.g. mating connectors that carry solar-array power: only during orbital night */
  eclipseOnly: z.boolean().default(false),
  /** moving a large item: translation to this task is slowed by the station's carry factor */
  carrying: z.boolean().default(false),
  /** node key of the foot-restraint socket */
  socket: KeySchema.optional(),
  /** manifest item names */
  tools: z
    .array(text('tool name', 100))
    .max(MAX_TOOLS_PER_TASK, `at most ${MAX_TOOLS_PER_TASK} tools per task`)
    .default([]),
  notes: notes.optional(),
});
export type Task = z.infer<typeof TaskSchema>;
export type TaskInput = z.input<typeof TaskSchema>;

/** Where a manifest item is: the airlock (`airlock`) or a node key (a worksite or stow place). */
export const ItemLocationSchema = KeySchema;

export const ManifestItemSchema = z.strictObject({
  id: IdSchema.optional(),
  name: text('name', 100),
  kind: ManifestKindSchema,
  quantity: z
    .number()
    .int('quantity must be a whole number')
    .min(1, 'quantity must be at least 1')
    .max(100, 'quantity must be at most 100')
    .default(1),
  carriedBy: CrewMemberSchema,
  startsAt: ItemLocationSchema.default(AIRLOCK_LOCATION),
  /** left unset, the item is unaccounted for at the end of the day (the inventory check warns) */
  endsAt: ItemLocationSchema.optional(),
  notes: notes.optional(),
});
export type ManifestItem = z.infer<typeof ManifestItemSchema>;
export type ManifestItemInput = z.input<typeof ManifestItemSchema>;

/** The fields a planner edits, without defaults (PATCH must not reset what it leaves out). */
const planFields = {
  title: text('title', 200),
  stationId: IdSchema,
  date: z.iso.date('date must be an ISO date (YYYY-MM-DD)'),
  crew: CrewSchema,
  routeMode: RouteModeSchema,
  allowRide: z.boolean(),
  /** orbit phase when the EVA clock starts: 0° = orbital sunrise (see `dayNightWindows`) */
  orbitPhaseAtStartDeg: FiniteSchema.refine(
    (v) => v >= 0 && v < 360,
    'orbit phase must be at least 0 and below 360 degrees',
  ),
  /** replaces the station's default beta angle for this EVA */
  betaDegOverride: FiniteSchema.refine(
    (v) => v >= -90 && v <= 90,
    'beta angle must be between -90 and 90 degrees',
  ),
  timeLimitSeconds: seconds('time limit', 60),
  egressSeconds: seconds('egress block', 0),
  ingressSeconds: seconds('ingress block', 0),
  tasks: z.array(TaskSchema).max(MAX_TASKS, `at most ${MAX_TASKS} tasks`),
  manifest: z
    .array(ManifestItemSchema)
    .max(MAX_MANIFEST_ITEMS, `at most ${MAX_MANIFEST_ITEMS} manifest items`),
};

export const CreatePlanInputSchema = z.strictObject({
  ...planFields,
  routeMode: planFields.routeMode.default('balanced'),
  allowRide: planFields.allowRide.default(false),
  orbitPhaseAtStartDeg: planFields.orbitPhaseAtStartDeg.default(0),
  betaDegOverride: planFields.betaDegOverride.optional(),
  timeLimitSeconds: planFields.timeLimitSeconds.default(DEFAULT_TIME_LIMIT_SECONDS),
  egressSeconds: planFields.egressSeconds.default(DEFAULT_EGRESS_SECONDS),
  ingressSeconds: planFields.ingressSeconds.default(DEFAULT_INGRESS_SECONDS),
  tasks: planFields.tasks.default([]),
  manifest: planFields.manifest.default([]),
});
export type CreatePlanInput = z.infer<typeof CreatePlanInputSchema>;

/** PATCH body: any subset of the fields plus the `version` it was read at (stale → 409). */
export const UpdatePlanInputSchema = z.strictObject(planFields).partial().extend({
  // null clears the override
  betaDegOverride: planFields.betaDegOverride.nullable().optional(),
  version: VersionSchema,
});
export type UpdatePlanInput = z.infer<typeof UpdatePlanInputSchema>;

export const REVIEW_ACTIONS = ['submit', 'approve', 'return', 'comment'] as const;

export const ReviewCommentSchema = z.strictObject({
  id: IdSchema,
  authorId: IdSchema.nullable(),
  authorName: z.string().optional(),
  action: z.enum(REVIEW_ACTIONS),
  body: z.string().max(4000),
  createdAt: z.string(),
});
export type ReviewComment = z.infer<typeof ReviewCommentSchema>;

/** Body of `POST /api/plans/:id/submit|approve|return`; returning a plan needs a reason. */
export const ReviewActionInputSchema = z.strictObject({
  comment: z.string().trim().max(4000, 'comment must be at most 4000 characters').optional(),
});
export type ReviewActionInput = z.infer<typeof ReviewActionInputSchema>;

export const ReturnPlanInputSchema = z.strictObject({
  comment: text('comment', 4000),
});
export type ReturnPlanInput = z.infer<typeof ReturnPlanInputSchema>;

/** A plan as the API returns it. */
export const PlanSchema = z.strictObject({
  id: IdSchema,
  ...CreatePlanInputSchema.shape,
  betaDegOverride: planFields.betaDegOverride.nullable().optional(),
  status: PlanStatusSchema,
  version: VersionSchema,
  authorId: IdSchema.nullable(),
  approverId: IdSchema.nullable().optional(),
  submittedAt: z.string().nullable().optional(),
  approvedAt: z.string().nullable().optional(),
  createdAt: z.string(),
  updatedAt: z.string(),
  reviewComments: z.array(ReviewCommentSchema).default([]),
});
export type Plan = z.infer<typeof PlanSchema>;

/** The plan's scalar settings: stored together, edited and compared field by field. */
export const PLAN_SETTING_KEYS = [
  'routeMode',
  'allowRide',
  'orbitPhaseAtStartDeg',
  'betaDegOverride',
  'timeLimitSeconds',
  'egressSeconds',
  'ingressSeconds',
] as const;
type PlanSettingKey = (typeof PLAN_SETTING_KEYS)[number];

/** The settings with "no beta override" as null, which survives JSON where undefined does not. */
export type PlanSettings = Pick<Plan, Exclude<PlanSettingKey, 'betaDegOverride'>> & {
  betaDegOverride: number | null;
};

export function planSettingsOf(
  p: Pick<Plan, Exclude<PlanSettingKey, 'betaDegOverride'>> & { betaDegOverride?: number | null },
): PlanSettings {
  const settings = Object.fromEntries(PLAN_SETTING_KEYS.map((k) => [k, p[k]])) as PlanSettings;
  return { ...settings, betaDegOverride: p.betaDegOverride ?? null };
}

/** A row of `GET /api/plans`. */
export const PlanSummarySchema = PlanSchema.pick({
  id: true,
  title: true,
  stationId: true,
  date: true,
  status: true,
  version: true,
  authorId: true,
  updatedAt: true,
});
export type PlanSummary = z.infer<typeof PlanSummarySchema>;
