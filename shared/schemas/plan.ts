import { z } from 'zod';
import { DEFAULT_SETTINGS, FiniteSchema, KeySchema } from './station';
import { RouteModeSchema } from './route';
import { VersionSchema } from './version';

/**
 * The plan API contract: a plan, its tasks and manifest, and the bodies of the plans endpoints. Outside
 * scripts rely on it: fields may be added, none renamed or removed. Times in seconds.
 */

const DAY_S = 24 * 3600;

/** Planned EVA length, about 6 h 30 min (space agency mission blogs; a fact of the trade). */
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

/**
 * What a manifest item is. A `foot-restraint` (portable) is installed in a socket and stood in; a
 * `tether-anchor` (portable) installed at a node makes it an attach point for both crew members'
 * routes; while a crew member holds a `large-item` their translation is slowed by the carry factor.
 */
export const MANIFEST_KINDS = [
  'tool',
  'bag',
  'foot-restraint',
  'tether-anchor',
  'handling-aid',
  'large-item',
  'other',
] as const;
export const ManifestKindSchema = z.enum(MANIFEST_KINDS);
export type ManifestKind = z.infer<typeof ManifestKindSchema>;

/** `startsAt` value meaning "the station's airlock", whatever its node key. */
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

export const ITEM_ACTIONS = ['pick-up', 'set-down', 'install', 'remove', 'hand-over'] as const;
export const ItemActionKindSchema = z.enum(ITEM_ACTIONS);
export type ItemActionKind = z.infer<typeof ItemActionKindSchema>;
export const MAX_ACTIONS_PER_TASK = 50;

/**
 * What a task does with a manifest item. The precondition is checked when the task's work starts and
 * the effect applies when it ends. `by` defaults to the task's crew member (required for a task for
 * both when it matters who acts); `at` defaults to the worksite, or for a foot restraint being
 * installed or removed, to the socket the acting crew member works from. A hand-over (a task for
 * both) passes the item from `by` to the partner and takes no `at`.
 */
export const ItemActionSchema = z.strictObject({
  do: ItemActionKindSchema,
  /** the manifest item's key */
  item: KeySchema,
  by: CrewMemberSchema.optional(),
  /** node key: where the item is picked up, set down, installed or removed */
  at: KeySchema.optional(),
});
export type ItemAction = z.infer<typeof ItemActionSchema>;

/** The foot-restraint sockets of a task for both: one person per restraint; a member without one works from handrails. */
export const TaskSocketsSchema = z.strictObject({ EV1: KeySchema.optional(), EV2: KeySchema.optional() });
export type TaskSockets = z.infer<typeof TaskSocketsSchema>;

/**
 * A task done from the foot restraint on an arm's end: the crew member boards at `ingress`, the arm
 * moves its tip to the worksite, and brings them back to `egress` (default: `ingress`) where they
 * clip back to the station. In a task for both, `rider` says who is on the arm (default EV1); the
 * partner works from handrails or their own socket.
 */
export const TaskArmSchema = z.strictObject({
  /** the station's arm */
  key: KeySchema,
  /** node where the rider gets onto the arm */
  ingress: KeySchema,
  /** node where the rider gets off (an attach point, to clip back to the station) */
  egress: KeySchema.optional(),
  rider: CrewMemberSchema.optional(),
});
export type TaskArm = z.infer<typeof TaskArmSchema>;

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
  /** moving a large item: translation to this task is slowed by the carry factor (holding a large item does it too) */
  carrying: z.boolean().default(false),
  /** node key of the foot-restraint socket the crew member works from (a one-person task) */
  socket: KeySchema.optional(),
  /** a task for both: each member's socket */
  sockets: TaskSocketsSchema.optional(),
  /** manifest items the task needs at hand when it starts: item keys (or names) */
  tools: z
    .array(text('tool name', 100))
    .max(MAX_TOOLS_PER_TASK, `at most ${MAX_TOOLS_PER_TASK} tools per task`)
    .default([]),
  actions: z
    .array(ItemActionSchema)
    .max(MAX_ACTIONS_PER_TASK, `at most ${MAX_ACTIONS_PER_TASK} item actions per task`)
    .default([]),
  /** done from an arm's foot restraint */
  arm: TaskArmSchema.optional(),
  /** ids of tasks of the same plan that must end before this one starts its work */
  after: z.array(IdSchema).max(MAX_TASKS, `at most ${MAX_TASKS} tasks`).default([]),
  /** get-ahead work: done when the day has room, dropped when it runs late */
  optional: z.boolean().default(false),
  notes: notes.optional(),
});
export type Task = z.infer<typeof TaskSchema>;
export type TaskInput = z.input<typeof TaskSchema>;

/** Where a manifest item starts: the airlock (`airlock`) or a node key. */
export const ItemLocationSchema = KeySchema;

export const ManifestItemSchema = z.strictObject({
  id: IdSchema.optional(),
  /** plan-unique; given by the server from the name when left out */
  key: KeySchema.optional(),
  name: text('name', 100),
  kind: ManifestKindSchema,
  quantity: z
    .number()
    .int('quantity must be a whole number')
    .min(1, 'quantity must be at least 1')
    .max(100, 'quantity must be at most 100')
    .default(1),
  /** an item that starts in the airlock is carried out at egress by this crew member (else it stays in) */
  carriedBy: CrewMemberSchema.optional(),
  /** `airlock`, or a node where the item waits outside (staged by an earlier EVA) */
  startsAt: ItemLocationSchema.default(AIRLOCK_LOCATION),
  /** the item starts installed: a socket for a foot restraint, a node for a tether anchor */
  installedAt: KeySchema.optional(),
  /** staged outside for a later EVA: not back in the airlock at the end of the day is expected */
  leaveOutside: z.boolean().default(false),
  /**
   * Accepted from older clients and never stored: only `airlock` is meaningful (every item is
   * expected back); where an item is left outside is said by a task's set-down and `leaveOutside`.
   */
  endsAt: z.string().optional(),
  notes: notes.optional(),
});
export type ManifestItem = z.infer<typeof ManifestItemSchema>;
export type ManifestItemInput = z.input<typeof ManifestItemSchema>;

const INSTALLABLE: readonly ManifestKind[] = ['foot-restraint', 'tether-anchor'];

/** The name-derived key a keyless item gets: `Tool bag (large)` → `tool-bag-large`. */
export function itemKeyFromName(name: string): string {
  const slug = name
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 56)
    .replace(/-+$/, '');
  return slug || 'item';
}

/** Gives every keyless item a plan-unique key derived from its name; keyed items keep theirs. */
export function withItemKeys<T extends { key?: string; name: string }>(
  items: readonly T[],
): (T & { key: string })[] {
  const taken = new Set(items.flatMap((m) => (m.key ? [m.key] : [])));
  return items.map((m) => {
    if (m.key) return m as T & { key: string };
    const base = itemKeyFromName(m.name);
    let key = base;
    for (let n = 2; taken.has(key); n++) key = `${base}-${n}`;
    taken.add(key);
    return { ...m, key };
  });
}

/**
 * A task for both that names one `socket` (as plans did before each member had their own) means
 * EV1 works from that restraint and EV2 from handrails.
 */
export function withOwnSockets<T extends Pick<Task, 'crew' | 'socket' | 'sockets'>>(task: T): T {
  if (task.crew !== 'both' || task.socket === undefined || task.sockets !== undefined) return task;
  const { socket, ...rest } = task;
  return { ...rest, sockets: { EV1: socket } } as T;
}

export interface PlanProblem {
  /** zod-style path below the plan body: ['tasks', 2, 'actions', 0, 'item'] */
  path: (string | number)[];
  message: string;
}

type TaskOrderFields = Partial<Pick<Task, 'id' | 'title'>> & { after?: readonly number[] };

/**
 * The order rules between tasks: task ids are unique, and `after` names other tasks of the same plan
 * by id without ever leading back to the task it starts from (a task waiting, however indirectly, for
 * itself would never start). A loop is reported once, at the `after` entry that closes it.
 */
export function taskOrderProblems(tasks: readonly TaskOrderFields[]): PlanProblem[] {
  const problems: PlanProblem[] = [];
  const indexOf = new Map<number, number>();
  tasks.forEach((t, i) => {
    if (t.id === undefined) return;
    const first = indexOf.get(t.id);
    if (first === undefined) indexOf.set(t.id, i);
    else
      problems.push({
        path: ['tasks', i, 'id'],
        message: `duplicate task id ${t.id} (first at tasks[${first}])`,
      });
  });
  const name = (i: number) => `task ${i + 1}${tasks[i].title ? ` "${tasks[i].title}"` : ''}`;
  const edges = tasks.map((t, i) =>
    (t.after ?? []).flatMap((id, j) => {
      const k = indexOf.get(id);
      if (k === undefined) {
        problems.push({ path: ['tasks', i, 'after', j], message: `no task of this plan has the id ${id}` });
        return [];
      }
      if (k === i) {
        problems.push({ path: ['tasks', i, 'after', j], message: 'a task cannot wait for itself' });
        return [];
      }
      return [{ j, k }];
    }),
  );
  // depth first over `after`: an edge to a task still on the path closes a loop
  const state = new Uint8Array(tasks.length);
  const path: number[] = [];
  const visit = (i: number) => {
    state[i] = 1;
    path.push(i);
    for (const { j, k } of edges[i]) {
      if (state[k] === 1) {
        const loop = [...path.slice(path.indexOf(k)), k].map(name);
        problems.push({
          path: ['tasks', i, 'after', j],
          message: `this makes a loop of tasks that each wait for the next: ${loop.join(' → ')}`,
        });
      } else if (state[k] === 0) visit(k);
    }
    path.pop();
    state[i] = 2;
  };
  tasks.forEach((_, i) => state[i] === 0 && visit(i));
  return problems;
}

/**
 * Rules between a plan's tasks and its manifest that no single field can check: item keys unique and
 * known to the actions that name them, `socket` only on a one-person task and `sockets` only on a task
 * for both, a hand-over only in a task for both, `by` one of the task's crew, `installedAt` only on
 * restraints and anchors, and the order rules of taskOrderProblems. Station rules (which nodes exist) are checked against the station elsewhere.
 */
export function planReferenceProblems(
  tasks: readonly (Pick<Task, 'crew' | 'socket' | 'sockets' | 'actions'> & {
    arm?: Task['arm'];
  } & TaskOrderFields)[],
  manifest: readonly Pick<ManifestItem, 'key' | 'name' | 'kind' | 'installedAt' | 'startsAt' | 'endsAt'>[],
): PlanProblem[] {
  const problems: PlanProblem[] = taskOrderProblems(tasks);
  const keyed = withItemKeys(manifest);
  const firstAt = new Map<string, number>();
  keyed.forEach((m, i) => {
    if (m.endsAt !== undefined && m.endsAt !== AIRLOCK_LOCATION) {
      problems.push({
        path: ['manifest', i, 'endsAt'],
        message: `an item is expected back in the airlock; to leave it at ${m.endsAt}, set it down there in a task and mark it to stay outside (leaveOutside)`,
      });
    }
    const first = firstAt.get(m.key);
    if (first !== undefined && manifest[i].key !== undefined) {
      problems.push({
        path: ['manifest', i, 'key'],
        message: `duplicate item key "${m.key}" (first at manifest[${first}])`,
      });
    } else if (first === undefined) firstAt.set(m.key, i);
    if (m.installedAt !== undefined && !INSTALLABLE.includes(m.kind)) {
      problems.push({
        path: ['manifest', i, 'installedAt'],
        message: `only a foot restraint or a tether anchor can start installed, not a ${m.kind}`,
      });
    }
  });
  const kindOf = new Map(keyed.map((m) => [m.key, m.kind]));
  tasks.forEach((t, i) => {
    const both = t.crew === 'both';
    if (both && t.socket !== undefined && t.sockets !== undefined) {
      problems.push({
        path: ['tasks', i, 'socket'],
        message: "a task for both names each member's restraint in `sockets` (one person per restraint)",
      });
    }
    if (!both && t.sockets !== undefined) {
      problems.push({
        path: ['tasks', i, 'sockets'],
        message: `\`sockets\` is for a task for both; a task for ${t.crew} names its restraint in \`socket\``,
      });
    }
    if (t.arm?.rider !== undefined && !both && t.arm.rider !== t.crew) {
      problems.push({
        path: ['tasks', i, 'arm', 'rider'],
        message: `${t.arm.rider} does not do this task (it is for ${t.crew})`,
      });
    }
    const rider: CrewMember | undefined = !t.arm
      ? undefined
      : t.crew === 'both'
        ? (t.arm.rider ?? 'EV1')
        : t.crew;
    if (rider !== undefined && (both ? t.sockets?.[rider] : t.socket) !== undefined) {
      problems.push({
        path: both ? ['tasks', i, 'sockets', rider] : ['tasks', i, 'socket'],
        message: `${rider} works from the arm's foot restraint in this task, not from a socket`,
      });
    }
    if (both && t.sockets?.EV1 !== undefined && t.sockets.EV1 === t.sockets.EV2) {
      problems.push({
        path: ['tasks', i, 'sockets', 'EV2'],
        message: `EV1 and EV2 cannot stand in one foot restraint (${t.sockets.EV1})`,
      });
    }
    t.actions.forEach((a, j) => {
      const at = (field: string) => ['tasks', i, 'actions', j, field];
      const kind = kindOf.get(a.item);
      if (kind === undefined) {
        problems.push({ path: at('item'), message: `no manifest item has the key "${a.item}"` });
      }
      if (a.by !== undefined && !both && a.by !== t.crew) {
        problems.push({ path: at('by'), message: `${a.by} does not do this task (it is for ${t.crew})` });
      }
      if (a.do === 'hand-over') {
        if (!both) {
          problems.push({
            path: at('do'),
            message: 'a hand-over needs both crew members: make it a task for both',
          });
        } else if (a.by === undefined) {
          problems.push({ path: at('by'), message: 'say who hands the item over (`by`: EV1 or EV2)' });
        }
        if (a.at !== undefined) {
          problems.push({ path: at('at'), message: 'a hand-over happens between the crew members: no `at`' });
        }
      }
      if ((a.do === 'install' || a.do === 'remove') && kind !== undefined && !INSTALLABLE.includes(kind)) {
        problems.push({
          path: at('do'),
          message: `only a foot restraint or a tether anchor can be ${a.do === 'install' ? 'installed' : 'removed'}, not a ${kind}`,
        });
      }
      if (both && a.by === undefined && a.do !== 'hand-over') {
        problems.push({ path: at('by'), message: 'in a task for both, say who acts (`by`: EV1 or EV2)' });
      }
      if (
        kind === 'foot-restraint' &&
        (a.do === 'install' || a.do === 'remove') &&
        a.at === undefined &&
        (both ? (a.by ? t.sockets?.[a.by] : undefined) : t.socket) === undefined
      ) {
        problems.push({
          path: at('at'),
          message: `say which socket the foot restraint is ${a.do === 'install' ? 'installed in' : 'removed from'} (\`at\`)`,
        });
      }
    });
  });
  return problems;
}

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
  /**
   * GMT when the EVA clock starts: an ISO date and time, or an ISO time of day (GMT on the plan's
   * date); kept as `YYYY-MM-DDTHH:MM:SSZ`
   */
  startGmt: z.union([z.iso.datetime({ offset: true }), z.iso.time()], {
    error: 'start must be an ISO date and time (2031-06-12T09:30:00Z) or a GMT time of day (09:30)',
  }),
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
  startGmt: planFields.startGmt.nullable().optional(),
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
  startGmt: planFields.startGmt.nullable().optional(),
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
  startGmt: z.string().nullable().optional(),
  status: PlanStatusSchema,
  version: VersionSchema,
  authorId: IdSchema.nullable(),
  approverId: IdSchema.nullable().optional(),
  submittedAt: z.string().nullable().optional(),
  approvedAt: z.string().nullable().optional(),
  /** the station version the plan was last submitted against, and approved against */
  submittedStationVersion: VersionSchema.nullable().optional(),
  approvedStationVersion: VersionSchema.nullable().optional(),
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
  'startGmt',
  'timeLimitSeconds',
  'egressSeconds',
  'ingressSeconds',
] as const;
type PlanSettingKey = (typeof PLAN_SETTING_KEYS)[number];

/** The settings with "no beta override" and "no start time" as null, which survives JSON where undefined does not. */
type NullableSetting = 'betaDegOverride' | 'startGmt';
export type PlanSettings = Pick<Plan, Exclude<PlanSettingKey, NullableSetting>> & {
  betaDegOverride: number | null;
  startGmt: string | null;
};

export function planSettingsOf(
  p: Pick<Plan, Exclude<PlanSettingKey, NullableSetting>> & {
    betaDegOverride?: number | null;
    startGmt?: string | null;
  },
): PlanSettings {
  const settings = Object.fromEntries(PLAN_SETTING_KEYS.map((k) => [k, p[k]])) as PlanSettings;
  return { ...settings, betaDegOverride: p.betaDegOverride ?? null, startGmt: p.startGmt ?? null };
}

/**
 * A plan's start as it is kept: `YYYY-MM-DDTHH:MM:SSZ` in GMT; a time of day alone is on `date`.
 * Null stays null (no start time).
 */
export function startGmtOn(value: string | null | undefined, date: string): string | null {
  if (value === null || value === undefined) return null;
  const iso = value.includes('T') ? value : `${date}T${value}Z`;
  return new Date(Date.parse(iso)).toISOString().replace(/\.\d{3}Z$/, 'Z');
}
