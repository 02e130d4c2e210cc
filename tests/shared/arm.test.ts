import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { armPathKeepOuts, armShellCheck, armTipAt, armTipMoveSeconds } from '@shared/compute/arm';
import { ArmSchema, parseStationDocument, type Hazard, type Vec3 } from '@shared/schemas/station';

// The arm's length is about 17.6 m (space agency public material); tip speed 0.05 m/s and
// 60 s settle are planning defaults from memory. Every expected value below is worked by hand.
const arm = { reachM: 17.6, minReachM: 2, tipSpeedMps: 0.05, settleSeconds: 60 };
const base: Vec3 = [10, 0, 0];

describe('reach shell membership (worked by hand, base at (10, 0, 0), shell 2–17.6 m)', () => {
  it('a point 3-4-12 away is 13 m from the base: inside', () => {
    const r = armShellCheck(arm, base, [13, 4, 12]);
    expect(r.distanceM).toBeCloseTo(13, 12);
    expect(r.within).toBe(true);
    expect(r.outsideByM).toBe(0);
  });

  it('a point 2-10-11 away is 15 m away (4 + 100 + 121 = 225): inside', () => {
    expect(armShellCheck(arm, base, [12, 10, 11]).within).toBe(true);
  });

  it('a point 18 m along x is 0.4 m beyond the reach', () => {
    const r = armShellCheck(arm, base, [28, 0, 0]);
    expect(r.within).toBe(false);
    expect(r.side).toBe('beyond');
    expect(r.outsideByM).toBeCloseTo(0.4, 12);
  });

  it('a point 1-1-1 away is √3 ≈ 1.732 m away: 0.268 m inside the minimum reach', () => {
    const r = armShellCheck(arm, base, [11, 1, 1]);
    expect(r.within).toBe(false);
    expect(r.side).toBe('too-close');
    expect(r.outsideByM).toBeCloseTo(2 - Math.sqrt(3), 12);
  });

  it('both surfaces of the shell count as inside', () => {
    expect(armShellCheck(arm, base, [27.6, 0, 0]).within).toBe(true);
    expect(armShellCheck(arm, base, [10, -2, 0]).within).toBe(true);
  });

  it('without a minimum reach the base itself is inside', () => {
    expect(armShellCheck({ reachM: 5 }, base, base).within).toBe(true);
  });
});

describe('tip-move time = distance / tip speed + settle (worked by hand)', () => {
  it('a 6-8-0 move is 10 m: 10 / 0.05 = 200 s, plus 60 s settle = 260 s', () => {
    expect(armTipMoveSeconds(arm, [0, 0, 0], [6, 8, 0])).toBeCloseTo(260, 9);
  });

  it('a 1-2-2 move is 3 m: at 0.1 m/s and 30 s settle, 30 + 30 = 60 s', () => {
    expect(armTipMoveSeconds({ tipSpeedMps: 0.1, settleSeconds: 30 }, [1, 1, 1], [2, 3, 3])).toBeCloseTo(
      60,
      9,
    );
  });

  it('staying put is no move', () => {
    expect(armTipMoveSeconds(arm, [1, 2, 3], [1, 2, 3])).toBe(0);
  });

  it('the tip is half-way at half the travel time, and still during the settle', () => {
    expect(armTipAt([0, 0, 0], [10, 0, 0], 100, 300, 200)).toEqual([5, 0, 0]);
    expect(armTipAt([0, 0, 0], [10, 0, 0], 100, 300, 330)).toEqual([10, 0, 0]);
    expect(armTipAt([0, 0, 0], [10, 0, 0], 100, 300, 50)).toEqual([0, 0, 0]);
  });
});

describe('tip path against keep-out volumes', () => {
  const sphere: Hazard = { key: 'RAD', kind: 'keep-out', shape: 'sphere', center: [5, 0, 0], radiusM: 1 };
  const box: Hazard = { key: 'BOX', kind: 'keep-out', shape: 'box', min: [4, 4, -1], max: [6, 6, 1] };
  const caution: Hazard = { key: 'ANT', kind: 'caution', shape: 'sphere', center: [5, 0, 0], radiusM: 3 };

  it('worked by hand: a path through the sphere, past it 1.5 m off, touching the box face', () => {
    expect(armPathKeepOuts([0, 0, 0], [10, 0, 0], [sphere, box, caution])).toEqual(['RAD']);
    expect(armPathKeepOuts([0, 1.5, 0], [10, 1.5, 0], [sphere])).toEqual([]);
    // the line y = 4 lies on the box's face: touching counts
    expect(armPathKeepOuts([0, 4, 0], [10, 4, 0], [box])).toEqual(['BOX']);
    // stops 0.5 m short of the sphere
    expect(armPathKeepOuts([0, 0, 0], [3.5, 0, 0], [sphere])).toEqual([]);
  });

  // An independent routine: the segment meets a sphere when the quadratic |a + t(b − a) − c|² = r² has
  // a root in [0, 1] (or an end lies inside); it meets a box when the distance from the segment's
  // point to the box (its L1 distance, a convex function of t), has a minimum of 0 (golden-section search).
  const sphereHit = (a: Vec3, b: Vec3, c: Vec3, r: number) => {
    const d = [b[0] - a[0], b[1] - a[1], b[2] - a[2]];
    const f = [a[0] - c[0], a[1] - c[1], a[2] - c[2]];
    const A = d[0] ** 2 + d[1] ** 2 + d[2] ** 2;
    const B = 2 * (f[0] * d[0] + f[1] * d[1] + f[2] * d[2]);
    const C = f[0] ** 2 + f[1] ** 2 + f[2] ** 2 - r * r;
    if (C <= 0) return true;
    if (A === 0) return false;
    const disc = B * B - 4 * A * C;
    if (disc < 0) return false;
    const t1 = (-B - Math.sqrt(disc)) / (2 * A);
    const t2 = (-B + Math.sqrt(disc)) / (2 * A);
    return (t1 >= 0 && t1 <= 1) || (t2 >= 0 && t2 <= 1);
  };
  const boxDistance = (a: Vec3, b: Vec3, min: Vec3, max: Vec3) => {
    const at = (t: number) => {
      let s = 0;
      for (let i = 0; i < 3; i++) {
        const x = a[i] + (b[i] - a[i]) * t;
        const o = x < min[i] ? min[i] - x : x > max[i] ? x - max[i] : 0;
        s += o;
      }
      return s;
    };
    let lo = 0;
    let hi = 1;
    const g = (Math.sqrt(5) - 1) / 2;
    for (let k = 0; k < 200; k++) {
      const m1 = hi - g * (hi - lo);
      const m2 = lo + g * (hi - lo);
      if (at(m1) <= at(m2)) hi = m2;
      else lo = m1;
    }
    return Math.min(at(lo), at(hi), at(0), at(1));
  };
  const coord = fc.double({ min: -10, max: 10, noNaN: true });
  const vec = fc.tuple(coord, coord, coord) as fc.Arbitrary<Vec3>;
  const side = fc.double({ min: 0.05, max: 5, noNaN: true });

  it('agrees with the quadratic on random segments and spheres (away from tangency)', () => {
    fc.assert(
      fc.property(vec, vec, vec, fc.double({ min: 0.1, max: 6, noNaN: true }), (a, b, c, r) => {
        const h: Hazard = { key: 'S', kind: 'keep-out', shape: 'sphere', center: c, radiusM: r };
        const inflated = sphereHit(a, b, c, r * (1 + 1e-6));
        const deflated = sphereHit(a, b, c, r * (1 - 1e-6));
        fc.pre(inflated === deflated);
        expect(armPathKeepOuts(a, b, [h]).length === 1).toBe(deflated);
      }),
      { numRuns: 2000 },
    );
  });

  it('agrees with a golden-section distance on random segments and boxes (away from touching)', () => {
    fc.assert(
      fc.property(vec, vec, vec, fc.tuple(side, side, side), (a, b, c, size) => {
        const min: Vec3 = [c[0] - size[0], c[1] - size[1], c[2] - size[2]];
        const max: Vec3 = [c[0] + size[0], c[1] + size[1], c[2] + size[2]];
        const d = boxDistance(a, b, min, max);
        fc.pre(d === 0 || d > 1e-6);
        const h: Hazard = { key: 'B', kind: 'keep-out', shape: 'box', min, max };
        expect(armPathKeepOuts(a, b, [h]).length === 1).toBe(d === 0);
      }),
      { numRuns: 2000 },
    );
  });
});

describe('arms in the station document', () => {
  const doc = (arms: unknown[]) => ({
    format: 'tetherwise.station',
    version: 1,
    name: 'Arm test',
    nodes: [{ key: 'BASE', kind: 'junction', position: [0, 0, 0] }],
    edges: [],
    arms,
  });
  const good = { key: 'ARM-1', baseNode: 'BASE', reachM: 17.6, tipSpeedMps: 0.05, settleSeconds: 60 };

  it('accepts a good arm and defaults to none', () => {
    expect(parseStationDocument(doc([good])).ok).toBe(true);
    const none = parseStationDocument({ ...doc([]), arms: undefined });
    expect(none.ok && none.doc.arms).toEqual([]);
  });

  it.each([
    [{ ...good, baseNode: 'NOPE' }, 'arms[0].baseNode'],
    [{ ...good, minReachM: 17.6 }, 'arms[0].minReachM'],
    [{ ...good, minReachM: -1 }, 'arms[0].minReachM'],
    [{ ...good, tipSpeedMps: 0 }, 'arms[0].tipSpeedMps'],
    [{ ...good, reachM: -3 }, 'arms[0].reachM'],
    [{ ...good, settleSeconds: -1 }, 'arms[0].settleSeconds'],
    [{ ...good, key: 'BASE' }, 'arms[0].key'],
  ])('refuses %o at %s', (arm, path) => {
    const r = parseStationDocument(doc([arm]));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems.map((p) => p.path)).toContain(path);
  });

  it('refuses two arms with one key', () => {
    const r = parseStationDocument(doc([good, good]));
    expect(!r.ok && r.problems.map((p) => p.path)).toEqual(['arms[1].key']);
  });

  it('the schema alone checks minReachM < reachM', () => {
    expect(ArmSchema.safeParse({ ...good, minReachM: 1 }).success).toBe(true);
  });
});
