import type { Hazard, Vec3 } from '../schemas/station';

export type ReadonlyVec3 = readonly [number, number, number];

export function add(a: ReadonlyVec3, b: ReadonlyVec3): Vec3 {
  return [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
}

export function sub(a: ReadonlyVec3, b: ReadonlyVec3): Vec3 {
  return [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
}

export function scale(a: ReadonlyVec3, k: number): Vec3 {
  return [a[0] * k, a[1] * k, a[2] * k];
}

export function dot(a: ReadonlyVec3, b: ReadonlyVec3): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

export function cross(a: ReadonlyVec3, b: ReadonlyVec3): Vec3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

export function norm(a: ReadonlyVec3): number {
  return Math.hypot(a[0], a[1], a[2]);
}

export function dist(a: ReadonlyVec3, b: ReadonlyVec3): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

/** Unit vector along `a`; the zero vector stays zero. */
export function normalize(a: ReadonlyVec3): Vec3 {
  const n = norm(a);
  return n > 0 ? scale(a, 1 / n) : [0, 0, 0];
}

/** Parameter t in [0, 1] of the point of segment a→b closest to p. */
export function closestParamOnSegment(a: ReadonlyVec3, b: ReadonlyVec3, p: ReadonlyVec3): number {
  const ab = sub(b, a);
  const len2 = dot(ab, ab);
  if (len2 === 0) return 0;
  const t = dot(sub(p, a), ab) / len2;
  return t < 0 ? 0 : t > 1 ? 1 : t;
}

export function distancePointToSegment(p: ReadonlyVec3, a: ReadonlyVec3, b: ReadonlyVec3): number {
  const t = closestParamOnSegment(a, b, p);
  return dist(p, [a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t, a[2] + (b[2] - a[2]) * t]);
}

/** Touching the surface counts as intersecting: for keep-out volumes the safe side is "blocked". */
export function segmentIntersectsSphere(
  a: ReadonlyVec3,
  b: ReadonlyVec3,
  center: ReadonlyVec3,
  radius: number,
): boolean {
  return distancePointToSegment(center, a, b) <= radius;
}

/** Slab test over t in [0, 1]; touching a face counts as intersecting. */
export function segmentIntersectsAabb(
  a: ReadonlyVec3,
  b: ReadonlyVec3,
  min: ReadonlyVec3,
  max: ReadonlyVec3,
): boolean {
  let t0 = 0;
  let t1 = 1;
  for (let i = 0; i < 3; i++) {
    const d = b[i] - a[i];
    if (d === 0) {
      if (a[i] < min[i] || a[i] > max[i]) return false;
      continue;
    }
    let tNear = (min[i] - a[i]) / d;
    let tFar = (max[i] - a[i]) / d;
    if (tNear > tFar) [tNear, tFar] = [tFar, tNear];
    if (tNear > t0) t0 = tNear;
    if (tFar < t1) t1 = tFar;
    if (t0 > t1) return false;
  }
  return true;
}

/** The hazard's bounding box, for cheap rejection before the exact test. */
export function hazardBounds(h: Hazard): { min: Vec3; max: Vec3 } {
  if (h.shape === 'box') return { min: [...h.min], max: [...h.max] };
  const r = h.radiusM;
  return {
    min: [h.center[0] - r, h.center[1] - r, h.center[2] - r],
    max: [h.center[0] + r, h.center[1] + r, h.center[2] + r],
  };
}

export function segmentIntersectsHazard(a: ReadonlyVec3, b: ReadonlyVec3, h: Hazard): boolean {
  return h.shape === 'sphere'
    ? segmentIntersectsSphere(a, b, h.center, h.radiusM)
    : segmentIntersectsAabb(a, b, h.min, h.max);
}

export function pointInHazard(p: ReadonlyVec3, h: Hazard): boolean {
  return segmentIntersectsHazard(p, p, h);
}
