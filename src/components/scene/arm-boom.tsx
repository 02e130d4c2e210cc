import { useLayoutEffect, useMemo, useRef } from 'react';
import { useFrame } from '@react-three/fiber';
import * as THREE from 'three';
import type { Vec3 } from '@shared/schemas/station';
import { boomElbow } from './boom-pose';
import { TextSprite } from './text-sprite';

/** Our arm's look: pale links, amber joints, a dark end plate with the foot restraint's place. */
export const BOOM_COLORS = {
  link: '#d8d3c4',
  joint: '#f0a23c',
  plate: '#3a4458',
  shell: '#f0a23c',
  label: '#f0a23c',
} as const;

const noRaycast = () => null;
const Y = new THREE.Vector3(0, 1, 0);
const UP: Vec3 = [0, 0, 1];

/** Stretches a unit cylinder (along y, height 1) between two points. */
function placeBetween(mesh: THREE.Object3D | null, a: THREE.Vector3, b: THREE.Vector3, dir: THREE.Vector3) {
  if (!mesh) return;
  dir.subVectors(b, a);
  const length = dir.length();
  mesh.position.addVectors(a, b).multiplyScalar(0.5);
  mesh.scale.set(1, Math.max(length, 1e-6), 1);
  if (length > 1e-9) mesh.quaternion.setFromUnitVectors(Y, dir.normalize());
}

interface ArmBoomProps {
  armKey: string;
  base: Vec3;
  reachM: number;
  /** where the tip is: a fixed point, or read every frame (playback) */
  tip: Vec3 | (() => Vec3);
  /** link thickness, in metres */
  size?: number;
}

/**
 * A robotic arm as a simple two-link boom from its base to its tip: a pedestal, two links with an
 * elbow between them, and an end plate where the foot restraint goes. Tagged with the arm's key.
 */
export function ArmBoom({ armKey, base, reachM, tip, size = 0.16 }: ArmBoomProps) {
  const link1 = useRef<THREE.Mesh>(null);
  const link2 = useRef<THREE.Mesh>(null);
  const elbow = useRef<THREE.Mesh>(null);
  const plate = useRef<THREE.Group>(null);
  const scratch = useMemo(
    () => ({
      a: new THREE.Vector3(...base),
      e: new THREE.Vector3(),
      t: new THREE.Vector3(),
      d: new THREE.Vector3(),
    }),
    [base],
  );
  const last = useRef<string>('');
  const pose = (p: Vec3) => {
    const key = p.join(',');
    if (key === last.current) return;
    last.current = key;
    const { a, e, t, d } = scratch;
    t.set(...p);
    e.set(...boomElbow(base, p, reachM, UP));
    placeBetween(link1.current, a, e, d);
    placeBetween(link2.current, e, t, d);
    elbow.current?.position.copy(e);
    if (plate.current) {
      plate.current.position.copy(t);
      d.subVectors(t, e);
      if (d.lengthSq() > 1e-12) plate.current.quaternion.setFromUnitVectors(Y, d.normalize());
    }
  };
  useLayoutEffect(() => {
    last.current = '';
    pose(typeof tip === 'function' ? tip() : tip);
  });
  useFrame(() => {
    if (typeof tip === 'function') pose(tip());
  });
  const linkMaterial = <meshStandardMaterial color={BOOM_COLORS.link} roughness={0.6} metalness={0.2} />;
  const jointMaterial = <meshStandardMaterial color={BOOM_COLORS.joint} roughness={0.5} />;
  return (
    <group name={`arm-${armKey}`}>
      <mesh position={base} rotation={[Math.PI / 2, 0, 0]} raycast={noRaycast}>
        <cylinderGeometry args={[size * 2, size * 2.4, size * 3, 16]} />
        {jointMaterial}
      </mesh>
      <mesh ref={link1} raycast={noRaycast}>
        <cylinderGeometry args={[size, size, 1, 12]} />
        {linkMaterial}
      </mesh>
      <mesh ref={elbow} raycast={noRaycast}>
        <sphereGeometry args={[size * 1.6, 16, 12]} />
        {jointMaterial}
      </mesh>
      <mesh ref={link2} raycast={noRaycast}>
        <cylinderGeometry args={[size * 0.85, size * 0.85, 1, 12]} />
        {linkMaterial}
      </mesh>
      <group ref={plate}>
        <mesh raycast={noRaycast}>
          <cylinderGeometry args={[size * 2.2, size * 2.2, size * 0.6, 16]} />
          <meshStandardMaterial color={BOOM_COLORS.plate} roughness={0.7} />
        </mesh>
      </group>
      <group position={base}>
        <TextSprite
          text={armKey}
          background={BOOM_COLORS.label}
          color="#111826"
          heightPx={16}
          shiftY={-0.6}
        />
      </group>
    </group>
  );
}

/** An arm's reach shell: the sphere its tip can reach, and the one it cannot come inside. */
export function ArmShell({ base, reachM, minReachM }: { base: Vec3; reachM: number; minReachM?: number }) {
  return (
    <group position={base}>
      <mesh renderOrder={3} raycast={noRaycast}>
        <sphereGeometry args={[reachM, 32, 20]} />
        <meshBasicMaterial
          color={BOOM_COLORS.shell}
          wireframe
          transparent
          opacity={0.18}
          depthWrite={false}
        />
      </mesh>
      {minReachM !== undefined && minReachM > 0 && (
        <mesh renderOrder={3} raycast={noRaycast}>
          <sphereGeometry args={[minReachM, 16, 12]} />
          <meshBasicMaterial
            color={BOOM_COLORS.shell}
            transparent
            opacity={0.12}
            depthWrite={false}
            side={THREE.DoubleSide}
          />
        </mesh>
      )}
    </group>
  );
}
