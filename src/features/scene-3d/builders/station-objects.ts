import * as THREE from 'three';
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
import { buildGlyphLayers } from './glyphs';
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

export interface StationObjects {
  root: THREE.Group;
  truss: THREE.Object3D[];
  handrails: THREE.Object3D[];
  glyphs: Partial<Record<NodeKind, THREE.InstancedMesh>>;
  hazards: THREE.Object3D[];
  /** node key → its position, kind and instance in its kind's mesh */
  nodeIndex: Map<string, { kind: NodeKind; instance: number; position: THREE.Vector3 }>;
  bounds: THREE.Box3;
  /** what the camera frames: nodes, segment box corners, hazard extremes */
  outline: THREE.Vector3[];
  dispose(): void;
}

/**
 * Builds every drawn object of a station in plain three.js (no renderer needed, so the benchmark
 * runs it in Node). The object count depends on which kinds are present, never on how many.
 */
export function buildStationObjects(station: SceneStation): StationObjects {
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

  const handrails = buildEdgeLines(station.nodes, station.edges);
  const glyphLayers = buildGlyphLayers(station.nodes);
  const hazards = buildHazardMeshes(station.hazards);
  const glyphs: StationObjects['glyphs'] = {};
  const nodeIndex: StationObjects['nodeIndex'] = new Map();
  for (const layer of glyphLayers) {
    glyphs[layer.kind] = layer.mesh;
  }
  const counters = new Map<NodeKind, number>();
  for (const node of station.nodes) {
    const instance = counters.get(node.kind) ?? 0;
    counters.set(node.kind, instance + 1);
    nodeIndex.set(node.key, { kind: node.kind, instance, position: new THREE.Vector3(...node.position) });
  }

  root.add(...truss, ...handrails, ...glyphLayers.map((l) => l.mesh), ...hazards);
  const bounds = stationBounds(station);
  const outline = stationOutline(station);
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
  for (const n of station.nodes) box.expandByPoint(v.set(...n.position));
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

/** The points a view of the whole station must keep in frame: tighter than the bounding box's corners. */
export function stationOutline(station: SceneStation): THREE.Vector3[] {
  const points = station.nodes.map((n) => new THREE.Vector3(...n.position));
  const m = new THREE.Matrix4();
  for (const s of station.segments) {
    segmentMatrix(s, m);
    for (let i = 0; i < 8; i++) {
      const sign = (bit: number) => (i & bit ? 0.5 : -0.5);
      points.push(
        new THREE.Vector3(sign(1) * s.size[0], sign(2) * s.size[1], sign(4) * s.size[2]).applyMatrix4(m),
      );
    }
  }
  for (const h of station.hazards) {
    const { min, max } = hazardBox(h);
    points.push(new THREE.Vector3(...min), new THREE.Vector3(...max));
  }
  return points.length ? points : [new THREE.Vector3(-1, -1, -1), new THREE.Vector3(1, 1, 1)];
}

function hazardBox(h: Hazard): { min: Vec3; max: Vec3 } {
  if (h.shape === 'box') return { min: h.min, max: h.max };
  const r = h.radiusM;
  return {
    min: [h.center[0] - r, h.center[1] - r, h.center[2] - r],
    max: [h.center[0] + r, h.center[1] + r, h.center[2] + r],
  };
}
