import type { Plan, PlanStatus } from './plan';
import type { Timeline } from '../compute/day/types';
import type { PlanTouch } from '../compute/plan-touches';
import type { DayNote } from '../compute/station-notes';

export type { PlanTouch };

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
  /** approved, and the station has changed since: the day is still computed on the approved version */
  stationChangedSinceApproval?: boolean;
  stationChanges?: PlanTouch[];
  /** the station's open notes pinned to nodes the day passes through or uses, with where */
  stationNotes?: DayNote[];
  planVersion: number;
  stationId: number;
  stationVersion: number;
  airlockKey: string;
  caution: string;
}

/** A plan in review or approved that a station write touches. */
export interface AffectedPlan {
  id: number;
  title: string;
  status: 'in-review' | 'approved';
}

/** A station write listed on a plan it touched while the plan was in review or approved. */
export interface PlanStationNotice {
  id: number;
  /** the station version the write made */
  stationVersion: number;
  planStatus: PlanStatus;
  user: { id: number; name: string } | null;
  summary: string;
  touches: PlanTouch[];
  createdAt: string;
}

/** What a plan says about its station (on `GET /api/plans/:id` and its timeline). */
export interface PlanChangeControl {
  /** the station version the plan is computed on: the approved one for an approved plan, else the current */
  stationVersion: number;
  currentStationVersion: number;
  /** approved, and the station has changed since the approval */
  stationChangedSinceApproval: boolean;
  /** the changes since approval that touch the plan's tasks, routes and sockets */
  stationChanges: PlanTouch[];
  stationNotices: PlanStationNotice[];
}

/** A row of `GET /api/plans/:id/revisions`: the plan as one change or review step left it. */
export interface PlanRevisionEntry {
  version: number;
  action: string;
  user: { id: number; name: string } | null;
  createdAt: string;
}

/** `GET /api/plans/:id`. */
export type PlanDetail = PlanView &
  PlanChangeControl & {
    /** the plan's version at its submission before the last: reviewers compare it with this one */
    previousSubmissionVersion: number | null;
  };

/** A station write's answer adds the reviewed plans it touched (a dry run: would touch; nothing written). */
export interface StationWriteNotice {
  affectedPlans: AffectedPlan[];
}
