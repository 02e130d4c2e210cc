import * as THREE from 'three';
import { EDGE_KINDS, type EdgeKind, type StationNode } from '@shared/schemas/station';
import { EDGE_COLORS } from './scene-colors';

export interface SceneEdge {
  /** the graph endpoint's edge id, when there is one */
  id?: number;
  from: string;
  to: string;
  kind: EdgeKind;
  closed?: boolean;
}

export type EdgeLayerId = EdgeKind | 'closed';

/** Line patterns, so an edge kind reads without its colour: solid rail, short dashes, long dashes, dots. */
export const EDGE_PATTERNS: Record<EdgeLayerId, { dash?: number; gap?: number; description: string }> = {
  handrail: { description: 'solid line' },
  hop: { dash: 0.2, gap: 0.12, description: 'short dashes' },
  ride: { dash: 0.9, gap: 0.35, description: 'long dashes' },
  closed: { dash: 0.06, gap: 0.14, description: 'dotted' },
};

const noRaycast = () => {};

/** Edges as at most four line-segment objects, one per kind plus one for closed edges. */
export function buildEdgeLines(
  nodes: readonly StationNode[],
  edges: readonly SceneEdge[],
): THREE.LineSegments[] {
  const at = new Map(nodes.map((n) => [n.key, n.position]));
  const groups = new Map<EdgeLayerId, number[]>();
  for (const e of edges) {
    const a = at.get(e.from);
    const b = at.get(e.to);
    if (!a || !b) continue;
    const id: EdgeLayerId = e.closed ? 'closed' : e.kind;
    let list = groups.get(id);
    if (!list) groups.set(id, (list = []));
    list.push(a[0], a[1], a[2], b[0], b[1], b[2]);
  }
  const lines: THREE.LineSegments[] = [];
  for (const id of [...EDGE_KINDS, 'closed'] as const) {
    const list = groups.get(id);
    if (!list) continue;
    const geometry = new THREE.BufferGeometry();
    geometry.setAttribute('position', new THREE.Float32BufferAttribute(list, 3));
    geometry.computeBoundingSphere();
    const pattern = EDGE_PATTERNS[id];
    const material = pattern.dash
      ? new THREE.LineDashedMaterial({ color: EDGE_COLORS[id], dashSize: pattern.dash, gapSize: pattern.gap })
      : new THREE.LineBasicMaterial({ color: EDGE_COLORS[id] });
    const line = new THREE.LineSegments(geometry, material);
    if (pattern.dash) line.computeLineDistances();
    line.name = `edges:${id}`;
    // a line's pick threshold is in world units; edges are chosen from the tables, not the canvas
    line.raycast = noRaycast;
    lines.push(line);
  }
  return lines;
}
