import { useLayoutEffect, useMemo, useRef } from 'react';
import { useFrame, useThree, type ThreeEvent } from '@react-three/fiber';
import * as THREE from 'three';
import { mergeGeometries } from 'three/examples/jsm/utils/BufferGeometryUtils.js';
import type { Annotation } from '@shared/schemas/annotations';
import { useAnnotations } from '../api/get-annotations';

// bright on the scene's dark background and unlike any node glyph; the shapes carry the meaning
const OPEN_COLOR = '#5cc8ff';
const RESOLVED_COLOR = '#a9b6cc';
/** pin height as a share of the distance to the camera: pins keep their size on screen at any zoom */
const SCREEN_SHARE = 0.035;
const MIN_HEIGHT_M = 0.3;

interface PinSetProps {
  items: readonly Annotation[];
  shape: 'pin' | 'ring';
  openId: number | null;
  onOpen: (id: number) => void;
}

/** One instanced mesh for all pins of one status: draw calls do not grow with the number of notes. */
function PinSet({ items, shape, openId, onOpen }: PinSetProps) {
  const ref = useRef<THREE.InstancedMesh>(null);
  const invalidate = useThree((s) => s.invalidate);
  const geometry = useMemo(() => {
    if (shape === 'pin') {
      // a ball on a stalk standing on the pinned spot (+z is zenith)
      const stalk = new THREE.CylinderGeometry(0.04, 0.04, 1, 6).translate(0, 0.5, 0);
      const head = new THREE.SphereGeometry(0.28, 16, 12).translate(0, 1, 0);
      const g = mergeGeometries([stalk.toNonIndexed(), head.toNonIndexed()])!;
      g.rotateX(Math.PI / 2);
      return g;
    }
    const g = new THREE.TorusGeometry(0.4, 0.1, 8, 20);
    g.translate(0, 0, 0.5);
    return g;
  }, [shape]);
  useLayoutEffect(() => () => geometry.dispose(), [geometry]);

  useLayoutEffect(() => invalidate(), [items, openId, invalidate]);

  const scratch = useMemo(
    () => ({
      m: new THREE.Matrix4(),
      q: new THREE.Quaternion(),
      p: new THREE.Vector3(),
      s: new THREE.Vector3(),
    }),
    [],
  );
  useFrame(({ camera }) => {
    const mesh = ref.current;
    if (!mesh) return;
    const { m, q, p, s } = scratch;
    items.forEach((a, i) => {
      p.set(...a.position);
      const h =
        Math.max(MIN_HEIGHT_M, camera.position.distanceTo(p) * SCREEN_SHARE) * (a.id === openId ? 1.5 : 1);
      mesh.setMatrixAt(i, m.compose(p, q, s.set(h, h, h)));
    });
    mesh.count = items.length;
    mesh.instanceMatrix.needsUpdate = true;
    mesh.computeBoundingSphere();
  });

  if (!items.length) return null;
  return (
    <instancedMesh
      key={items.length}
      ref={ref}
      args={[geometry, undefined, items.length]}
      renderOrder={12}
      onClick={(e: ThreeEvent<MouseEvent>) => {
        e.stopPropagation();
        const a = e.instanceId !== undefined ? items[e.instanceId] : undefined;
        if (a) onOpen(a.id);
      }}
    >
      <meshStandardMaterial
        color={shape === 'pin' ? OPEN_COLOR : RESOLVED_COLOR}
        emissive={shape === 'pin' ? OPEN_COLOR : RESOLVED_COLOR}
        emissiveIntensity={0.35}
      />
    </instancedMesh>
  );
}

export interface AnnotationPinsProps {
  stationId: number;
  openId: number | null;
  onOpen: (id: number) => void;
}

/** The station's notes as 3D pins, for the scene's `overlays`. */
export function AnnotationPins({ stationId, openId, onOpen }: AnnotationPinsProps) {
  const notes = useAnnotations(stationId);
  const [open, resolved] = useMemo(() => {
    const all = notes.data ?? [];
    return [all.filter((a) => a.status === 'open'), all.filter((a) => a.status === 'resolved')];
  }, [notes.data]);
  return (
    <group name="annotation-pins">
      <PinSet items={open} shape="pin" openId={openId} onOpen={onOpen} />
      <PinSet items={resolved} shape="ring" openId={openId} onOpen={onOpen} />
    </group>
  );
}
