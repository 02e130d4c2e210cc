import { z } from 'zod';
import {
  CrewMemberSchema,
  ItemActionKindSchema,
  ItemActionSchema,
  ManifestItemSchema,
  MAX_ACTIONS_PER_TASK,
  TaskArmSchema,
  TaskCrewSchema,
  TaskSchema,
  withItemKeys,
  planReferenceProblems,
  type CrewMember,
  type ItemActionKind,
  type ManifestItem,
  type Task,
  type TaskCrew,
} from '@shared/schemas/plan';
import { durationField } from './form-fields';
import { durationText } from './plan-draft';

const blank = <T extends z.ZodType>(schema: T) => z.union([z.literal('').transform(() => undefined), schema]);

const KeyField = TaskSchema.shape.worksite;

const ActionRowSchema = z.object({
  do: ItemActionKindSchema,
  item: z.string().min(1, 'pick an item from the manifest'),
  by: blank(CrewMemberSchema),
  at: blank(ItemActionSchema.shape.at.unwrap()),
});

const TaskFieldsSchema = z.object({
  title: TaskSchema.shape.title,
  worksite: TaskSchema.shape.worksite,
  crew: TaskCrewSchema,
  duration: durationField(TaskSchema.shape.durationSeconds),
  eclipseOnly: z.boolean(),
  carrying: z.boolean(),
  socket: blank(KeyField),
  sockets: z.object({ EV1: blank(KeyField), EV2: blank(KeyField) }),
  tools: TaskSchema.shape.tools.unwrap(),
  after: TaskSchema.shape.after.unwrap(),
  optional: z.boolean(),
  /** done from an arm's foot restraint: '' for none */
  arm: z.object({
    key: z.string(),
    ingress: z.string(),
    egress: z.string(),
    rider: z.union([z.literal(''), CrewMemberSchema]),
  }),
  actions: z
    .array(ActionRowSchema)
    .max(MAX_ACTIONS_PER_TASK, `at most ${MAX_ACTIONS_PER_TASK} item actions per task`),
  notes: z.string().max(4000, 'notes must be at most 4000 characters'),
});

/** What the task form's fields hold: text and '' for "none", as the controls give them. */
export type TaskFormValues = z.input<typeof TaskFieldsSchema>;
/** A task as the form hands it over (the caller keeps its id). */
export type TaskFormTask = Omit<Task, 'id'>;

/** The foot-restraint sockets a task names, each member's for a task for both. */
function restraintOf(crew: TaskCrew, socket: string | undefined, sockets: Task['sockets']) {
  if (crew !== 'both') return socket ? { socket } : {};
  const own = Object.fromEntries(Object.entries(sockets ?? {}).filter(([, v]) => v)) as Task['sockets'];
  return own && Object.keys(own).length ? { sockets: own } : {};
}

/** The arm a task is done from, as the plan holds it; a rider is said only in a task for both. */
function armOf(crew: TaskCrew, arm: z.output<typeof TaskFieldsSchema>['arm']): Pick<Task, 'arm'> {
  if (!arm.key) return {};
  return {
    arm: {
      key: arm.key,
      ingress: arm.ingress.trim(),
      ...(arm.egress.trim() ? { egress: arm.egress.trim() } : {}),
      ...(crew === 'both' && arm.rider ? { rider: arm.rider } : {}),
    },
  };
}

function toTask(v: z.output<typeof TaskFieldsSchema>): TaskFormTask {
  return {
    title: v.title,
    worksite: v.worksite,
    crew: v.crew,
    durationSeconds: v.duration,
    eclipseOnly: v.eclipseOnly,
    carrying: v.carrying,
    // the rider stands in the arm's foot restraint; in a task for both the partner may have a socket
    ...restraintOf(
      v.crew,
      v.arm.key ? undefined : v.socket,
      v.arm.key ? { ...v.sockets, [v.arm.rider || 'EV1']: undefined } : v.sockets,
    ),
    ...armOf(v.crew, v.arm),
    tools: v.tools,
    actions: v.actions.map((a) => ({
      do: a.do,
      item: a.item,
      // a one-person task's member acts; `by` is only said in a task for both
      ...(a.by && v.crew === 'both' ? { by: a.by } : {}),
      ...(a.at && a.do !== 'hand-over' ? { at: a.at } : {}),
    })),
    after: v.after,
    optional: v.optional,
    ...(v.notes.trim() ? { notes: v.notes } : {}),
  };
}

/**
 * The task form's schema: the contract's field schemas, then the rules between a task and the
 * manifest (`planReferenceProblems`, the server's own check) reported on the fields they concern.
 */
export function taskFormSchema(manifest: readonly ManifestItem[]) {
  return TaskFieldsSchema.superRefine((v, ctx) => {
    if (!v.arm.key) return;
    // the plan's own schema says what a key must be; here only that the arm's fields are filled
    const ingress = TaskArmSchema.shape.ingress.safeParse(v.arm.ingress.trim());
    if (!ingress.success)
      ctx.addIssue({ code: 'custom', path: ['arm', 'ingress'], message: 'the node where the rider gets on' });
    const egress = v.arm.egress.trim();
    if (egress && !TaskArmSchema.shape.ingress.safeParse(egress).success)
      ctx.addIssue({ code: 'custom', path: ['arm', 'egress'], message: 'a node key, or blank' });
  })
    .transform(toTask)
    .superRefine((task, ctx) => {
      for (const p of planReferenceProblems([task], manifest)) {
        // `after` names the plan's other tasks, which the form does not hold: the editor offers only those
        if (p.path[0] !== 'tasks' || p.path[2] === 'after') continue;
        ctx.addIssue({ code: 'custom', path: p.path.slice(2), message: p.message });
      }
    });
}

/**
 * A task's tools as manifest keys where an item answers to them (a key, or a name in any case and
 * spacing), so the chips show what the day will find; anything else is kept as written.
 */
export function toolKeys(tools: readonly string[], manifest: readonly ManifestItem[]): string[] {
  const norm = (s: string) => s.trim().replace(/\s+/g, ' ').toLowerCase();
  const out = tools.map((t) => {
    const hit = manifest.find((m) => m.key === t) ?? manifest.find((m) => norm(m.name) === norm(t));
    return hit?.key ?? t;
  });
  return [...new Set(out)];
}

export function taskFormDefaults(task: Task | undefined, manifest: readonly ManifestItem[]): TaskFormValues {
  return {
    title: task?.title ?? '',
    worksite: task?.worksite ?? '',
    crew: task?.crew ?? 'both',
    duration: task ? durationText(task.durationSeconds) : '0:30',
    eclipseOnly: task?.eclipseOnly ?? false,
    carrying: task?.carrying ?? false,
    socket: (task?.crew !== 'both' && task?.socket) || '',
    // an older task for both names one socket: EV1 works from it
    sockets: {
      EV1: task?.sockets?.EV1 ?? (task?.crew === 'both' ? task.socket : undefined) ?? '',
      EV2: task?.sockets?.EV2 ?? '',
    },
    tools: toolKeys(task?.tools ?? [], manifest),
    actions: (task?.actions ?? []).map((a) => ({
      do: a.do,
      item: a.item,
      by: a.by ?? '',
      at: a.at ?? '',
    })),
    after: task?.after ?? [],
    optional: task?.optional ?? false,
    arm: {
      key: task?.arm?.key ?? '',
      ingress: task?.arm?.ingress ?? '',
      egress: task?.arm?.egress ?? '',
      rider: task?.arm?.rider ?? '',
    },
    notes: task?.notes ?? '',
  };
}

export const ACTION_NAMES: Record<ItemActionKind, string> = {
  'pick-up': 'Pick up',
  'set-down': 'Set down',
  install: 'Install',
  remove: 'Remove',
  'hand-over': 'Hand over to the partner',
};

/** The key a new item named `name` gets: from its name, unique beside the manifest's (keyless ones as the server will key them). */
export function uniqueItemKey(name: string, manifest: readonly Pick<ManifestItem, 'key' | 'name'>[]): string {
  const keyed = withItemKeys([...manifest, { name }]);
  return keyed[keyed.length - 1].key;
}

/** A new manifest item named in a task form: a tool, carried out by the member who needs it. */
export function newManifestItem(
  name: string,
  crew: TaskCrew,
  manifest: readonly ManifestItem[],
): { item: ManifestItem } | { error: string } {
  const parsed = ManifestItemSchema.shape.name.safeParse(name);
  if (!parsed.success) return { error: parsed.error.issues[0]?.message ?? 'not a name' };
  const key = uniqueItemKey(parsed.data, manifest);
  const carriedBy: CrewMember = crew === 'both' ? 'EV1' : crew;
  return {
    item: {
      key,
      name: parsed.data,
      kind: 'tool',
      quantity: 1,
      carriedBy,
      startsAt: 'airlock',
      leaveOutside: false,
    },
  };
}
