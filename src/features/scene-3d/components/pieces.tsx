import type { ReactNode } from 'react';
import { Html, Line } from '@react-three/drei';
import * as THREE from 'three';
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

/** A small DOM tag that follows a point in the scene; no font is loaded, the page's Inter is used. */
export function SceneLabel({ position, children, tone = 'dark' }: { position: Vec3; children: ReactNode; tone?: 'dark' | 'light' }) {
  return (
    <Html position={position} center={false} zIndexRange={[20, 0]} style={{ pointerEvents: 'none' }}>
      <div
        className={
          tone === 'light'
            ? 'ml-2 -translate-y-1/2 rounded bg-white px-1.5 py-0.5 text-xs font-semibold whitespace-nowrap text-text-strong shadow'
            : 'ml-2 -translate-y-1/2 rounded bg-ink-900/85 px-1.5 py-0.5 text-xs font-medium whitespace-nowrap text-ink-100'
        }
      >
        {children}
      </div>
    </Html>
  );
}

/** A numbered or labelled marker at a point: a ball and a DOM tag (e.g. swap 1, swap 2, a crew member). */
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
  return (
    <group position={position}>
      <mesh renderOrder={11} raycast={() => null}>
        <sphereGeometry args={[size, 16, 12]} />
        <meshBasicMaterial color={color} depthTest={false} transparent />
      </mesh>
      {text && <SceneLabel position={[0, 0, 0]} tone="light">{text}</SceneLabel>}
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
      <meshStandardMaterial color={color} transparent opacity={opacity} depthWrite={false} side={THREE.DoubleSide} wireframe={wire} />
    </mesh>
  );
}
