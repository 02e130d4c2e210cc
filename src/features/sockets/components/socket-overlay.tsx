import { useMemo } from 'react';
import * as THREE from 'three';
import type { Vec3 } from '@shared/schemas/station';
import type { ScenePieces } from '@/components/scene/scene-pieces';
import type { PlannedSocketView, PlanTarget } from '../lib/planned-sockets';

export const SOCKET_PLAN_COLORS = {
  existing: '#f5b849',
  new: '#fb923c',
  envelope: '#4fd1c5',
  target: '#ffffff',
  line: '#4fd1c5',
} as const;
const GLYPH_HEIGHT_M = 0.9;
const UP = new THREE.Vector3(0, 1, 0);
// beyond this many targets the tags would hide the model
const MAX_TAGGED_TARGETS = 40;

/** A cone standing on the socket along its normal: the direction the crew member faces out. */
function SocketGlyph({ position, normal, color }: { position: Vec3; normal: Vec3; color: string }) {
  const quaternion = useMemo(
    () => new THREE.Quaternion().setFromUnitVectors(UP, new THREE.Vector3(...normal)),
    [normal],
  );
  const centre = position.map((p, i) => p + (normal[i] * GLYPH_HEIGHT_M) / 2) as Vec3;
  return (
    // drawn over the truss surfaces, so a socket on a far face still shows
    <mesh position={centre} quaternion={quaternion} renderOrder={12} raycast={() => null}>
      <coneGeometry args={[0.3, GLYPH_HEIGHT_M, 16]} />
      <meshBasicMaterial color={color} depthTest={false} transparent />
    </mesh>
  );
}

export function SocketPlanOverlay({
  sockets,
  targets,
  pieces,
}: {
  sockets: readonly PlannedSocketView[];
  targets: readonly PlanTarget[];
  pieces: ScenePieces;
}) {
  const { PathLine, Marker, TranslucentSphere } = pieces;
  const tagged = targets.length <= MAX_TAGGED_TARGETS;
  return (
    <group name="socket-plan-overlay">
      {targets.map((t, i) => (
        <Marker
          key={`t-${i}`}
          position={t.position}
          label={tagged ? t.label : undefined}
          color={SOCKET_PLAN_COLORS.target}
          size={0.16}
        />
      ))}
      {sockets.map((s) => {
        const color = s.isNew ? SOCKET_PLAN_COLORS.new : SOCKET_PLAN_COLORS.existing;
        return (
          <group key={s.index} name={`planned-socket-${s.name}`}>
            <SocketGlyph position={s.position} normal={s.normal} color={color} />
            <TranslucentSphere
              center={s.workPoint}
              radius={s.radiusM}
              color={SOCKET_PLAN_COLORS.envelope}
              opacity={0.28}
            />
            <Marker position={s.position} label={s.name} color={color} size={0.12} />
            {s.targets.map((t) => (
              <PathLine
                key={t}
                points={[s.workPoint, targets[t].position]}
                color={SOCKET_PLAN_COLORS.line}
                width={2}
                dashed
              />
            ))}
          </group>
        );
      })}
    </group>
  );
}

/** Points picked on the model before a run. */
export function PickedPointsOverlay({
  points,
  pieces,
}: {
  points: readonly PlanTarget[];
  pieces: ScenePieces;
}) {
  const { Marker } = pieces;
  return (
    <group name="picked-points">
      {points.map((p, i) => (
        <Marker key={i} position={p.position} label={p.label} color={SOCKET_PLAN_COLORS.target} size={0.16} />
      ))}
    </group>
  );
}
