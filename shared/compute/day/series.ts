import type { ManifestKind } from '../../schemas/plan';
import { describeWhere, initialWhere, sameWhere } from './items';
import { summaryOf, type DaySummary } from './summary';
import { computeTimeline } from './timeline';
import type {
  DayPlan,
  DayRouteFn,
  DayStart,
  DayStation,
  ItemWhere,
  Timeline,
  TimelineWarning,
} from './types';

/** One EVA of a series: its plan, and the station (version) and route engine it is computed on. */
export interface SeriesEvaInput {
  plan: DayPlan;
  station: DayStation;
  route: DayRouteFn;
}

/** An item outside the airlock between two EVAs, and which EVA (index in the series) put it there. */
export interface OutsideItem {
  item: string;
  name: string;
  kind: ManifestKind;
  where: ItemWhere;
  leftBy: number;
}

export type SeriesWarningCode = 'start-differs';

/**
 * A warning of one EVA of a series: a timeline warning the carried-over start brings about (the
 * same plan on its own does not have it), or a start that differs from what the plan's manifest says.
 */
export type SeriesWarning =
  | (TimelineWarning & { carriedOver: true })
  | { code: SeriesWarningCode; message: string; item: string; carriedOver: true };

export interface SeriesEvaDay {
  /** where the items of this EVA start, by key, when an earlier EVA of the series moved them */
  start: DayStart;
  /** the items this EVA finds outside at egress, left there by an earlier EVA */
  foundOutside: OutsideItem[];
  timeline: Timeline;
  /** what is outside after this EVA: every item of the series, whichever EVA left it */
  outsideAfter: OutsideItem[];
  warnings: SeriesWarning[];
}

const sameWarning = (a: TimelineWarning, b: TimelineWarning) =>
  a.code === b.code && a.taskIndex === b.taskIndex && a.crew === b.crew && a.item === b.item;

/** In the airlock or in a crew member's hands at egress: either way, inside when the day begins. */
const inside = (w: ItemWhere) => w.kind === 'airlock' || w.kind === 'carried';

/** Warnings of `withStart` the same plan computed alone does not have: those the carried-over start brings. */
export function carriedOverWarnings(
  withStart: readonly TimelineWarning[],
  alone: readonly TimelineWarning[],
): SeriesWarning[] {
  return withStart
    .filter((w) => !alone.some((a) => sameWarning(a, w)))
    .map((w) => ({ ...w, carriedOver: true as const }));
}

/**
 * The state a series carries from one EVA to the next: where each item was left, and by which EVA.
 * `begin` gives an EVA's start from the ones before; `end` takes where its day left the items. The
 * days themselves are computed by the caller, here or on another thread.
 */
export class SeriesChain {
  private readonly world = new Map<string, OutsideItem>();

  /** Where the next EVA's items start (those an earlier EVA had), what it finds outside, and the starts that differ. */
  begin(plan: Pick<DayPlan, 'manifest'>, airlockKey: string) {
    const items: Record<string, ItemWhere> = {};
    const foundOutside: OutsideItem[] = [];
    const warnings: SeriesWarning[] = [];
    for (const item of plan.manifest) {
      const before = this.world.get(item.key);
      if (!before) continue;
      items[item.key] = before.where;
      const declared = initialWhere(item, airlockKey);
      if (!inside(before.where)) foundOutside.push({ ...before, name: item.name, kind: item.kind });
      if (inside(declared) ? !inside(before.where) : !sameWhere(declared, before.where)) {
        warnings.push({
          code: 'start-differs',
          message: `${item.name}: this plan's manifest has it ${describeWhere(declared)} at egress, but EVA ${before.leftBy + 1} leaves it ${describeWhere(before.where)}; the day starts with it there`,
          item: item.key,
          carriedOver: true,
        });
      }
    }
    const start: DayStart = Object.keys(items).length ? { items } : {};
    return { start, foundOutside, warnings };
  }

  /** EVA `index` left its items so: what is outside after it (every item of the series, whichever EVA left it). */
  end(index: number, itemsAtEnd: DaySummary['itemsAtEnd']): OutsideItem[] {
    for (const { item, name, kind, where } of itemsAtEnd) {
      const was = this.world.get(item);
      const moved = !was || !sameWhere(was.where, where);
      this.world.set(item, { item, name, kind, where, leftBy: moved ? index : was.leftBy });
    }
    return [...this.world.values()].filter((w) => !inside(w.where));
  }
}

/**
 * The EVAs of a series in order, each computed by the one timeline pass with its items starting where
 * the EVAs before left them: an item of an EVA's manifest that shares its key with an item an earlier
 * EVA had starts at that EVA's end state (an installed restraint or anchor stays installed, a bag set
 * down stays at its node, an item brought in is in the airlock). Items no later EVA names stay where
 * they were left. Warnings that only the carried-over start brings about are listed per EVA.
 */
export function computeSeries(evas: readonly SeriesEvaInput[]): SeriesEvaDay[] {
  const chain = new SeriesChain();
  return evas.map(({ plan, station, route }, index) => {
    const { start, foundOutside, warnings } = chain.begin(plan, station.airlockKey);
    const timeline = computeTimeline(plan, station, route, start);
    if (start.items)
      warnings.push(
        ...carriedOverWarnings(timeline.warnings, computeTimeline(plan, station, route).warnings),
      );
    const outsideAfter = chain.end(index, summaryOf(timeline).itemsAtEnd);
    return { start, foundOutside, timeline, outsideAfter, warnings };
  });
}
