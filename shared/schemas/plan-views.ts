import type { Plan, PlanStatus } from './plan';
import type { ReachResult } from './sockets';
import type { InventoryWarning } from '../compute/inventory';
import type { Timeline } from '../compute/timeline';

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

export interface TaskReach {
  taskIndex: number;
  socket: string;
  worksite: string;
  /** null when the socket or worksite is not a usable node of the station (see the warnings) */
  reach: ReachResult | null;
}

export interface ReachWarning {
  code: 'socket-out-of-reach' | 'socket-unusable';
  message: string;
  taskIndex: number;
  /** sockets of the station that do reach the worksite, nearest first */
  reachingSockets?: string[];
}

/** `GET /api/plans/:id/timeline`: the shared timeline plus the server's inventory and reach checks. */
export interface PlanTimeline extends Timeline {
  planId: number;
  planVersion: number;
  stationId: number;
  stationVersion: number;
  airlockKey: string;
  inventoryWarnings: InventoryWarning[];
  reach: TaskReach[];
  reachWarnings: ReachWarning[];
  caution: string;
}
