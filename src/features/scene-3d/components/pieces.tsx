import { useMemo, useRef } from 'react';
import { useFrame } from '@react-three/fiber';
import { Line } from '@react-three/drei';
import * as THREE from 'three';
import type { ScenePieces } from '@/components/scene/scene-pieces';
import { LABEL_PRIORITY } from '@/components/scene/declutter';
import { usePlacedLabel } from '@/components/scene/label-layer';
import { TextSprite } from '@/components/scene/text-sprite';
import type { Vec3 } from '@shared/schemas/station';

/** A polyline through points (a route, a tether run), in screen-space pixels wide. */
export function PathLine({
  points,
  color = '#ffffff',
  width = 3,
  dashed = false,
}: {
  points: readonly Vec3[];
  color?: string;
  width?: number;
  dashed?: boolean;
}) {
  if (points.length < 2) return null;
  return (
    <Line
      points={points as Vec3[]}
      color={color}
      lineWidth={width}
      dashed={dashed}
      dashSize={0.4}
      gapSize={0.25}
      depthTest={false}
      renderOrder={10}
      raycast={() => null}
    />
  );
}

/**
 * A tag that follows a point in the scene, drawn in the scene itself (a sprite with the page's Inter),
 * so it goes away with the canvas: DOM tags beside the canvas broke the page when a 3D screen was left.
 */
export function SceneLabel({
  position,
  children,
  tone = 'dark',
  priority,
  group,
}: {
  position: Vec3;
  children: string;
  tone?: 'dark' | 'light';
  /** which tags keep their place when tags would cover each other (`LABEL_PRIORITY`) */
  priority?: number;
  group?: unknown;
}) {
  return (
    <group position={position}>
      <TextSprite
        text={children}
        background={tone === 'light' ? '#ffffff' : 'rgba(15, 26, 46, 0.85)'}
        color={tone === 'light' ? '#111826' : '#e3e9f2'}
        heightPx={tone === 'light' ? 20 : 18}
        renderOrder={10}
        priority={priority}
        group={group}
      />
    </group>
  );
}

/** A marker ball never draws smaller than about this many pixels across, however far the camera is. */
const MARKER_MIN_PX = 12;

/** A numbered or labelled marker at a point: a ball and a tag (e.g. swap 1, swap 2, a crew member). */
export function Marker({
  position,
  label,
  number,
  color = '#ffffff',
  size = 0.22,
}: {
  position: Vec3;
  label?: string;
  number?: number;
  color?: string;
  size?: number;
}) {
  const text = [number !== undefined ? String(number) : null, label].filter(Boolean).join(' · ');
  const ball = useRef<THREE.Mesh>(null);
  const at = useMemo(() => new THREE.Vector3(...position), [position]);
  const group = useMemo(() => ({}), []);
  usePlacedLabel(ball, {
    priority: LABEL_PRIORITY.marker,
    group,
    shape: { radiusM: size, minPx: MARKER_MIN_PX },
  });
  useFrame(({ camera, size: view, invalidate }) => {
    if (!ball.current) return;
    // world size of MARKER_MIN_PX at this distance, for a perspective camera
    const fov = ((camera as THREE.PerspectiveCamera).fov ?? 45) * (Math.PI / 180);
    const perPx = (2 * camera.position.distanceTo(at) * Math.tan(fov / 2)) / Math.max(1, view.height);
    const scale = Math.max(1, ((MARKER_MIN_PX / 2) * perPx) / size);
    if (Math.abs(scale - ball.current.scale.x) < 1e-3) return;
    ball.current.scale.setScalar(scale);
    // drawn on demand: one more frame shows the new size
    invalidate();
  });
  return (
    <group position={position}>
      <mesh ref={ball} renderOrder={11} raycast={() => null}>
        <sphereGeometry args={[size, 16, 12]} />
        <meshBasicMaterial color={color} depthTest={false} transparent toneMapped={false} />
      </mesh>
      {text && (
        <SceneLabel position={[0, 0, 0]} tone="light" priority={LABEL_PRIORITY.marker} group={group}>
          {text}
        </SceneLabel>
      )}
    </group>
  );
}

/** A see-through sphere (a reach envelope, a hazard preview). */
export function TranslucentSphere({
  center,
  radius,
  color = '#4fd1c5',
  opacity = 0.2,
  wire = false,
}: {
  center: Vec3;
  radius: number;
  color?: string;
  opacity?: number;
  wire?: boolean;
}) {
  return (
    <mesh position={center} renderOrder={3} raycast={() => null}>
      <sphereGeometry args={[radius, 24, 16]} />
      <meshStandardMaterial
        color={color}
        transparent
        opacity={opacity}
        depthWrite={false}
        side={THREE.DoubleSide}
        wireframe={wire}
      />
    </mesh>
  );
}

/** The pieces a screen hands to features that draw into the scene (routes, socket plans). */
export const scenePieces: ScenePieces = { PathLine, Marker, TranslucentSphere };
