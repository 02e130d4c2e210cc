import fc from 'fast-check';
import { Euler, Matrix4, Vector3 } from 'three';
import { describe, expect, it } from 'vitest';
import {
  faceDistance,
  gridCandidates,
  nearestFacePoint,
  segmentFaces,
  trussFaces,
} from '@shared/compute/truss-faces';
import type { Segment, Vec3 } from '@shared/schemas/station';

const box = (center: Vec3, size: Vec3, rotationDeg?: Vec3, key = 'B'): Segment => ({
  key,
  kind: 'truss',
  center,
  size,
  ...(rotationDeg ? { rotationDeg } : {}),
});

const expectVec = (actual: Vec3, expected: Vec3, digits = 9) => {
  for (let i = 0; i < 3; i++) expect(actual[i]).toBeCloseTo(expected[i], digits);
};
const cross = (a: Vec3, b: Vec3): Vec3 => [
  a[1] * b[2] - a[2] * b[1],
  a[2] * b[0] - a[0] * b[2],
  a[0] * b[1] - a[1] * b[0],
];

describe('segment faces', () => {
  it('a unit cube has six faces with outward normals, u × v = normal', () => {
    const faces = segmentFaces(box([0, 0, 0], [1, 1, 1]));
    expect(faces).toHaveLength(6);
    const normals = faces.map((f) => f.normal.map((c) => Math.round(c)).join(','));
    expect(new Set(normals)).toEqual(new Set(['1,0,0', '-1,0,0', '0,1,0', '0,-1,0', '0,0,1', '0,0,-1']));
    for (const f of faces) {
      expectVec(f.center, f.normal.map((c) => c * 0.5) as Vec3);
      expectVec(cross(f.u, f.v), f.normal);
      expect([f.halfU, f.halfV]).toEqual([0.5, 0.5]);
    }
  });

  it('a box turned 90° about z puts its +x face on world +y', () => {
    const faces = segmentFaces(box([10, 0, 0], [4, 2, 1], [0, 0, 90]));
    const px = faces.find((f) => f.axis === 0 && f.sign === 1)!;
    expectVec(px.normal, [0, 1, 0]);
    expectVec(px.center, [10, 2, 0]);
    expect(px.halfU * px.halfV * 4).toBeCloseTo(2 * 1, 12);
    const py = faces.find((f) => f.axis === 1 && f.sign === 1)!;
    expectVec(py.normal, [-1, 0, 0]);
    expectVec(py.center, [9, 0, 0]);
  });

  it('rotations follow three.js Euler XYZ (the scene draws with it)', () => {
    const deg = fc.double({ min: -180, max: 180, noNaN: true });
    fc.assert(
      fc.property(deg, deg, deg, (a, b, c) => {
        const m = new Matrix4().makeRotationFromEuler(
          new Euler((a * Math.PI) / 180, (b * Math.PI) / 180, (c * Math.PI) / 180, 'XYZ'),
        );
        const size: Vec3 = [3, 2, 1];
        for (const f of segmentFaces(box([1, 2, 3], size, [a, b, c]))) {
          const local = new Vector3(0, 0, 0).setComponent(f.axis, f.sign);
          const n = local.clone().applyMatrix4(m);
          expectVec(f.normal, [n.x, n.y, n.z]);
          const centre = local
            .multiplyScalar(size[f.axis] / 2)
            .applyMatrix4(m)
            .add(new Vector3(1, 2, 3));
          expectVec(f.center, [centre.x, centre.y, centre.z]);
        }
      }),
      { numRuns: 100 },
    );
  });
});

describe('grid candidates', () => {
  it('counts points for a 5 × 3 × 3 bay', () => {
    const bay = [box([0, 0, 0], [5, 3, 3])];
    // faces ±x 3×3 m, ±y and ±z 5×3 m; 1 m spacing: 9 + 15 + 15 per side
    expect(gridCandidates(bay, 1)).toHaveLength(2 * (9 + 15 + 15));
    // 2 m spacing: 1 row across 3 m, 2 across 5 m
    expect(gridCandidates(bay, 2)).toHaveLength(2 * (1 + 2 + 2));
    // wider than every face: one point at each face centre
    expect(gridCandidates(bay, 10)).toHaveLength(6);
  });

  it('spaces points exactly, centred, at least half a spacing in from the edges, normal outward', () => {
    const pts = gridCandidates([box([0, 0, 0], [5, 3, 3])], 1).filter((p) => p.normal[2] > 0.5);
    expect(pts).toHaveLength(15);
    const xs = [...new Set(pts.map((p) => p.position[0]))].sort((a, b) => a - b);
    const ys = [...new Set(pts.map((p) => p.position[1]))].sort((a, b) => a - b);
    expect(xs).toEqual([-2, -1, 0, 1, 2]);
    expect(ys).toEqual([-1, 0, 1]);
    expect(pts.every((p) => p.position[2] === 1.5)).toBe(true);
  });

  it('skips the face two bays share and keeps the rest', () => {
    const two = [box([0, 0, 0], [1, 1, 1], undefined, 'A'), box([1, 0, 0], [1, 1, 1], undefined, 'B')];
    const pts = gridCandidates(two, 0.5);
    expect(pts).toHaveLength(10 * 4);
    expect(pts.some((p) => Math.abs(p.position[0] - 0.5) < 1e-9)).toBe(false);
  });

  it('skips points buried in an overlapping segment', () => {
    const big = box([0, 0, 0], [4, 4, 4], undefined, 'BIG');
    const small = box([0, 0, 0], [1, 1, 1], undefined, 'IN');
    expect(gridCandidates([big, small], 1)).toHaveLength(gridCandidates([big], 1).length);
  });

  it('grids only faces near the given points', () => {
    const bay = [box([0, 0, 0], [5, 3, 3])];
    const pts = gridCandidates(bay, 1, { near: [[0, 0, 3]], withinM: 1.6 });
    expect(pts).toHaveLength(15);
    expect(pts.every((p) => p.normal[2] === 1)).toBe(true);
    const faces = trussFaces(bay);
    expect(faces.filter((f) => faceDistance(f, [0, 0, 3]) <= 1.6)).toHaveLength(1);
  });

  it('refuses a spacing that is not a positive number', () => {
    expect(() => gridCandidates([box([0, 0, 0], [1, 1, 1])], 0)).toThrow(RangeError);
  });
});

describe('nearest face point', () => {
  const cube = [box([0, 0, 0], [1, 1, 1])];

  it('snaps outside, inside and corner points (hand-worked)', () => {
    const out = nearestFacePoint(cube, [2, 0.1, 0.2])!;
    expectVec(out.point, [0.5, 0.1, 0.2]);
    expectVec(out.normal, [1, 0, 0]);
    expect(out.distanceM).toBeCloseTo(1.5, 12);
    const inside = nearestFacePoint(cube, [0, -0.4, 0.1])!;
    expectVec(inside.point, [0, -0.5, 0.1]);
    expectVec(inside.normal, [0, -1, 0]);
    expect(inside.distanceM).toBeCloseTo(0.1, 12);
    const corner = nearestFacePoint(cube, [1, 1, 1])!;
    expectVec(corner.point, [0.5, 0.5, 0.5]);
    expect(corner.distanceM).toBeCloseTo(Math.sqrt(0.75), 12);
    expect(nearestFacePoint([], [0, 0, 0])).toBeNull();
  });

  it('picks the nearer of two segments', () => {
    const two = [box([0, 0, 0], [1, 1, 1], undefined, 'A'), box([5, 0, 0], [1, 1, 1], undefined, 'B')];
    const r = nearestFacePoint(two, [3.9, 0, 0])!;
    expect(r.segment).toBe('B');
    expectVec(r.point, [4.5, 0, 0]);
    expectVec(r.normal, [-1, 0, 0]);
  });

  it('is no farther than any sampled surface point of a rotated box', () => {
    const seg = box([1, -2, 0.5], [3, 2, 1], [20, -35, 70]);
    const samples = gridCandidates([seg], 0.1).map((p) => p.position);
    const coord = fc.double({ min: -5, max: 5, noNaN: true });
    fc.assert(
      fc.property(coord, coord, coord, (x, y, z) => {
        const r = nearestFacePoint([seg], [x, y, z])!;
        const brute = Math.min(...samples.map((s) => Math.hypot(s[0] - x, s[1] - y, s[2] - z)));
        expect(r.distanceM).toBeLessThanOrEqual(brute + 1e-9);
        // the snapped point is on the surface: no farther than the sampling pitch from a sample
        const gap = Math.min(
          ...samples.map((s) => Math.hypot(s[0] - r.point[0], s[1] - r.point[1], s[2] - r.point[2])),
        );
        expect(gap).toBeLessThan(0.1);
        expect(Math.hypot(...r.normal)).toBeCloseTo(1, 12);
      }),
      { numRuns: 200 },
    );
  });
});
