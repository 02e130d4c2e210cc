import { useEffect, useImperativeHandle, useMemo, useRef, type Ref } from 'react';
import { OrbitControls } from '@react-three/drei';
import { useThree } from '@react-three/fiber';
import * as THREE from 'three';
import type { OrbitControls as OrbitControlsImpl } from 'three-stdlib';
import type { Vec3 } from '@shared/schemas/station';
import { PRESET_DIRECTIONS, type PresetView } from '../builders/frame';
import { framing } from '../builders/framing';
import type { SceneApi } from './scene-api';

/** Framing a few points keeps a few metres of structure round them, so the view stays readable. */
const FOCUS_RADIUS_M = 4;
const HOME_DIRECTION = new THREE.Vector3(0.55, 0.75, 0.45).normalize();

export function CameraRig({ outline, apiRef }: { outline: Float64Array; apiRef: Ref<SceneApi> }) {
  const get = useThree((s) => s.get);
  const invalidate = useThree((s) => s.invalidate);
  const controls = useRef<OrbitControlsImpl>(null);

  const api = useMemo<SceneApi>(() => {
    const frame = (
      subject: readonly THREE.Vector3[] | Float64Array,
      direction: THREE.Vector3,
      minRadiusM?: number,
    ) => {
      const camera = get().camera as THREE.PerspectiveCamera;
      const f = framing(subject, direction, camera.fov, camera.aspect || 1, minRadiusM);
      camera.position.copy(f.position);
      camera.near = Math.max(0.01, f.distance / 1000);
      camera.far = f.distance + f.radius * 20;
      camera.updateProjectionMatrix();
      const orbit = controls.current;
      if (orbit) {
        orbit.target.copy(f.target);
        orbit.update();
      } else camera.lookAt(f.target);
      invalidate();
    };
    const currentDirection = () => {
      const camera = get().camera;
      const target = controls.current?.target ?? new THREE.Vector3();
      const d = camera.position.clone().sub(target);
      return d.lengthSq() > 0 ? d : HOME_DIRECTION.clone();
    };
    return {
      fitToView(points?: readonly Vec3[]) {
        const subject = points?.length ? points.map((p) => new THREE.Vector3(...p)) : outline;
        frame(subject, currentDirection(), points?.length ? FOCUS_RADIUS_M : undefined);
      },
      setPresetView(name: PresetView | 'home') {
        frame(
          outline,
          name === 'home' ? HOME_DIRECTION.clone() : new THREE.Vector3(...PRESET_DIRECTIONS[name]),
        );
      },
    };
  }, [outline, get, invalidate]);

  useImperativeHandle(apiRef, () => api, [api]);
  useEffect(() => api.setPresetView('home'), [api]);

  return <OrbitControls ref={controls} makeDefault enableDamping={false} />;
}
