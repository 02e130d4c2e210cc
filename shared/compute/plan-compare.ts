import type { CrewMember, ManifestItem, Plan, Task } from '../schemas/plan';
import { PLAN_SETTING_KEYS } from '../schemas/plan';
import type { DaySummary } from './day/summary';
import { sameValue } from './station-changes';

/** A value before and after. */
export interface Change<T> {
  from: T;
  to: T;
}

/** One field of the plan that differs: `crew.EV1.tetherLengthM`, `routeMode`, `title`… */
export interface FieldChange extends Change<unknown> {
  field: string;
}

/** How a list of the plan changed: items added, removed, changed (with the fields), and whether the order moved. */
export interface ListChange<T> {
  added: T[];
  removed: T[];
  changed: { from: T; to: T; fields: string[] }[];
  reordered: boolean;
}

export interface CrewDayChange {
  endSeconds: Change<number>;
  marginSeconds: Change<number>;
  swapCount: Change<number>;
}

/** What changed between two revisions of a plan, and what it does to the day. */
export interface PlanComparison {
  from: number;
  to: number;
  settings: FieldChange[];
  tasks: ListChange<Task>;
  manifest: ListChange<ManifestItem>;
  day: {
    endSeconds: Change<number>;
    marginSeconds: Change<number>;
    warningCount: Change<number>;
    crew: Record<CrewMember, CrewDayChange>;
  };
}

export type PlanRevisionContent = Pick<
  Plan,
  'title' | 'date' | 'stationId' | 'crew' | 'tasks' | 'manifest' | (typeof PLAN_SETTING_KEYS)[number]
>;

/** Row ids change whenever a list is saved: a task or item is what it says, not its row. */
const withoutId = <T extends { id?: number }>({ id: _id, ...rest }: T) => rest;

/**
 * Names each item of a list: manifest items by key, tasks by title (the nth task of one title is
 * `title#n`), so the same task is recognised across saves that renumbered it.
 */
function identities<T>(list: readonly T[], name: (item: T) => string): string[] {
  const seen = new Map<string, number>();
  return list.map((item) => {
    const n = (seen.get(name(item)) ?? 0) + 1;
    seen.set(name(item), n);
    return n === 1 ? name(item) : `${name(item)}#${n}`;
  });
}

function compareList<T extends { id?: number }>(
  a: readonly T[],
  b: readonly T[],
  name: (item: T) => string,
): ListChange<T> {
  const aIds = identities(a, name);
  const bIds = identities(b, name);
  const inA = new Map(aIds.map((k, i) => [k, a[i]]));
  const inB = new Map(bIds.map((k, i) => [k, b[i]]));
  const out: ListChange<T> = { added: [], removed: [], changed: [], reordered: false };
  bIds.forEach((k, i) => {
    const before = inA.get(k);
    if (!before) return out.added.push(b[i]);
    const x = withoutId(before) as Record<string, unknown>;
    const y = withoutId(b[i]) as Record<string, unknown>;
    const fields = [...new Set([...Object.keys(x), ...Object.keys(y)])].filter((f) => !sameValue(x[f], y[f]));
    if (fields.length) out.changed.push({ from: before, to: b[i], fields });
  });
  aIds.forEach((k, i) => {
    if (!inB.has(k)) out.removed.push(a[i]);
  });
  const kept = aIds.filter((k) => inB.has(k));
  const keptAfter = bIds.filter((k) => inA.has(k));
  out.reordered = kept.some((k, i) => k !== keptAfter[i]);
  return out;
}

/** What a comparison reads of a day: a timeline, or its summary from the thread that computed it. */
export type DayFigures = Pick<
  DaySummary,
  'endSeconds' | 'marginSeconds' | 'timeLimitSeconds' | 'warnings' | 'crew'
>;

const crewEnd = (t: DayFigures, m: CrewMember) => t.crew[m].totalSeconds;

/** What changed from revision `a` (version `from`) to `b` (version `to`), given each one's day. */
export function comparePlanRevisions(
  from: number,
  a: PlanRevisionContent,
  dayA: DayFigures,
  to: number,
  b: PlanRevisionContent,
  dayB: DayFigures,
): PlanComparison {
  const settings: FieldChange[] = [];
  const field = (name: string, x: unknown, y: unknown) => {
    if (!sameValue(x, y)) settings.push({ field: name, from: x ?? null, to: y ?? null });
  };
  field('title', a.title, b.title);
  field('date', a.date, b.date);
  field('stationId', a.stationId, b.stationId);
  for (const m of ['EV1', 'EV2'] as const) {
    field(`crew.${m}.name`, a.crew[m].name, b.crew[m].name);
    field(`crew.${m}.tetherLengthM`, a.crew[m].tetherLengthM, b.crew[m].tetherLengthM);
  }
  // a setting an older revision lacks (a start time, say) is the same as one set to nothing
  for (const k of PLAN_SETTING_KEYS) field(k, a[k] ?? null, b[k] ?? null);
  const change = <T>(x: T, y: T): Change<T> => ({ from: x, to: y });
  const crewDay = (m: CrewMember): CrewDayChange => ({
    endSeconds: change(crewEnd(dayA, m), crewEnd(dayB, m)),
    marginSeconds: change(dayA.timeLimitSeconds - crewEnd(dayA, m), dayB.timeLimitSeconds - crewEnd(dayB, m)),
    swapCount: change(dayA.crew[m].swapCount, dayB.crew[m].swapCount),
  });
  return {
    from,
    to,
    settings,
    tasks: compareList(a.tasks, b.tasks, (t) => t.title),
    manifest: compareList(a.manifest, b.manifest, (m) => m.key ?? m.name),
    day: {
      endSeconds: change(dayA.endSeconds, dayB.endSeconds),
      marginSeconds: change(dayA.marginSeconds, dayB.marginSeconds),
      warningCount: change(dayA.warnings.length, dayB.warnings.length),
      crew: { EV1: crewDay('EV1'), EV2: crewDay('EV2') },
    },
  };
}
