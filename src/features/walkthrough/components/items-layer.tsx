import { useMemo, useRef } from 'react';
import { useFrame } from '@react-three/fiber';
import * as THREE from 'three';
import type { EquipmentTrack } from '@shared/compute/day/types';
import { itemStateAt, sampleTrack } from '@shared/compute/walkthrough';
import type { ManifestKind } from '@shared/schemas/plan';
import type { Vec3 } from '@shared/schemas/station';
import { LABEL_PRIORITY } from '@/components/scene/declutter';
import { TextSprite } from '@/components/scene/text-sprite';
import type { PlaybackClock } from '../lib/playback-clock';
import type { Lane } from '../lib/playback-model';
import { ITEM_STYLE } from './lane-styles';

const noRaycast = () => null;
const Z = new THREE.Vector3(0, 0, 1);

/** Where an item is drawn at `t`, or null while it is in the airlock. */
export function itemPlacement(
  track: EquipmentTrack,
  t: number,
  lanes: readonly Lane[],
  positions: Record<string, Vec3>,
  /** where an arm's end is at `t` (an item installed "at" an arm's key is on its end) */
  armTip?: (key: string, t: number) => Vec3 | null,
): { position: Vec3; node?: string; carried: boolean; installed: boolean } | null {
  const where = itemStateAt(track, t).where;
  if (where.kind === 'airlock') return null;
  if (where.kind === 'carried') {
    const lane = lanes.find((l) => l.id === where.crew);
    return lane ? { position: sampleTrack(lane.track, t).position, carried: true, installed: false } : null;
  }
  const p = positions[where.node] ?? armTip?.(where.node, t) ?? undefined;
  return p ? { position: p, node: where.node, carried: false, installed: where.kind === 'installed' } : null;
}

function ItemShape({ kind, size }: { kind: ManifestKind; size: number }) {
  const color = ITEM_STYLE.colors[kind];
  const material = <meshBasicMaterial color={color} depthTest={false} transparent />;
  if (kind === 'foot-restraint')
    return (
      <mesh renderOrder={12} raycast={noRaycast}>
        <boxGeometry args={[size * 1.8, size * 1.2, size * 0.3]} />
        {material}
      </mesh>
    );
  if (kind === 'tether-anchor')
    return (
      <mesh renderOrder={12} raycast={noRaycast}>
        <torusGeometry args={[size * 0.7, size * 0.25, 8, 20]} />
        {material}
      </mesh>
    );
  const s = kind === 'large-item' ? size * 1.6 : size * 0.7;
  return (
    <mesh renderOrder={12} raycast={noRaycast}>
      <boxGeometry args={[s, s, s]} />
      {material}
    </mesh>
  );
}

/**
 * One manifest item where the day has it at the clock's time: in a crew member's hands (beside their
 * marker), set down at a node, or installed (a restraint stood on its socket's normal). Hidden while
 * in the airlock.
 */
function ItemMarker({
  track,
  slot,
  level,
  clock,
  lanes,
  positions,
  normals,
  armTip,
  size,
}: {
  track: EquipmentTrack;
  /** its place among the items, so items at one spot fan out instead of hiding each other */
  slot: number;
  /** its row among the labelled items: labels stack left of their point, one row each, never overlapping */
  level: number;
  clock: PlaybackClock;
  lanes: readonly Lane[];
  positions: Record<string, Vec3>;
  normals: Record<string, Vec3>;
  armTip?: (key: string, t: number) => Vec3 | null;
  size: number;
}) {
  const group = useRef<THREE.Group>(null);
  const shape = useRef<THREE.Group>(null);
  const label = useRef<THREE.Group>(null);
  const normal = useMemo(() => new THREE.Vector3(), []);
  const angle = (slot * 2.4) % (2 * Math.PI);
  useFrame(() => {
    const g = group.current;
    if (!g) return;
    const at = itemPlacement(track, clock.t, lanes, positions, armTip);
    g.visible = at !== null;
    if (!at) return;
    // carried items ride a ring round their holder; items at a node fan out a little
    const r = at.carried ? size * 2.2 : at.installed ? 0 : size * 1.4;
    g.position.set(
      at.position[0] + r * Math.cos(angle),
      at.position[1] + r * Math.sin(angle),
      at.position[2],
    );
    const n = at.installed && at.node ? normals[at.node] : undefined;
    if (shape.current) {
      if (n) shape.current.quaternion.setFromUnitVectors(Z, normal.set(n[0], n[1], n[2]).normalize());
      else shape.current.quaternion.identity();
    }
    if (label.current) label.current.visible = !at.carried;
  });
  return (
    <group ref={group} visible={false}>
      <group ref={shape}>
        <ItemShape kind={track.kind} size={size} />
      </group>
      <group ref={label}>
        <TextSprite
          text={track.name}
          priority={LABEL_PRIORITY.item}
          background={ITEM_STYLE.label}
          color="#111826"
          heightPx={14}
          shiftX={1.15}
          shiftY={0.5 - level * 1.15}
        />
      </group>
    </group>
  );
}

/** Every item of the manifest through the day (pass inside the walkthrough's overlays). */
export function ItemsLayer({
  equipment,
  clock,
  lanes,
  positions,
  normals,
  armTip,
  size,
}: {
  equipment: readonly EquipmentTrack[];
  clock: PlaybackClock;
  lanes: readonly Lane[];
  positions: Record<string, Vec3>;
  normals: Record<string, Vec3>;
  armTip?: (key: string, t: number) => Vec3 | null;
  size: number;
}) {
  // only items ever set down or installed show a label (a held one is listed beside its holder)
  const levels = useMemo(() => {
    let n = 0;
    return equipment.map((e) =>
      e.states.some((s) => s.where.kind === 'at' || s.where.kind === 'installed') ? n++ : 0,
    );
  }, [equipment]);
  return (
    <>
      {equipment.map((track, i) => (
        <ItemMarker
          key={track.item}
          track={track}
          slot={i}
          level={levels[i]}
          clock={clock}
          lanes={lanes}
          positions={positions}
          normals={normals}
          armTip={armTip}
          size={size}
        />
      ))}
    </>
  );
}
