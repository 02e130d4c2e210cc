import * as THREE from 'three';
import { HAZARD_KINDS, type Hazard } from '@shared/schemas/station';
import { HAZARD_COLORS } from './scene-colors';

/**
 * Hazards as translucent volumes, one InstancedMesh per (kind, shape). Keep-out volumes also get a
 * wire cage (a second instanced mesh sharing the geometry) so they read as "no entry" without colour.
 */
export function buildHazardMeshes(hazards: readonly Hazard[]): THREE.InstancedMesh[] {
  const meshes: THREE.InstancedMesh[] = [];
  const m = new THREE.Matrix4();
  const q = new THREE.Quaternion();
  const p = new THREE.Vector3();
  const s = new THREE.Vector3();
  for (const kind of HAZARD_KINDS) {
    for (const shape of ['sphere', 'box'] as const) {
      const list = hazards.filter((h) => h.kind === kind && h.shape === shape);
      if (list.length === 0) continue;
      const geometry =
        shape === 'sphere' ? new THREE.SphereGeometry(1, 24, 16) : new THREE.BoxGeometry(1, 1, 1);
      const fill = new THREE.MeshStandardMaterial({
        color: HAZARD_COLORS[kind],
        transparent: true,
        opacity: kind === 'keep-out' ? 0.28 : 0.18,
        depthWrite: false,
        side: THREE.DoubleSide,
      });
      const variants: [THREE.Material, string][] = [[fill, 'fill']];
      if (kind === 'keep-out') {
        variants.push([new THREE.MeshBasicMaterial({ color: HAZARD_COLORS[kind], wireframe: true }), 'cage']);
      }
      for (const [material, part] of variants) {
        const mesh = new THREE.InstancedMesh(geometry, material, list.length);
        list.forEach((h, i) => {
          if (h.shape === 'sphere') {
            p.set(...h.center);
            s.setScalar(h.radiusM);
          } else {
            p.set((h.min[0] + h.max[0]) / 2, (h.min[1] + h.max[1]) / 2, (h.min[2] + h.max[2]) / 2);
            s.set(h.max[0] - h.min[0], h.max[1] - h.min[1], h.max[2] - h.min[2]);
          }
          mesh.setMatrixAt(i, m.compose(p, q, s));
        });
        mesh.instanceMatrix.needsUpdate = true;
        mesh.computeBoundingSphere();
        mesh.name = `hazards:${kind}:${shape}:${part}`;
        mesh.renderOrder = 2;
        mesh.userData.pick = { type: 'hazard', keys: list.map((h) => h.key) };
        meshes.push(mesh);
      }
    }
  }
  return meshes;
}
