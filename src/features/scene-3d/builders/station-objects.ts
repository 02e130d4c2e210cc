import * as THREE from 'three';
import { graphArraysOf, nodeIndexOf } from '@shared/compute/graph-columns';
import {
  NODE_KINDS,
  type Arm,
  type Hazard,
  type NodeKind,
  type Segment,
  type StationNode,
  type Vec3,
} from '@shared/schemas/station';
import { buildEdgeLines, type SceneEdge } from './edges';
import { buildGlyphLayers, GLYPH_INSTANCE_BUDGET } from './glyphs';
import { buildHazardMeshes } from './hazards';
import { SCENE_COLORS } from './scene-colors';
import { buildSegmentMeshes, segmentMatrix } from './segments';
import { buildTrussGeometry } from './truss';

/** What the scene draws: a station document and the graph endpoint's answer both fit. */
export interface SceneStation {
  segments: readonly Segment[];
  nodes: readonly StationNode[];
  edges: readonly SceneEdge[];
  hazards: readonly Hazard[];
  /** robotic arms, drawn as booms in their own layer (the graph endpoint answers them) */
  arms?: readonly Arm[];
}

export const LAYER_IDS = [
  'truss',
  'handrails',
  ...NODE_KINDS,
  'arms',
  'armReach',
  'hazards',
  'labels',
  'annotations',
] as const;
export type LayerId = (typeof LAYER_IDS)[number];
export type SceneLayers = Record<LayerId, boolean>;
export const ALL_LAYERS_ON = Object.fromEntries(LAYER_IDS.map((id) => [id, true])) as SceneLayers;
/** What a scene opens with: everything but the arms' reach shells, which are large and see-through. */
export const DEFAULT_LAYERS: SceneLayers = { ...ALL_LAYERS_ON, armReach: false };

export type PickType = 'node' | 'segment' | 'hazard';
export interface PickData {
  type: PickType;
  keys: string[];
}

export interface NodeAt {
  kind: NodeKind;
  label?: string;
  instance: number;
  position: THREE.Vector3;
}

export interface StationObjects {
  root: THREE.Group;
  truss: THREE.Object3D[];
  handrails: THREE.Object3D[];
  /** each kind's glyphs, or its dots past the glyph instance budget (see glyphs.ts) */
  glyphs: Partial<Record<NodeKind, THREE.InstancedMesh | THREE.Points>>;
  hazards: THREE.Object3D[];
  /** node key → its position, kind and instance in its kind's mesh (made when asked) */
  nodeIndex: { get(key: string): NodeAt | undefined };
  bounds: THREE.Box3;
  /** what the camera frames: nodes, segment box corners, hazard extremes, as x, y, z in turn */
  outline: Float64Array;
  dispose(): void;
}

/**
 * Builds every drawn object of a station in plain three.js (no renderer needed, so the benchmark
 * runs it in Node). The object count depends on which kinds are present, never on how many.
 */
export function buildStationObjects(
  station: SceneStation,
  { glyphBudget = GLYPH_INSTANCE_BUDGET }: { glyphBudget?: number } = {},
): StationObjects {
  const root = new THREE.Group();
  root.name = 'station';

  const trussLines = new THREE.LineSegments(
    buildTrussGeometry(station.segments),
    new THREE.LineBasicMaterial({ color: SCENE_COLORS.truss }),
  );
  trussLines.name = 'truss:members';
  trussLines.raycast = () => {};
  const truss: THREE.Object3D[] = [...buildSegmentMeshes(station.segments)];
  if (trussLines.geometry.getAttribute('position').count > 0) truss.unshift(trussLines);

  const arrays = graphArraysOf(station);
  const handrails = buildEdgeLines(arrays);
  const instances = new Uint32Array(arrays.keys.length);
  const glyphLayers = buildGlyphLayers(arrays, instances, glyphBudget);
  const hazards = buildHazardMeshes(station.hazards);
  const glyphs: StationObjects['glyphs'] = {};
  for (const layer of glyphLayers) {
    glyphs[layer.kind] = layer.mesh;
  }

  root.add(...truss, ...handrails, ...glyphLayers.map((l) => l.mesh), ...hazards);
  const bounds = stationBounds(station);
  const outline = stationOutline(station);
  const nodeIndex = {
    get(key: string): NodeAt | undefined {
      const i = nodeIndexOf(arrays).get(key);
      if (i === undefined) return undefined;
      const p = arrays.positions;
      return {
        kind: NODE_KINDS[arrays.kinds[i]],
        label: arrays.labels[i],
        instance: instances[i],
        position: new THREE.Vector3(p[i * 3], p[i * 3 + 1], p[i * 3 + 2]),
      };
    },
  };
  return {
    root,
    truss,
    handrails,
    glyphs,
    hazards,
    nodeIndex,
    bounds,
    outline,
    dispose() {
      root.traverse((o) => {
        const drawn = o as THREE.Mesh;
        drawn.geometry?.dispose();
        const material = drawn.material;
        if (Array.isArray(material)) material.forEach((m) => m.dispose());
        else material?.dispose();
      });
    },
  };
}

/** The box round every node, segment and hazard; a unit box at the origin for an empty station. */
export function stationBounds(station: SceneStation): THREE.Box3 {
  const box = new THREE.Box3();
  const v = new THREE.Vector3();
  const p = graphArraysOf(station).positions;
  for (let i = 0; i < p.length; i += 3) box.expandByPoint(v.set(p[i], p[i + 1], p[i + 2]));
  for (const s of station.segments) {
    const r = Math.hypot(...s.size) / 2;
    box.expandByPoint(v.set(s.center[0] - r, s.center[1] - r, s.center[2] - r));
    box.expandByPoint(v.set(s.center[0] + r, s.center[1] + r, s.center[2] + r));
  }
  for (const h of station.hazards) {
    if (h.shape === 'box') {
      box.expandByPoint(v.set(...h.min));
      box.expandByPoint(v.set(...h.max));
    } else {
      box.expandByPoint(v.set(h.center[0] - h.radiusM, h.center[1] - h.radiusM, h.center[2] - h.radiusM));
      box.expandByPoint(v.set(h.center[0] + h.radiusM, h.center[1] + h.radiusM, h.center[2] + h.radiusM));
    }
  }
  if (box.isEmpty()) box.set(new THREE.Vector3(-1, -1, -1), new THREE.Vector3(1, 1, 1));
  return box;
}

/** Shows and hides the model's parts; a hidden part is also not picked (see picking.ts). */
export function applyLayers(objects: StationObjects, layers: SceneLayers): void {
  for (const o of objects.truss) o.visible = layers.truss;
  for (const o of objects.handrails) o.visible = layers.handrails;
  for (const o of objects.hazards) o.visible = layers.hazards;
  for (const kind of NODE_KINDS) {
    const mesh = objects.glyphs[kind];
    if (mesh) mesh.visible = layers[kind];
  }
}

/**
 * The points a view of the whole station must keep in frame (tighter than the bounding box's
 * corners), as x, y, z in turn: every node, each segment box's corners, each hazard's extremes.
 */
export function stationOutline(station: SceneStation): Float64Array {
  const nodes = graphArraysOf(station).positions;
  const extra: number[] = [];
  const m = new THREE.Matrix4();
  const v = new THREE.Vector3();
  for (const s of station.segments) {
    segmentMatrix(s, m);
    for (let i = 0; i < 8; i++) {
      const sign = (bit: number) => (i & bit ? 0.5 : -0.5);
      v.set(sign(1) * s.size[0], sign(2) * s.size[1], sign(4) * s.size[2]).applyMatrix4(m);
      extra.push(v.x, v.y, v.z);
    }
  }
  for (const h of station.hazards) {
    const { min, max } = hazardBox(h);
    extra.push(...min, ...max);
  }
  if (nodes.length + extra.length === 0) return Float64Array.of(-1, -1, -1, 1, 1, 1);
  const out = new Float64Array(nodes.length + extra.length);
  out.set(nodes);
  out.set(extra, nodes.length);
  return out;
}

function hazardBox(h: Hazard): { min: Vec3; max: Vec3 } {
  if (h.shape === 'box') return { min: h.min, max: h.max };
  const r = h.radiusM;
  return {
    min: [h.center[0] - r, h.center[1] - r, h.center[2] - r],
    max: [h.center[0] + r, h.center[1] + r, h.center[2] + r],
  };
}
