import * as THREE from 'three';
import type { GraphArrays } from '@shared/compute/graph-columns';
import { EDGE_KINDS, type EdgeKind } from '@shared/schemas/station';
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

/**
 * Edges as at most four line-segment objects, one per kind plus one for closed edges, filled from
 * the graph's typed arrays (no object per edge); dashed kinds get each segment's own dash distances.
 */
export function buildEdgeLines(arrays: GraphArrays): THREE.LineSegments[] {
  const { edgeFrom, edgeTo, edgeKinds, edgeClosed, positions } = arrays;
  const layerOf = (i: number) => (edgeClosed[i] ? EDGE_KINDS.length : edgeKinds[i]);
  const layerIds: EdgeLayerId[] = [...EDGE_KINDS, 'closed'];
  const counts = new Uint32Array(layerIds.length);
  for (let i = 0; i < edgeFrom.length; i++) counts[layerOf(i)]++;
  const buffers = Array.from(counts, (c) => new Float32Array(c * 6));
  const filled = new Uint32Array(layerIds.length);
  for (let i = 0; i < edgeFrom.length; i++) {
    const layer = layerOf(i);
    const out = buffers[layer];
    const at = filled[layer]++ * 6;
    const [a, b] = [edgeFrom[i] * 3, edgeTo[i] * 3];
    out[at] = positions[a];
    out[at + 1] = positions[a + 1];
    out[at + 2] = positions[a + 2];
    out[at + 3] = positions[b];
    out[at + 4] = positions[b + 1];
    out[at + 5] = positions[b + 2];
  }
  const lines: THREE.LineSegments[] = [];
  layerIds.forEach((id, layer) => {
    if (counts[layer] === 0) return;
    const geometry = new THREE.BufferGeometry();
    const points = buffers[layer];
    geometry.setAttribute('position', new THREE.BufferAttribute(points, 3));
    geometry.computeBoundingSphere();
    const pattern = EDGE_PATTERNS[id];
    const material = pattern.dash
      ? new THREE.LineDashedMaterial({ color: EDGE_COLORS[id], dashSize: pattern.dash, gapSize: pattern.gap })
      : new THREE.LineBasicMaterial({ color: EDGE_COLORS[id] });
    if (pattern.dash)
      geometry.setAttribute('lineDistance', new THREE.BufferAttribute(dashDistances(points), 1));
    const line = new THREE.LineSegments(geometry, material);
    line.name = `edges:${id}`;
    // a line's pick threshold is in world units; edges are chosen from the tables, not the canvas
    line.raycast = noRaycast;
    lines.push(line);
  });
  return lines;
}

/** What LineSegments.computeLineDistances gives: the distance along the segments one after another. */
function dashDistances(points: Float32Array): Float32Array {
  const out = new Float32Array(points.length / 3);
  let along = 0;
  for (let s = 0; s < out.length; s += 2) {
    const i = s * 3;
    out[s] = along;
    along += Math.hypot(
      points[i + 3] - points[i],
      points[i + 4] - points[i + 1],
      points[i + 5] - points[i + 2],
    );
    out[s + 1] = along;
  }
  return out;
}
