import * as THREE from 'three';
import { STATION_UP } from './frame';

/**
 * Where the camera must stand to see a box whole along `direction`: every point (the model's
 * outline points, flat x, y, z or vectors, or a box's corners) is projected onto the view plane, so a long truss seen end-on or obliquely fills the frame. Zenith
 * and nadir views lean a hair towards fore, so the camera's up (+z) is never parallel to the view.
 */
export function framing(
  subject: THREE.Box3 | readonly THREE.Vector3[] | Float64Array,
  direction: THREE.Vector3,
  fovDeg: number,
  aspect: number,
  minRadiusM = 0.5,
) {
  const up = new THREE.Vector3(...STATION_UP);
  const dir = direction.clone().normalize();
  if (Math.abs(dir.dot(up)) > 0.999) dir.add(new THREE.Vector3(0, 1e-3, 0)).normalize();
  const right = new THREE.Vector3().crossVectors(dir, up).negate().normalize();
  const screenUp = new THREE.Vector3().crossVectors(right, dir.clone().negate()).normalize();
  const tanV = Math.tan((fovDeg * Math.PI) / 360);
  const tanH = tanV * aspect;
  const flat =
    subject instanceof Float64Array
      ? subject
      : Float64Array.from(
          (Array.isArray(subject) ? subject : boxCorners(subject as THREE.Box3)).flatMap((p) => [
            p.x,
            p.y,
            p.z,
          ]),
        );
  const box = new THREE.Box3();
  const corner = new THREE.Vector3();
  for (let i = 0; i < flat.length; i += 3) box.expandByPoint(corner.set(flat[i], flat[i + 1], flat[i + 2]));
  const center = box.getCenter(new THREE.Vector3());
  const radius = Math.max(box.getBoundingSphere(new THREE.Sphere()).radius, minRadiusM);
  let distance = minRadiusM / Math.min(tanV, tanH);
  for (let i = 0; i < flat.length; i += 3) {
    corner.set(flat[i], flat[i + 1], flat[i + 2]).sub(center);
    const toward = corner.dot(dir);
    distance = Math.max(
      distance,
      Math.abs(corner.dot(right)) / tanH + toward,
      Math.abs(corner.dot(screenUp)) / tanV + toward,
    );
  }
  distance *= 1.08;
  return { target: center, position: center.clone().addScaledVector(dir, distance), distance, radius };
}

export function boxCorners(box: THREE.Box3): THREE.Vector3[] {
  return Array.from(
    { length: 8 },
    (_, i) =>
      new THREE.Vector3(
        i & 1 ? box.max.x : box.min.x,
        i & 2 ? box.max.y : box.min.y,
        i & 4 ? box.max.z : box.min.z,
      ),
  );
}
