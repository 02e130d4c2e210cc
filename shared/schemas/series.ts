import { z } from 'zod';
import type { OutsideItem, SeriesWarning } from '../compute/day/series';
import type { PlanStatus } from './plan';
import { VersionSchema } from './version';

export type { OutsideItem, SeriesWarning };

/** A series holds this many EVAs at the most (each view computes every one of their days). */
export const SERIES_PLANS_MAX = 12;

const PlanIdsSchema = z
  .array(z.number().int().positive())
  .min(1, 'a series has at least one plan')
  .max(SERIES_PLANS_MAX, `a series has at most ${SERIES_PLANS_MAX} plans`)
  .refine((ids) => new Set(ids).size === ids.length, 'a plan is in a series once');

const TitleSchema = z.string().trim().min(1, 'required').max(200);

export const CreateSeriesInputSchema = z.strictObject({ title: TitleSchema, planIds: PlanIdsSchema });
export type CreateSeriesInput = z.infer<typeof CreateSeriesInputSchema>;

/** Rename, or give the EVAs in their new order (added and removed plans included); `version` is checked. */
export const UpdateSeriesInputSchema = z.strictObject({
  version: VersionSchema,
  title: TitleSchema.optional(),
  planIds: PlanIdsSchema.optional(),
});
export type UpdateSeriesInput = z.infer<typeof UpdateSeriesInputSchema>;

/** One EVA of a series as the series view shows it: its day, with what carries over. */
export interface SeriesEva {
  planId: number;
  title: string;
  status: PlanStatus;
  version: number;
  date: string;
  endSeconds: number;
  marginSeconds: number;
  /** the plan's own warnings, computed with the carried-over start */
  warningCount: number;
  /** items this EVA finds outside at egress, left by an earlier EVA */
  foundOutside: OutsideItem[];
  /** everything outside after this EVA */
  outsideAfter: OutsideItem[];
  /** warnings the carried-over start brings about */
  carriedOver: SeriesWarning[];
}

export interface SeriesView {
  id: number;
  title: string;
  version: number;
  stationId: number | null;
  authorId: number | null;
  authorName: string | null;
  createdAt: string;
  updatedAt: string;
  evas: SeriesEva[];
}

export interface SeriesListItem {
  id: number;
  title: string;
  version: number;
  planIds: number[];
  updatedAt: string;
}
