import type { CrewMember, ManifestKind } from '../../schemas/plan';
import type { ItemWhere, Timeline, TimelineWarning } from './types';

/**
 * The figures of a day that a series or a comparison reads: its end, margin and warnings, each crew
 * member's total and swaps, and where every item is at the end. Small enough to cross from the
 * thread that computed the day (a whole timeline is megabytes for a long day).
 */
export interface DaySummary {
  endSeconds: number;
  marginSeconds: number;
  timeLimitSeconds: number;
  warnings: TimelineWarning[];
  crew: Record<CrewMember, { totalSeconds: number; swapCount: number }>;
  /** each item where the day leaves it */
  itemsAtEnd: { item: string; name: string; kind: ManifestKind; where: ItemWhere }[];
}

export function summaryOf(t: Timeline): DaySummary {
  const crew = (m: CrewMember) => ({ totalSeconds: t.crew[m].totalSeconds, swapCount: t.crew[m].swapCount });
  return {
    endSeconds: t.endSeconds,
    marginSeconds: t.marginSeconds,
    timeLimitSeconds: t.timeLimitSeconds,
    warnings: t.warnings,
    crew: { EV1: crew('EV1'), EV2: crew('EV2') },
    itemsAtEnd: t.equipment.map((e) => ({
      item: e.item,
      name: e.name,
      kind: e.kind,
      where: e.states[e.states.length - 1].where,
    })),
  };
}
