import type { PlanTimeline, PlanView } from '@shared/schemas/plan-views';
import type { OrbitSettings } from '@shared/schemas/station';
export type { PlanListItem, PlanTimeline, PlanView } from '@shared/schemas/plan-views';
export type { TaskReach } from '@shared/compute/day/types';

/** What the plan screens need to know about the plan's station; the route module supplies it. */
export interface StationChoice {
  id: number;
  name: string;
  tetherLengthM: number;
  /** to read the plan's start against orbital sunrise and sunset */
  orbit: OrbitSettings;
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
  /** the station's robotic arms, for a task done from one */
  arms?: { key: string; label?: string; baseNode: string }[];
}

/** A stretch of the day to go to and frame in the 3D day: a block picked on the chart. */
export interface DayFocus {
  crew: 'EV1' | 'EV2';
  start: number;
  end: number;
}

/** The plan's day in 3D beside the chart, composed by the route (the scene is another feature's). */
export interface DayViewProps {
  timeline: PlanTimeline;
  plan: PlanView;
  focus: DayFocus | null;
  /** the 3D day's clock, for the chart's cursor */
  onTime: (t: number) => void;
}
