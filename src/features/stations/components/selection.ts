import {
  edgeAt,
  edgeIndexOf,
  edgesAtNode,
  graphArraysOf,
  nodeIndexOf,
  type GraphArrays,
} from '@shared/compute/graph-columns';
import type { Vec3 } from '@shared/schemas/station';
import type { GraphEdge, StationGraph } from '@shared/schemas/station-edits';

/** What is selected on the Station screen; edges are named by their id. */
export type StationSelection = { type: 'node' | 'edge' | 'hazard'; key: string } | null;

export const edgeKey = (edge: GraphEdge) => String(edge.id);

/** The index of the edge a selection key names in the graph's arrays, or -1. */
export const edgeIndexOfKey = (arrays: GraphArrays, key: string) => edgeIndexOf(arrays, Number(key));

/** The edges at a node, in the graph's order (made for this node alone). */
export function edgesOf(graph: StationGraph, nodeKey: string): GraphEdge[] {
  const arrays = graphArraysOf(graph);
  const i = nodeIndexOf(arrays).get(nodeKey);
  return i === undefined ? [] : Array.from(edgesAtNode(arrays, i), (e) => edgeAt(graph, e));
}

/** The props of a part of the screen that shows the station and moves the selection. */
export interface SelectionViewProps {
  graph: StationGraph;
  selection: StationSelection;
  onSelect: (s: StationSelection) => void;
}

/** The position of node `i` of the arrays. */
export const positionAt = ({ positions: p }: GraphArrays, i: number): Vec3 => [
  p[i * 3],
  p[i * 3 + 1],
  p[i * 3 + 2],
];

/** The points that frame a selection: a node with its neighbours, an edge's ends, a hazard's box. */
export function selectionPoints(graph: StationGraph, selection: StationSelection): Vec3[] {
  if (!selection) return [];
  const arrays = graphArraysOf(graph);
  if (selection.type === 'node') {
    const i = nodeIndexOf(arrays).get(selection.key);
    if (i === undefined) return [];
    const near = Array.from(edgesAtNode(arrays, i), (e) =>
      arrays.edgeFrom[e] === i ? arrays.edgeTo[e] : arrays.edgeFrom[e],
    );
    return [i, ...near].map((k) => positionAt(arrays, k));
  }
  if (selection.type === 'edge') {
    const e = edgeIndexOfKey(arrays, selection.key);
    return e < 0 ? [] : [positionAt(arrays, arrays.edgeFrom[e]), positionAt(arrays, arrays.edgeTo[e])];
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
