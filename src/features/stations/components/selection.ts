import type { GraphEdge, StationGraph } from '@shared/schemas/station-edits';

/** What is selected on the Station screen; edges are named by their id. */
export type StationSelection = { type: 'node' | 'edge' | 'hazard'; key: string } | null;

export const edgeKey = (edge: GraphEdge) => String(edge.id);

export function edgesOf(graph: StationGraph, nodeKey: string): GraphEdge[] {
  return graph.edges.filter((e) => e.from === nodeKey || e.to === nodeKey);
}

/** The props of a part of the screen that shows the station and moves the selection. */
export interface SelectionViewProps {
  graph: StationGraph;
  selection: StationSelection;
  onSelect: (s: StationSelection) => void;
}
