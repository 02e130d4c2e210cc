import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  normalizeYawDeg,
  reachCheck,
  restraintAngles,
  restraintFrame,
  roundToStep,
  workPoint,
} from '@shared/compute/reach';
import type { Vec3 } from '@shared/schemas/station';

// h = 1 m and R = 0.7 m are planning defaults from memory (the envelope concept is NASA-STD-3000 Vol. I §14.3–14.5; its dimensions are not verified).
const base = { standOffM: 1, radiusM: 0.7, yawStepDeg: 15, pitchStepDeg: 15 };
const at = (socketNormal: Vec3, target: Vec3, socketPosition: Vec3 = [0, 0, 0]) =>
  reachCheck({ ...base, socketPosition, socketNormal, target });

const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const cross = (a: Vec3, b: Vec3): Vec3 => [
  a[1] * b[2] - a[2] * b[1],
  a[2] * b[0] - a[0] * b[2],
  a[0] * b[1] - a[1] * b[0],
];
const rad = (d: number) => (d * Math.PI) / 180;

describe('reach envelope (hand-worked, socket at the origin, normal +z, h 1, R 0.7)', () => {
  it('a target 0.5 m above the work point is reachable', () => {
    const r = at([0, 0, 1], [0, 0, 1.5]);
    expect(r.reachable).toBe(true);
    expect(r.distanceM).toBeCloseTo(0.5, 12);
    expect(r.pitchDeg).toBeCloseTo(90, 12);
    expect(r.yawDeg).toBe(0);
  });

  it('a target 0.8 m to the side of the work point is not', () => {
    const r = at([0, 0, 1], [0.8, 0, 1]);
    expect(r.reachable).toBe(false);
    expect(r.distanceM).toBeCloseTo(0.8, 12);
    expect(r.yawDeg).toBeCloseTo(0, 12);
    expect(r.pitchDeg).toBeCloseTo(0, 12);
  });

  it('a target exactly on the envelope counts as reachable', () => {
    expect(at([0, 0, 1], [0.7, 0, 1]).reachable).toBe(true);
    expect(at([0, 0, 1], [0.7000001, 0, 1]).reachable).toBe(false);
  });

  it('measures from the work point, not the socket, and uses a normalised normal', () => {
    expect(workPoint([1, 2, 3], [0, 0, 2], 1)).toEqual([1, 2, 4]);
    const r = reachCheck({ ...base, socketPosition: [5, 5, 5], socketNormal: [0, 0, 3], target: [5, 5, 6] });
    expect(r.distanceM).toBeCloseTo(0, 12);
    expect(r.pitchDeg).toBe(0);
    expect(() => workPoint([0, 0, 0], [0, 0, 0], 1)).toThrow(RangeError);
  });
});

describe('restraint yaw and pitch conventions', () => {
  it.each([
    [[1, 1, 1], 45],
    [[-1, 1, 1], 135],
    [[-1, -1, 1], -135],
    [[1, -1, 1], -45],
    [[-1, 0, 1], 180],
    [[0, 1, 1], 90],
  ] as [Vec3, number][])('normal +z: yaw to %j is %d° (right-hand rule from +x)', (target, yaw) => {
    expect(at([0, 0, 1], target).yawDeg).toBeCloseTo(yaw, 10);
  });

  it.each([
    // normal, target, yaw: the reference is +x projected on the socket plane, or +y when n is ±x
    [[0, 0, -1], [0, 1, -1], -90],
    [[1, 0, 0], [1, 0, 1], 90],
    [[1, 0, 0], [1, 1, 0], 0],
    [[-1, 0, 0], [-1, 0, 1], -90],
    [[0, 1, 0], [0, 1, 1], -90],
    [[0, 1, 0], [1, 1, 0], 0],
    [[0, -1, 0], [0, -1, 1], 90],
  ] as [Vec3, Vec3, number][])('normal %j: yaw to %j is %d°', (normal, target, yaw) => {
    expect(at(normal, target).yawDeg).toBeCloseTo(yaw, 10);
  });

  it.each([
    [[0, 0, 1], [1, 0, 2], 45],
    [[0, 0, 1], [1, 0, 0], -45],
    [[0, 0, -1], [0, 0, -2], 90],
    [[0, 0, -1], [1, 0, 0], -45],
    [[1, 0, 0], [2, 0, 0], 90],
    [[-1, 0, 0], [-1, 1, 0], 0],
    [[0, -1, 0], [0, 0, 0], -90],
  ] as [Vec3, Vec3, number][])(
    'normal %j: pitch to %j is %d° (positive away from the structure)',
    (normal, target, pitch) => {
      expect(at(normal, target).pitchDeg).toBeCloseTo(pitch, 10);
    },
  );

  it('yaw and pitch rebuild the direction from the work point (Rodrigues rotation about n)', () => {
    const vec = fc.tuple(
      fc.double({ min: -3, max: 3, noNaN: true }),
      fc.double({ min: -3, max: 3, noNaN: true }),
      fc.double({ min: -3, max: 3, noNaN: true }),
    );
    fc.assert(
      fc.property(vec, vec, vec, (n0, p, t) => {
        fc.pre(Math.hypot(...n0) > 0.1);
        const len = Math.hypot(...n0);
        const n: Vec3 = [n0[0] / len, n0[1] / len, n0[2] / len];
        const c: Vec3 = [p[0] + n[0], p[1] + n[1], p[2] + n[2]];
        const d: Vec3 = [t[0] - c[0], t[1] - c[1], t[2] - c[2]];
        const dl = Math.hypot(...d);
        fc.pre(dl > 1e-3);
        const r = reachCheck({ ...base, socketPosition: p, socketNormal: n0, target: t });
        expect(r.distanceM).toBeCloseTo(dl, 9);
        // the reference: +x (or +y) with its n component removed
        const axis: Vec3 = Math.hypot(n[1], n[2]) < 1e-6 ? [0, 1, 0] : [1, 0, 0];
        const k = dot(axis, n);
        const r0: Vec3 = [axis[0] - k * n[0], axis[1] - k * n[1], axis[2] - k * n[2]];
        const rl = Math.hypot(...r0);
        const ref: Vec3 = [r0[0] / rl, r0[1] / rl, r0[2] / rl];
        // rotate ref about n by yaw: v cosθ + (n × v) sinθ (v ⟂ n)
        const y = rad(r.yawDeg);
        const nxr = cross(n, ref);
        const h: Vec3 = [0, 1, 2].map((i) => ref[i] * Math.cos(y) + nxr[i] * Math.sin(y)) as Vec3;
        const q = rad(r.pitchDeg);
        const dir = [0, 1, 2].map((i) => h[i] * Math.cos(q) + n[i] * Math.sin(q));
        for (let i = 0; i < 3; i++) expect(dir[i]).toBeCloseTo(d[i] / dl, 6);
        expect(r.yawDeg).toBeGreaterThan(-180);
        expect(r.yawDeg).toBeLessThanOrEqual(180);
        expect(Math.abs(r.pitchDeg)).toBeLessThanOrEqual(90);
      }),
      { numRuns: 300 },
    );
  });

  it('the restraint frame is orthonormal and right-handed', () => {
    for (const n of [
      [0, 0, 1],
      [1, 0, 0],
      [-1, 0, 0],
      [0.3, -0.4, 0.866],
      [0, -1, 0],
    ] as Vec3[]) {
      const f = restraintFrame(n);
      expect(dot(f.ref, f.up)).toBeCloseTo(0, 12);
      expect(dot(f.side, f.up)).toBeCloseTo(0, 12);
      expect(Math.hypot(...f.ref)).toBeCloseTo(1, 12);
      const c = cross(f.ref, f.side);
      for (let i = 0; i < 3; i++) expect(c[i]).toBeCloseTo(f.up[i], 12);
    }
  });

  it('a target straight above the work point has yaw 0', () => {
    const f = restraintFrame([0, 0, 1]);
    expect(restraintAngles(f, [0, 0, 1], [0, 0, 3])).toEqual({ yawDeg: 0, pitchDeg: 90 });
    expect(restraintAngles(f, [0, 0, 1], [0, 0, 1])).toEqual({ yawDeg: 0, pitchDeg: 0 });
  });
});

describe('setting steps', () => {
  it('rounds half away from zero', () => {
    expect(roundToStep(22.5, 15)).toBe(30);
    expect(roundToStep(-22.5, 15)).toBe(-30);
    expect(roundToStep(7.4, 15)).toBe(0);
    expect(roundToStep(7.5, 15)).toBe(15);
    expect(roundToStep(-7.5, 15)).toBe(-15);
    expect(roundToStep(-7.4, 15)).toBe(0);
    expect(roundToStep(37, 10)).toBe(40);
    expect(() => roundToStep(1, 0)).toThrow(RangeError);
  });

  it('normalises yaw to (−180, 180]', () => {
    expect(normalizeYawDeg(-180)).toBe(180);
    expect(normalizeYawDeg(180)).toBe(180);
    expect(normalizeYawDeg(540)).toBe(180);
    expect(normalizeYawDeg(-190)).toBe(170);
    expect(Object.is(normalizeYawDeg(-360), 0)).toBe(true);
  });

  it('set angles snap to the steps, yaw wrapping past ±180', () => {
    const dirAt = (yawDeg: number, pitchDeg: number): Vec3 => [
      0.5 * Math.cos(rad(pitchDeg)) * Math.cos(rad(yawDeg)),
      0.5 * Math.cos(rad(pitchDeg)) * Math.sin(rad(yawDeg)),
      1 + 0.5 * Math.sin(rad(pitchDeg)),
    ];
    const r1 = at([0, 0, 1], dirAt(52.5, 22.5));
    expect(r1.yawDeg).toBeCloseTo(52.5, 9);
    expect([r1.yawSetDeg, r1.pitchSetDeg]).toEqual([60, 30]);
    const r2 = at([0, 0, 1], dirAt(-172.5, -7.4));
    expect([r2.yawSetDeg, r2.pitchSetDeg]).toEqual([180, 0]);
    const r3 = at([0, 0, 1], dirAt(-97, 44));
    expect([r3.yawSetDeg, r3.pitchSetDeg]).toEqual([-90, 45]);
  });

  it('pitch keeps to the largest step multiple within ±90', () => {
    const r = reachCheck({
      ...base,
      pitchStepDeg: 25,
      socketPosition: [0, 0, 0],
      socketNormal: [0, 0, 1],
      target: [0.01, 0, 1.5],
    });
    expect(r.pitchDeg).toBeGreaterThan(88);
    expect(r.pitchSetDeg).toBe(75);
    expect(at([0, 0, 1], [0, 0, 1.5]).pitchSetDeg).toBe(90);
  });
});
