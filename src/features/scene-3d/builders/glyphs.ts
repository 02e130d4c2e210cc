import * as THREE from 'three';
import { mergeGeometries } from 'three/examples/jsm/utils/BufferGeometryUtils.js';
import type { GraphArrays } from '@shared/compute/graph-columns';
import { NODE_KINDS, type NodeKind } from '@shared/schemas/station';
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

/**
 * One InstancedMesh per node kind that has nodes: draw calls stay at most five however many nodes.
 * Built from the graph's typed arrays (no object per node): a node without a normal is a
 * translation written straight into the instance matrix. `instances` gets each node's instance in
 * its kind's mesh.
 */
export function buildGlyphLayers(arrays: GraphArrays, instances: Uint32Array): GlyphLayer[] {
  const { kinds, positions, normals, keys } = arrays;
  const counts = new Uint32Array(NODE_KINDS.length);
  for (let i = 0; i < kinds.length; i++) instances[i] = counts[kinds[i]]++;
  const m = new THREE.Matrix4();
  const q = new THREE.Quaternion();
  const p = new THREE.Vector3();
  const n = new THREE.Vector3();
  const one = new THREE.Vector3(1, 1, 1);
  const layers: (GlyphLayer | undefined)[] = NODE_KINDS.map((kind, k) => {
    if (counts[k] === 0) return undefined;
    const material = new THREE.MeshStandardMaterial({
      color: NODE_COLORS[kind],
      roughness: 0.55,
      metalness: 0.1,
    });
    const mesh = new THREE.InstancedMesh(glyphGeometry(kind), material, counts[k]);
    mesh.name = `nodes:${kind}`;
    return { kind, mesh, keys: new Array<string>(counts[k]) };
  });
  for (let i = 0; i < kinds.length; i++) {
    const layer = layers[kinds[i]]!;
    const at = instances[i];
    layer.keys[at] = keys[i];
    const out = layer.mesh.instanceMatrix.array as Float32Array;
    const [x, y, z] = [positions[i * 3], positions[i * 3 + 1], positions[i * 3 + 2]];
    if (normals && !Number.isNaN(normals[i * 3])) {
      // a ring lies in the plane of its hatch (normal given) or faces zenith; a cone stands on its normal
      const axis = layer.kind === 'airlock' ? Z : Y;
      q.setFromUnitVectors(axis, n.set(normals[i * 3], normals[i * 3 + 1], normals[i * 3 + 2]).normalize());
      m.compose(p.set(x, y, z), q, one).toArray(out, at * 16);
    } else {
      out.set(IDENTITY, at * 16);
      out[at * 16 + 12] = x;
      out[at * 16 + 13] = y;
      out[at * 16 + 14] = z;
    }
  }
  const built: GlyphLayer[] = [];
  for (const layer of layers) {
    if (!layer) continue;
    layer.mesh.instanceMatrix.needsUpdate = true;
    layer.mesh.computeBoundingSphere();
    layer.mesh.userData.pick = { type: 'node', keys: layer.keys };
    built.push(layer);
  }
  return built;
}

const IDENTITY = new THREE.Matrix4().toArray();
