import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { boomElbow, boomRestTip } from '@/components/scene/boom-pose';

const dist = (a: readonly number[], b: readonly number[]) =>
  Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

describe('the boom drawn from base to tip: two links of half the reach', () => {
  it('worked by hand: reach 10, tip 6 m along x, the elbow rises 4 m (3-4-5) towards up', () => {
    const e = boomElbow([0, 0, 0], [6, 0, 0], 10);
    [3, 0, 4].forEach((v, k) => expect(e[k]).toBeCloseTo(v, 12));
  });

  it('worked by hand: tip straight up 8 m, reach 10, the elbow goes out along x by 3 m', () => {
    const e = boomElbow([1, 1, 1], [1, 1, 9], 10);
    [4, 1, 5].forEach((v, k) => expect(e[k]).toBeCloseTo(v, 12));
  });

  it('out of reach the boom is straight towards the tip', () => {
    const e = boomElbow([0, 0, 0], [0, 30, 0], 10);
    [0, 5, 0].forEach((v, k) => expect(e[k]).toBeCloseTo(v, 12));
  });

  it('the rest pose is inside the reach', () => {
    expect(dist([2, 3, 4], boomRestTip([2, 3, 4], 17.6))).toBeCloseTo(0.4 * 17.6, 12);
  });

  it('within reach both links are half the reach long, wherever the tip is (fast-check)', () => {
    const coord = fc.double({ min: -50, max: 50, noNaN: true });
    const point = fc.tuple(coord, coord, coord);
    fc.assert(
      fc.property(point, point, fc.double({ min: 0.5, max: 40, noNaN: true }), (base, tip, reach) => {
        fc.pre(dist(base, tip) < reach * 0.999 && dist(base, tip) > 1e-3);
        const e = boomElbow(base, tip, reach);
        expect(dist(base, e)).toBeCloseTo(reach / 2, 6);
        expect(dist(e, tip)).toBeCloseTo(reach / 2, 6);
      }),
    );
  });
});
