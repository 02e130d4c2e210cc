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

/**
 * Level of detail by count: at most this many nodes are drawn as glyph instances. Past it the kinds
 * with the most nodes, largest first, are drawn as dots of a fixed size on screen instead, until the
 * rest fit. Software WebGL (a browser without a GPU) pays per instance, whatever its triangles: 100k
 * glyphs took seconds a frame, where one dot list of the same nodes takes a fraction of one. A
 * station that large shows its nodes a pixel or two wide anyway; glyphs stay for the kinds that fit.
 */
export const GLYPH_INSTANCE_BUDGET = 12_000;
/** a dot's size in the drawing buffer's pixels */
export const DOT_SIZE_PX = 3;
/** a dot is picked when the ray passes within this angle of it (about 4 px of a 45° view 860 px high) */
const DOT_PICK_RADIANS = 0.004;

export interface GlyphLayer {
  kind: NodeKind;
  /** the kind's glyphs, one instance per node; or, past the instance budget, one dot per node */
  mesh: THREE.InstancedMesh | THREE.Points;
  /** instanceId (or dot index) → node key */
  keys: string[];
}

/** The kinds drawn as dots: the largest first, until the rest fit in `budget` instances. */
export function dottedKinds(counts: ArrayLike<number>, budget = GLYPH_INSTANCE_BUDGET): Set<NodeKind> {
  const order = NODE_KINDS.map((_, k) => k).sort((a, b) => counts[b] - counts[a]);
  let instanced = order.reduce((sum, k) => sum + counts[k], 0);
  const dotted = new Set<NodeKind>();
  for (const k of order) {
    if (instanced <= budget) break;
    dotted.add(NODE_KINDS[k]);
    instanced -= counts[k];
  }
  return dotted;
}

/**
 * One InstancedMesh per node kind that has nodes (past the instance budget, one dot list for the
 * largest kinds): draw calls stay at most five however many nodes. Built from the graph's typed
 * arrays (no object per node): a node without a normal is a translation written straight into the
 * instance matrix. `instances` gets each node's instance (or dot) in its kind's mesh.
 */
export function buildGlyphLayers(
  arrays: GraphArrays,
  instances: Uint32Array,
  budget = GLYPH_INSTANCE_BUDGET,
): GlyphLayer[] {
  const { kinds, positions, normals, keys } = arrays;
  const counts = new Uint32Array(NODE_KINDS.length);
  for (let i = 0; i < kinds.length; i++) instances[i] = counts[kinds[i]]++;
  const dotted = dottedKinds(counts, budget);
  const m = new THREE.Matrix4();
  const q = new THREE.Quaternion();
  const p = new THREE.Vector3();
  const n = new THREE.Vector3();
  const one = new THREE.Vector3(1, 1, 1);
  const layers: (GlyphLayer | undefined)[] = NODE_KINDS.map((kind, k) => {
    if (counts[k] === 0) return undefined;
    const made = { kind, keys: new Array<string>(counts[k]) };
    if (dotted.has(kind)) return { ...made, mesh: dots(kind, counts[k]) };
    const material = new THREE.MeshStandardMaterial({
      color: NODE_COLORS[kind],
      roughness: 0.55,
      metalness: 0.1,
    });
    // made empty and given its matrices: the constructor would write an identity into every instance
    const mesh = new THREE.InstancedMesh(glyphGeometry(kind), material, 0);
    mesh.instanceMatrix = new THREE.InstancedBufferAttribute(new Float32Array(counts[k] * 16), 16);
    mesh.count = counts[k];
    mesh.name = `nodes:${kind}`;
    return { ...made, mesh };
  });
  for (let i = 0; i < kinds.length; i++) {
    const layer = layers[kinds[i]]!;
    const at = instances[i];
    layer.keys[at] = keys[i];
    const [x, y, z] = [positions[i * 3], positions[i * 3 + 1], positions[i * 3 + 2]];
    if (layer.mesh instanceof THREE.Points) {
      const out = layer.mesh.geometry.getAttribute('position').array as Float32Array;
      out[at * 3] = x;
      out[at * 3 + 1] = y;
      out[at * 3 + 2] = z;
      continue;
    }
    const out = layer.mesh.instanceMatrix.array as Float32Array;
    if (normals && !Number.isNaN(normals[i * 3])) {
      // a ring lies in the plane of its hatch (normal given) or faces zenith; a cone stands on its normal
      const axis = layer.kind === 'airlock' ? Z : Y;
      q.setFromUnitVectors(axis, n.set(normals[i * 3], normals[i * 3 + 1], normals[i * 3 + 2]).normalize());
      m.compose(p.set(x, y, z), q, one).toArray(out, at * 16);
    } else {
      // an identity with the position as its translation (the rest of the array is zeros)
      const o = at * 16;
      out[o] = out[o + 5] = out[o + 10] = out[o + 15] = 1;
      out[o + 12] = x;
      out[o + 13] = y;
      out[o + 14] = z;
    }
  }
  const built: GlyphLayer[] = [];
  for (const layer of layers) {
    if (!layer) continue;
    if (layer.mesh instanceof THREE.InstancedMesh) {
      layer.mesh.instanceMatrix.needsUpdate = true;
      layer.mesh.computeBoundingSphere();
    } else layer.mesh.geometry.computeBoundingSphere();
    layer.mesh.userData.pick = { type: 'node', keys: layer.keys };
    built.push(layer);
  }
  return built;
}

function dots(kind: NodeKind, count: number): THREE.Points {
  const geometry = new THREE.BufferGeometry();
  geometry.setAttribute('position', new THREE.BufferAttribute(new Float32Array(count * 3), 3));
  const material = new THREE.PointsMaterial({
    color: NODE_COLORS[kind],
    size: DOT_SIZE_PX,
    sizeAttenuation: false,
  });
  const points = new THREE.Points(geometry, material);
  points.name = `nodes:${kind}`;
  points.userData.dots = true;
  points.raycast = raycastDots;
  return points;
}

const ray = new THREE.Ray();
const inverse = new THREE.Matrix4();

/**
 * A dot is hit when the ray passes within a small angle of it (a dot keeps its size on screen, so
 * its reach does too), nearest along the ray first; the hit's instanceId is the dot's index, as an
 * instanced glyph's is.
 */
function raycastDots(this: THREE.Points, raycaster: THREE.Raycaster, hits: THREE.Intersection[]) {
  const sphere = this.geometry.boundingSphere;
  ray.copy(raycaster.ray).applyMatrix4(inverse.copy(this.matrixWorld).invert());
  if (
    sphere &&
    ray.distanceToPoint(sphere.center) >
      sphere.radius + ray.origin.distanceTo(sphere.center) * DOT_PICK_RADIANS
  )
    return;
  const p = this.geometry.getAttribute('position').array as Float32Array;
  const { origin: o, direction: d } = ray;
  const tan2 = DOT_PICK_RADIANS * DOT_PICK_RADIANS;
  for (let i = 0; i < p.length; i += 3) {
    const dx = p[i] - o.x;
    const dy = p[i + 1] - o.y;
    const dz = p[i + 2] - o.z;
    const t = dx * d.x + dy * d.y + dz * d.z;
    if (t <= 0) continue;
    const off2 = dx * dx + dy * dy + dz * dz - t * t;
    if (off2 > tan2 * t * t) continue;
    const point = new THREE.Vector3(p[i], p[i + 1], p[i + 2]).applyMatrix4(this.matrixWorld);
    const distance = raycaster.ray.origin.distanceTo(point);
    if (distance < raycaster.near || distance > raycaster.far) continue;
    hits.push({ distance, point, index: i / 3, instanceId: i / 3, object: this });
  }
}
