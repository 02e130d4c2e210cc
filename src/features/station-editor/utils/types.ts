import type { StationGraph } from '@shared/schemas/station-edits';

/** A point the scene reports on a segment surface; each click is a new object. */
export interface SurfacePick {
  point: [number, number, number];
  normal: [number, number, number];
  segmentKey?: string;
}

/** The parts of the station graph the editor reads (the stations feature's graph fits it). */
export type EditableGraph = Pick<
  StationGraph,
  'station' | 'segments' | 'nodes' | 'edges' | 'hazards' | 'arms'
>;
