import * as THREE from 'three';
import type { Segment } from '@shared/schemas/station';
import { SCENE_COLORS } from './scene-colors';

const SEGMENT_COLORS = { module: SCENE_COLORS.module, truss: SCENE_COLORS.trussSurface };

const DEG = Math.PI / 180;

/** The segment's placement: centre and rotation (Euler degrees, three.js order 'XYZ', as truss-faces.ts). */
export function segmentMatrix(segment: Segment, target = new THREE.Matrix4()): THREE.Matrix4 {
  const [rx, ry, rz] = segment.rotationDeg ?? [0, 0, 0];
  const q = new THREE.Quaternion().setFromEuler(new THREE.Euler(rx * DEG, ry * DEG, rz * DEG, 'XYZ'));
  return target.compose(new THREE.Vector3(...segment.center), q, new THREE.Vector3(1, 1, 1));
}

/** The local axis (0 x, 1 y, 2 z) a segment is longest along: its truss or module axis. */
export function longAxis(size: readonly [number, number, number]): 0 | 1 | 2 {
  if (size[0] >= size[1] && size[0] >= size[2]) return 0;
  return size[1] >= size[2] ? 1 : 2;
}

/** Cylinder geometry (along +y) turned onto the segment's long axis. */
const ALIGN_TO_AXIS = [
  new THREE.Quaternion().setFromAxisAngle(new THREE.Vector3(0, 0, 1), -Math.PI / 2),
  new THREE.Quaternion(),
  new THREE.Quaternion().setFromAxisAngle(new THREE.Vector3(1, 0, 0), Math.PI / 2),
];

function instanceMatrixFor(segment: Segment, cylinder: boolean): THREE.Matrix4 {
  const place = segmentMatrix(segment);
  const size = segment.size;
  if (!cylinder) return place.multiply(new THREE.Matrix4().makeScale(size[0], size[1], size[2]));
  const a = longAxis(size);
  const across = size.filter((_, i) => i !== a);
  const local = new THREE.Matrix4().compose(
    new THREE.Vector3(),
    ALIGN_TO_AXIS[a],
    new THREE.Vector3(across[0], size[a], across[1]),
  );
  return place.multiply(local);
}

/**
 * Segment bodies as two instanced meshes: modules as translucent cylinders, truss bays and
 * platforms as faint boxes. Both are pick targets for points on the structure's surface.
 */
export function buildSegmentMeshes(segments: readonly Segment[]): THREE.InstancedMesh[] {
  const meshes: THREE.InstancedMesh[] = [];
  const groups: [string, Segment[], boolean, number, string][] = [
    ['segments:modules', segments.filter((s) => s.kind === 'module'), true, 0.4, SEGMENT_COLORS.module],
    ['segments:structure', segments.filter((s) => s.kind !== 'module'), false, 0.07, SEGMENT_COLORS.truss],
  ];
  for (const [name, list, cylinder, opacity, color] of groups) {
    if (list.length === 0) continue;
    const geometry = cylinder ? new THREE.CylinderGeometry(0.5, 0.5, 1, 24) : new THREE.BoxGeometry(1, 1, 1);
    const material = new THREE.MeshStandardMaterial({
      color,
      transparent: true,
      opacity,
      depthWrite: false,
      roughness: 0.8,
    });
    const mesh = new THREE.InstancedMesh(geometry, material, list.length);
    list.forEach((s, i) => mesh.setMatrixAt(i, instanceMatrixFor(s, cylinder)));
    mesh.instanceMatrix.needsUpdate = true;
    mesh.computeBoundingSphere();
    mesh.name = name;
    mesh.renderOrder = 1;
    mesh.userData.pick = { type: 'segment', keys: list.map((s) => s.key) };
    meshes.push(mesh);
  }
  return meshes;
}
