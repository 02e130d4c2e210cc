import { useLayoutEffect, useMemo, useRef } from 'react';
import { useThree, type ThreeEvent } from '@react-three/fiber';
import * as THREE from 'three';
import type { Annotation } from '@shared/schemas/annotations';
import { useAnnotations } from '../api/get-annotations';

// bright on the scene's dark background; the shapes carry the meaning, the colours repeat it
const OPEN_COLOR = '#ffb020';
const RESOLVED_COLOR = '#a9b6cc';

interface PinSetProps {
  items: readonly Annotation[];
  shape: 'cone' | 'ring';
  size: number;
  openId: number | null;
  onOpen: (id: number) => void;
}

/** One instanced mesh for all pins of one status: draw calls do not grow with the number of notes. */
function PinSet({ items, shape, size, openId, onOpen }: PinSetProps) {
  const ref = useRef<THREE.InstancedMesh>(null);
  const invalidate = useThree((s) => s.invalidate);
  const geometry = useMemo(() => {
    if (shape === 'cone') {
      // tip at the origin, pointing down onto the pinned spot
      const g = new THREE.ConeGeometry(0.35, 1, 12);
      g.rotateX(Math.PI);
      g.translate(0, 0.5, 0);
      g.rotateX(Math.PI / 2);
      return g;
    }
    const g = new THREE.TorusGeometry(0.4, 0.1, 8, 20);
    g.translate(0, 0, 0.5);
    return g;
  }, [shape]);
  useLayoutEffect(() => () => geometry.dispose(), [geometry]);

  useLayoutEffect(() => {
    const mesh = ref.current;
    if (!mesh) return;
    const m = new THREE.Matrix4();
    const q = new THREE.Quaternion();
    items.forEach((a, i) => {
      const s = size * (a.id === openId ? 1.6 : 1);
      m.compose(new THREE.Vector3(...a.position), q, new THREE.Vector3(s, s, s));
      mesh.setMatrixAt(i, m);
    });
    mesh.count = items.length;
    mesh.instanceMatrix.needsUpdate = true;
    mesh.computeBoundingSphere();
    invalidate();
  }, [items, size, openId, invalidate]);

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
      <meshStandardMaterial color={shape === 'cone' ? OPEN_COLOR : RESOLVED_COLOR} emissive={shape === 'cone' ? OPEN_COLOR : RESOLVED_COLOR} emissiveIntensity={0.35} />
    </instancedMesh>
  );
}

export interface AnnotationPinsProps {
  stationId: number;
  openId: number | null;
  onOpen: (id: number) => void;
  /** pin height in metres */
  size?: number;
}

/** The station's notes as 3D pins, for the scene's `overlays`. */
export function AnnotationPins({ stationId, openId, onOpen, size = 1.2 }: AnnotationPinsProps) {
  const notes = useAnnotations(stationId);
  const [open, resolved] = useMemo(() => {
    const all = notes.data ?? [];
    return [all.filter((a) => a.status === 'open'), all.filter((a) => a.status === 'resolved')];
  }, [notes.data]);
  return (
    <group name="annotation-pins">
      <PinSet items={open} shape="cone" size={size} openId={openId} onOpen={onOpen} />
      <PinSet items={resolved} shape="ring" size={size} openId={openId} onOpen={onOpen} />
    </group>
  );
}
