import * as THREE from 'three';
import type { Vec3 } from '@shared/schemas/station';
import type { PickData } from './station-objects';

export interface SurfacePick {
  point: Vec3;
  normal: Vec3;
  segmentKey: string;
}

export type ScenePick =
  { type: 'node'; key: string } | { type: 'hazard'; key: string } | ({ type: 'segment' } & SurfacePick);

function shown(o: THREE.Object3D | null): boolean {
  for (let p = o; p; p = p.parent) if (!p.visible) return false;
  return true;
}

const pickData = (o: THREE.Object3D): PickData | undefined => o.userData.pick as PickData | undefined;

/** The face normal of a hit in world space (three.js reports it in the geometry's own frame). */
export function worldNormal(hit: THREE.Intersection): THREE.Vector3 | null {
  if (!hit.face) return null;
  const m = hit.object.matrixWorld.clone();
  if (hit.object instanceof THREE.InstancedMesh && hit.instanceId !== undefined) {
    const instance = new THREE.Matrix4();
    hit.object.getMatrixAt(hit.instanceId, instance);
    m.multiply(instance);
  }
  return hit.face.normal.clone().applyNormalMatrix(new THREE.Matrix3().getNormalMatrix(m)).normalize();
}

/**
 * What a click means, from the raycaster's hits nearest first: a node glyph anywhere along the ray
 * wins (glyphs sit inside translucent truss boxes and hazard volumes), then the nearest hazard or
 * segment surface. Hidden layers are skipped.
 */
export function resolvePick(hits: readonly THREE.Intersection[]): ScenePick | null {
  const usable = hits.filter((h) => pickData(h.object) && h.instanceId !== undefined && shown(h.object));
  const node = usable.find((h) => pickData(h.object)!.type === 'node');
  if (node) return { type: 'node', key: pickData(node.object)!.keys[node.instanceId!] };
  const first = usable[0];
  if (!first) return null;
  const data = pickData(first.object)!;
  const key = data.keys[first.instanceId!];
  if (data.type === 'hazard') return { type: 'hazard', key };
  const normal = worldNormal(first) ?? new THREE.Vector3(0, 0, 1);
  return {
    type: 'segment',
    segmentKey: key,
    point: [first.point.x, first.point.y, first.point.z],
    normal: [normal.x, normal.y, normal.z],
  };
}
