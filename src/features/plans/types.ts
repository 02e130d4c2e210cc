import type { Plan, PlanStatus } from '@shared/schemas/plan';
import type { ReachResult } from '@shared/schemas/sockets';
import type { InventoryWarning } from '@shared/compute/inventory';
import type { Timeline } from '@shared/compute/timeline';

/** `GET /api/plans/:id`: the plan with the names the server joins in. */
export interface PlanView extends Plan {
  stationName: string;
  authorName: string | null;
  approverName: string | null;
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
  reach: ReachResult | null;
}

export interface ReachWarning {
  code: 'socket-out-of-reach' | 'socket-unusable';
  message: string;
  taskIndex: number;
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

/** What the plan screens need to know about the plan's station; the route module supplies it. */
export interface StationChoice {
  id: number;
  name: string;
  tetherLengthM: number;
}

export interface StationNodeOption {
  key: string;
  label?: string;
  position: [number, number, number];
}

export interface PlanStationNodes {
  worksites: StationNodeOption[];
  sockets: StationNodeOption[];
}
