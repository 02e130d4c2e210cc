import * as THREE from 'three';
import type { Segment } from '@shared/schemas/station';
import { longAxis, segmentMatrix } from './segments';

/**
 * One box-truss segment as line members in its local frame: four longerons along the long axis,
 * a square frame at every bay station, and one diagonal brace per bay on each of the four faces,
 * alternating direction bay to bay. Bays are about as long as the cross-section is wide.
 */
export function trussMemberCount(segment: Segment): { bays: number; members: number } {
  const a = longAxis(segment.size);
  const across = Math.max(...segment.size.filter((_, i) => i !== a));
  const bays = Math.max(1, Math.round(segment.size[a] / across));
  return { bays, members: 4 + 4 * (bays + 1) + 4 * bays };
}

function writeTrussMembers(segment: Segment, out: Float32Array, offset: number): number {
  const a = longAxis(segment.size);
  const [b, c] = ([0, 1, 2] as const).filter((i) => i !== a);
  const half = segment.size.map((s) => s / 2);
  const { bays } = trussMemberCount(segment);
  const m = segmentMatrix(segment);
  const v = new THREE.Vector3();
  const local = [0, 0, 0];
  const corners: [number, number][] = [
    [-1, -1],
    [1, -1],
    [1, 1],
    [-1, 1],
  ];
  const put = (t: number, corner: [number, number]) => {
    local[a] = -half[a] + t * segment.size[a];
    local[b] = corner[0] * half[b];
    local[c] = corner[1] * half[c];
    v.set(local[0], local[1], local[2]).applyMatrix4(m);
    out[offset++] = v.x;
    out[offset++] = v.y;
    out[offset++] = v.z;
  };
  for (const corner of corners) {
    put(0, corner);
    put(1, corner);
  }
  for (let i = 0; i <= bays; i++) {
    for (let k = 0; k < 4; k++) {
      put(i / bays, corners[k]);
      put(i / bays, corners[(k + 1) % 4]);
    }
  }
  for (let i = 0; i < bays; i++) {
    const flip = i % 2;
    for (let k = 0; k < 4; k++) {
      put((i + flip) / bays, corners[k]);
      put((i + 1 - flip) / bays, corners[(k + 1) % 4]);
    }
  }
  return offset;
}

/** Every truss member of every `truss` segment as one line-segment geometry: one draw call. */
export function buildTrussGeometry(segments: readonly Segment[]): THREE.BufferGeometry {
  const truss = segments.filter((s) => s.kind === 'truss');
  const total = truss.reduce((n, s) => n + trussMemberCount(s).members, 0);
  const positions = new Float32Array(total * 6);
  let offset = 0;
  for (const s of truss) offset = writeTrussMembers(s, positions, offset);
  const geometry = new THREE.BufferGeometry();
  geometry.setAttribute('position', new THREE.BufferAttribute(positions, 3));
  geometry.computeBoundingSphere();
  return geometry;
}
