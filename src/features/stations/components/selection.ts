import type { Vec3 } from '@shared/schemas/station';
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

/** The points that frame a selection: a node with its neighbours, an edge's ends, a hazard's box. */
export function selectionPoints(graph: StationGraph, selection: StationSelection): Vec3[] {
  if (!selection) return [];
  const at = (key: string) => graph.nodes.find((n) => n.key === key)?.position;
  const known = (points: (Vec3 | undefined)[]) => points.filter((p): p is Vec3 => p !== undefined);
  if (selection.type === 'node') {
    const near = edgesOf(graph, selection.key).map((e) => (e.from === selection.key ? e.to : e.from));
    return known([selection.key, ...near].map(at));
  }
  if (selection.type === 'edge') {
    const edge = graph.edges.find((e) => edgeKey(e) === selection.key);
    return edge ? known([at(edge.from), at(edge.to)]) : [];
  }
  const hazard = graph.hazards.find((h) => h.key === selection.key);
  if (!hazard) return [];
  if (hazard.shape === 'sphere') {
    const [x, y, z] = hazard.center;
    const r = hazard.radiusM;
    return [
      [x - r, y - r, z - r],
      [x + r, y + r, z + r],
    ];
  }
  return [hazard.min, hazard.max];
}
