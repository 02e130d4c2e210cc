export type { PlanListItem, PlanTimeline, PlanView } from '@shared/schemas/plan-views';
export type { TaskReach } from '@shared/compute/day/types';

/** What the plan screens need to know about the plan's station; the route module supplies it. */
export interface StationChoice {
  id: number;
  name: string;
  tetherLengthM: number;
}

export interface StationNodeOption {
  key: string;
  label?: string;
  kind?: string;
  position: [number, number, number];
}

export interface PlanStationNodes {
  worksites: StationNodeOption[];
  sockets: StationNodeOption[];
  /** every node, for the places an item action may name */
  all?: StationNodeOption[];
}
