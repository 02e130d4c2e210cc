import { useMemo } from 'react';
import * as THREE from 'three';
import { graphArraysOf } from '@shared/compute/graph-columns';
import { NODE_KINDS, type Hazard, type Vec3 } from '@shared/schemas/station';
import { SCENE_COLORS } from '../builders/scene-colors';
import type { SceneStation, StationObjects } from '../builders/station-objects';
import { PathLine, SceneLabel } from './pieces';
import { LABEL_PRIORITY } from '@/components/scene/declutter';

export type SceneSelection = { type: 'node' | 'edge' | 'hazard'; key: string } | null;

/** An edge's selection key: its id from the graph endpoint, else its place in the list. */
export const edgeSelectionKey = (edge: { id?: number }, index: number) =>
  edge.id !== undefined ? String(edge.id) : `#${index}`;

const nodeText = (node: { label?: string } | undefined, key: string) =>
  node?.label ? `${key} — ${node.label}` : key;

function HazardCage({ hazard }: { hazard: Hazard }) {
  const [position, scale] = useMemo((): [Vec3, Vec3] => {
    if (hazard.shape === 'sphere') return [hazard.center, [hazard.radiusM, hazard.radiusM, hazard.radiusM]];
    const size = hazard.max.map((v, i) => v - hazard.min[i]) as Vec3;
    return [hazard.max.map((v, i) => (v + hazard.min[i]) / 2) as Vec3, size];
  }, [hazard]);
  return (
    <mesh position={position} scale={scale} renderOrder={12} raycast={() => null}>
      {hazard.shape === 'sphere' ? (
        <sphereGeometry args={[1.02, 24, 16]} />
      ) : (
        <boxGeometry args={[1.02, 1.02, 1.02]} />
      )}
      <meshBasicMaterial color={SCENE_COLORS.selection} wireframe depthTest={false} transparent />
    </mesh>
  );
}

export function SelectionHighlight({
  station,
  objects,
  selection,
}: {
  station: SceneStation;
  objects: StationObjects;
  selection: SceneSelection;
}) {
  if (!selection) return null;
  if (selection.type === 'node') {
    const at = objects.nodeIndex.get(selection.key);
    if (!at) return null;
    const p = at.position.toArray() as Vec3;
    return (
      <group>
        <mesh position={p} renderOrder={12} raycast={() => null}>
          <sphereGeometry args={[at.kind === 'airlock' ? 0.8 : 0.38, 20, 14]} />
          <meshBasicMaterial color={SCENE_COLORS.selection} wireframe depthTest={false} transparent />
        </mesh>
        <SceneLabel position={p} tone="light" priority={LABEL_PRIORITY.selected}>
          {nodeText(at, selection.key)}
        </SceneLabel>
      </group>
    );
  }
  if (selection.type === 'hazard') {
    const hazard = station.hazards.find((h) => h.key === selection.key);
    return hazard ? <HazardCage hazard={hazard} /> : null;
  }
  const index = station.edges.findIndex((e, i) => edgeSelectionKey(e, i) === selection.key);
  const edge = station.edges[index];
  const a = edge && objects.nodeIndex.get(edge.from);
  const b = edge && objects.nodeIndex.get(edge.to);
  if (!a || !b) return null;
  return (
    <PathLine
      points={[a.position.toArray() as Vec3, b.position.toArray() as Vec3]}
      color={SCENE_COLORS.selection}
      width={5}
    />
  );
}

const LABELLED_KINDS = new Set<string>(['airlock', 'worksite']);
const MAX_LABELS = 60;

/** Labels for the few nodes a crew navigates by (airlocks, worksites), not for every junction. */
export function NodeLabels({ station, hidden }: { station: SceneStation; hidden?: string | null }) {
  const labelled = useMemo(() => {
    const { keys, kinds, positions: p } = graphArraysOf(station);
    const out: { key: string; position: Vec3 }[] = [];
    for (let i = 0; i < keys.length && out.length < MAX_LABELS; i++)
      if (LABELLED_KINDS.has(NODE_KINDS[kinds[i]]))
        out.push({ key: keys[i], position: [p[i * 3], p[i * 3 + 1], p[i * 3 + 2]] });
    return out;
  }, [station]);
  return (
    <>
      {labelled
        .filter((n) => n.key !== hidden)
        .map((n) => (
          <SceneLabel key={n.key} position={n.position}>
            {n.key}
          </SceneLabel>
        ))}
    </>
  );
}

export function HoverLabel({ objects, nodeKey }: { objects: StationObjects; nodeKey: string | null }) {
  const at = nodeKey ? objects.nodeIndex.get(nodeKey) : undefined;
  if (!nodeKey || !at) return null;
  return (
    <SceneLabel position={at.position.toArray() as Vec3} tone="light" priority={LABEL_PRIORITY.hovered}>
      {nodeText(at, nodeKey)}
    </SceneLabel>
  );
}

export const vec = (v: THREE.Vector3): Vec3 => [v.x, v.y, v.z];
