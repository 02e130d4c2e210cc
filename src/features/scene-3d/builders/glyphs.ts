import * as THREE from 'three';
import { mergeGeometries } from 'three/examples/jsm/utils/BufferGeometryUtils.js';
import { NODE_KINDS, type NodeKind, type StationNode } from '@shared/schemas/station';
import { NODE_COLORS } from './scene-colors';

/**
 * One shape per node kind, sized in metres, so kinds differ by silhouette as well as colour:
 * airlock a large ring, anchor a diamond, junction a small cube, socket a cone standing on its
 * normal, worksite a three-axis cross.
 */
export const GLYPH_SHAPES: Record<NodeKind, string> = {
  airlock: 'large ring',
  junction: 'small cube',
  anchor: 'diamond',
  socket: 'cone along its normal',
  worksite: 'three-axis cross',
};

export function glyphGeometry(kind: NodeKind): THREE.BufferGeometry {
  switch (kind) {
    case 'airlock':
      return new THREE.TorusGeometry(0.5, 0.1, 8, 24);
    case 'anchor':
      return new THREE.OctahedronGeometry(0.16);
    case 'junction':
      return new THREE.BoxGeometry(0.09, 0.09, 0.09);
    case 'socket':
      // base on the surface, tip along +y (turned onto the normal per instance)
      return new THREE.ConeGeometry(0.11, 0.28, 12).translate(0, 0.14, 0);
    case 'worksite': {
      const arms = [
        new THREE.BoxGeometry(0.5, 0.1, 0.1),
        new THREE.BoxGeometry(0.1, 0.5, 0.1),
        new THREE.BoxGeometry(0.1, 0.1, 0.5),
      ];
      const merged = mergeGeometries(arms);
      for (const arm of arms) arm.dispose();
      return merged;
    }
  }
}

const Y = new THREE.Vector3(0, 1, 0);
const Z = new THREE.Vector3(0, 0, 1);

export interface GlyphLayer {
  kind: NodeKind;
  mesh: THREE.InstancedMesh;
  /** instanceId → node key */
  keys: string[];
}

/** One InstancedMesh per node kind that has nodes: draw calls stay at most five however many nodes. */
export function buildGlyphLayers(nodes: readonly StationNode[]): GlyphLayer[] {
  const layers: GlyphLayer[] = [];
  const m = new THREE.Matrix4();
  const q = new THREE.Quaternion();
  const p = new THREE.Vector3();
  const n = new THREE.Vector3();
  const one = new THREE.Vector3(1, 1, 1);
  for (const kind of NODE_KINDS) {
    const ofKind = nodes.filter((node) => node.kind === kind);
    if (ofKind.length === 0) continue;
    const material = new THREE.MeshStandardMaterial({
      color: NODE_COLORS[kind],
      roughness: 0.55,
      metalness: 0.1,
    });
    const mesh = new THREE.InstancedMesh(glyphGeometry(kind), material, ofKind.length);
    mesh.name = `nodes:${kind}`;
    ofKind.forEach((node, i) => {
      p.set(...node.position);
      // a ring lies in the plane of its hatch (normal given) or faces zenith; a cone stands on its normal
      const axis = kind === 'airlock' ? Z : Y;
      if (node.normal) q.setFromUnitVectors(axis, n.set(...node.normal).normalize());
      else q.identity();
      mesh.setMatrixAt(i, m.compose(p, q, one));
    });
    mesh.instanceMatrix.needsUpdate = true;
    mesh.computeBoundingSphere();
    const keys = ofKind.map((node) => node.key);
    mesh.userData.pick = { type: 'node', keys };
    layers.push({ kind, mesh, keys });
  }
  return layers;
}
