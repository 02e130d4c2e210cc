import {
  PLAN_SETTING_KEYS,
  planSettingsOf,
  type ManifestItem,
  type PlanSettings,
  type Task,
  type UpdatePlanInput,
} from '@shared/schemas/plan';
import { formatElapsed, formatLength } from '@shared/compute/units';
import type { PlanView } from '../types';

/** The fields the editor changes; the station stays fixed once tasks name its nodes. */
export const DRAFT_KEYS = ['title', 'date', 'crew', ...PLAN_SETTING_KEYS, 'tasks', 'manifest'] as const;

export type PlanDraft = Pick<PlanView, 'title' | 'date' | 'crew' | 'tasks' | 'manifest'> & PlanSettings;

export function draftFromPlan(plan: PlanView): PlanDraft {
  return {
    title: plan.title,
    date: plan.date,
    crew: structuredClone(plan.crew),
    ...planSettingsOf(plan),
    tasks: structuredClone(plan.tasks),
    manifest: structuredClone(plan.manifest),
  };
}

/** Key order and absent-vs-undefined must not count as a change. */
function canonical(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) =>
    v && typeof v === 'object' && !Array.isArray(v)
      ? Object.fromEntries(
          Object.entries(v as Record<string, unknown>)
            .filter(([, x]) => x !== undefined)
            .sort(([a], [b]) => a.localeCompare(b)),
        )
      : v,
  );
}

export const sameValue = (a: unknown, b: unknown) => canonical(a) === canonical(b);

/** The PATCH body for what the draft changed against `base`, or null when nothing did. */
export function draftChanges(base: PlanDraft, draft: PlanDraft, version: number): UpdatePlanInput | null {
  const changed = DRAFT_KEYS.filter((k) => !sameValue(base[k], draft[k]));
  if (changed.length === 0) return null;
  return Object.fromEntries([...changed.map((k) => [k, draft[k]]), ['version', version]]) as UpdatePlanInput;
}

/** `list` with the item at `from` moved to `to`; out-of-range moves return the list unchanged. */
export function moveItem<T>(list: readonly T[], from: number, to: number): T[] {
  const next = [...list];
  if (from < 0 || from >= list.length || to < 0 || to >= list.length || from === to) return next;
  const [item] = next.splice(from, 1);
  next.splice(to, 0, item);
  return next;
}

const q = (s: string) => `“${s}”`;

const TASK_FIELDS: { key: keyof Task; label: string; show: (t: Task) => string }[] = [
  { key: 'title', label: 'title', show: (t) => q(t.title) },
  { key: 'worksite', label: 'worksite', show: (t) => t.worksite },
  { key: 'crew', label: 'crew', show: (t) => t.crew },
  { key: 'durationSeconds', label: 'duration', show: (t) => formatElapsed(t.durationSeconds) },
  { key: 'eclipseOnly', label: 'eclipse-only', show: (t) => (t.eclipseOnly ? 'yes' : 'no') },
  { key: 'carrying', label: 'carrying', show: (t) => (t.carrying ? 'yes' : 'no') },
  { key: 'socket', label: 'socket', show: (t) => t.socket ?? 'none' },
  { key: 'sockets', label: 'sockets', show: (t) => (t.sockets ? JSON.stringify(t.sockets) : 'none') },
  { key: 'actions', label: 'item actions', show: (t) => String(t.actions.length) },
  { key: 'tools', label: 'tools', show: (t) => t.tools.join(', ') || 'none' },
  { key: 'after', label: 'starts after', show: (t) => t.after.join(', ') || 'none' },
  { key: 'optional', label: 'optional', show: (t) => (t.optional ? 'yes' : 'no') },
  { key: 'notes', label: 'notes', show: (t) => (t.notes ? q(t.notes) : 'none') },
];

const ITEM_FIELDS: { key: keyof ManifestItem; label: string; show: (m: ManifestItem) => string }[] = [
  { key: 'name', label: 'name', show: (m) => q(m.name) },
  { key: 'kind', label: 'kind', show: (m) => m.kind },
  { key: 'quantity', label: 'quantity', show: (m) => String(m.quantity) },
  { key: 'carriedBy', label: 'carried by', show: (m) => m.carriedBy ?? 'nobody' },
  { key: 'startsAt', label: 'starts at', show: (m) => m.startsAt },
  { key: 'installedAt', label: 'installed at', show: (m) => m.installedAt ?? 'not installed' },
  { key: 'leaveOutside', label: 'end of day', show: (m) => (m.leaveOutside ? 'stays outside' : 'airlock') },
];

function listDifferences<T>(
  what: string,
  name: (item: T) => string,
  fields: { key: keyof T; label: string; show: (item: T) => string }[],
  mine: readonly T[],
  theirs: readonly T[],
): string[] {
  const out: string[] = [];
  if (mine.length !== theirs.length) out.push(`${what}: ${mine.length} in your copy, ${theirs.length} now`);
  for (let i = 0; i < Math.min(mine.length, theirs.length); i++) {
    const parts = fields
      .filter((f) => !sameValue(mine[i][f.key], theirs[i][f.key]))
      .map((f) => `${f.label} ${f.show(mine[i])} → ${f.show(theirs[i])}`);
    if (parts.length) out.push(`${what.replace(/s$/, '')} ${i + 1} ${name(theirs[i])}: ${parts.join('; ')}`);
  }
  return out;
}

/** Field by field, how the server's plan differs from the draft: "yours → theirs". */
export function describeDifferences(mine: PlanDraft, theirs: PlanDraft): string[] {
  const out: string[] = [];
  const scalar = (label: string, a: string, b: string) => {
    if (a !== b) out.push(`${label}: ${a} → ${b}`);
  };
  scalar('Title', q(mine.title), q(theirs.title));
  scalar('Date', mine.date, theirs.date);
  for (const slot of ['EV1', 'EV2'] as const) {
    scalar(`${slot} name`, mine.crew[slot].name, theirs.crew[slot].name);
    scalar(
      `${slot} tether`,
      formatLength(mine.crew[slot].tetherLengthM),
      formatLength(theirs.crew[slot].tetherLengthM),
    );
  }
  scalar('Route mode', mine.routeMode, theirs.routeMode);
  scalar(
    'Arm ride',
    mine.allowRide ? 'allowed' : 'not allowed',
    theirs.allowRide ? 'allowed' : 'not allowed',
  );
  scalar('Orbit phase at start', `${mine.orbitPhaseAtStartDeg}°`, `${theirs.orbitPhaseAtStartDeg}°`);
  const beta = (v: number | null) => (v === null ? 'station default' : `${v}°`);
  scalar('Beta angle', beta(mine.betaDegOverride), beta(theirs.betaDegOverride));
  const start = (v: string | null) => (v === null ? 'none' : `${v.slice(0, 16).replace('T', ' ')} GMT`);
  scalar('Start', start(mine.startGmt), start(theirs.startGmt));
  scalar('Time limit', formatElapsed(mine.timeLimitSeconds), formatElapsed(theirs.timeLimitSeconds));
  scalar('Egress', formatElapsed(mine.egressSeconds), formatElapsed(theirs.egressSeconds));
  scalar('Ingress', formatElapsed(mine.ingressSeconds), formatElapsed(theirs.ingressSeconds));
  out.push(...listDifferences('Tasks', (t) => q(t.title), TASK_FIELDS, mine.tasks, theirs.tasks));
  out.push(
    ...listDifferences('Manifest items', (m) => q(m.name), ITEM_FIELDS, mine.manifest, theirs.manifest),
  );
  return out;
}

/** `1:30` for the duration fields; whole minutes keep the h:mm form short. */
export function durationText(seconds: number): string {
  return seconds % 60 === 0 ? formatElapsed(seconds) : formatElapsed(seconds, { withSeconds: true });
}
