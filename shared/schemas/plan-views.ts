import type { Plan, PlanStatus } from './plan';
import type { Timeline } from '../compute/day/types';

/** `GET /api/plans/:id`: the plan with the names the server joins in. */
export interface PlanView extends Plan {
  stationName: string;
  authorName: string | null;
  approverName: string | null;
  /**
   * Who changed the plan since it was last approved (since it was created, if never): none of them
   * may approve it, its author included.
   */
  editors: { id: number; name: string | null }[];
}

/** A row of `GET /api/plans`. */
export interface PlanListItem {
  id: number;
  title: string;
  stationId: number;
  stationName: string;
  date: string;
  status: PlanStatus;
  version: number;
  authorId: number | null;
  authorName: string | null;
  updatedAt: string;
}

/** `GET /api/plans/:id/timeline`: the day computed in one pass, with what it was computed against. */
export interface PlanTimeline extends Timeline {
  planId: number;
  planVersion: number;
  stationId: number;
  stationVersion: number;
  airlockKey: string;
  caution: string;
}
