import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { placeSwapsGreedy } from '@shared/compute/tether';
import { minSwapsDp } from './routes-oracle';

describe('greedy tether swaps on a fixed walk', () => {
  it('swaps at the last attach point before the tether runs out', () => {
    // attach points at 0, 8, 14, 20; tether 15: from 0 the last one within 15 m is at 14
    const plan = placeSwapsGreedy([8, 6, 6, 6], [true, true, true, true, false], 15);
    expect(plan).toEqual({ feasible: true, swaps: [{ index: 2, atM: 14, paidOutM: 14 }], maxPaidOutM: 14 });
  });
  it('reports a stretch longer than the tether', () => {
    const plan = placeSwapsGreedy([5, 12, 3], [true, true, false, true], 10);
    expect(plan).toMatchObject({
      feasible: false,
      gapStartIndex: 1,
      gapStartM: 5,
      gapM: 15,
      requiredTetherM: 15,
    });
  });
  it('starts from the length already paid out, and may swap at the start when it is an attach point', () => {
    // 6 m out at the start, tether 10: the attach point at 3 m is where the first swap must be
    const behind = placeSwapsGreedy([3, 4, 4], [false, true, false, true], 10, { startPaidOutM: 6 });
    expect(behind).toEqual({
      feasible: true,
      swaps: [{ index: 1, atM: 3, paidOutM: 9 }],
      maxPaidOutM: 9,
    });
    // no attach point within the 4 m left: infeasible unless the start itself takes a swap
    const stuck = placeSwapsGreedy([5, 4], [true, true, false], 10, { startPaidOutM: 6 });
    expect(stuck).toMatchObject({ feasible: false, gapStartIndex: 0, gapM: 11, requiredTetherM: 11 });
    const atStart = placeSwapsGreedy([5, 4], [true, true, false], 10, { startPaidOutM: 6, startSwap: true });
    expect(atStart).toEqual({ feasible: true, swaps: [{ index: 0, atM: 0, paidOutM: 6 }], maxPaidOutM: 9 });
  });
  it('matches a dynamic programme over clip points on random walks, from any tether state', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.integer({ min: 0, max: 900 }).map((v) => v / 100),
          { minLength: 1, maxLength: 14 },
        ),
        fc.array(fc.boolean(), { minLength: 15, maxLength: 15 }),
        fc.integer({ min: 100, max: 1500 }).map((v) => v / 100),
        fc.oneof(
          fc.constant(0),
          fc.integer({ min: 0, max: 99 }).map((v) => v / 100),
        ),
        fc.boolean(),
        (legs, attach, tether, share, swapAtStart) => {
          const marks = attach.slice(0, legs.length + 1);
          const startPaidOutM = share * tether;
          const startSwap = swapAtStart && marks[0];
          const plan = placeSwapsGreedy(legs, marks, tether, { startPaidOutM, startSwap });
          const positions = legs.reduce((acc, l) => [...acc, acc[acc.length - 1] + l], [0]);
          const dp = minSwapsDp(positions, marks, tether, {
            paidOutM: startPaidOutM,
            swapAtStart: startSwap,
          });
          if (!plan.feasible) {
            expect(dp).toBe(-1);
            return;
          }
          expect(plan.swaps.length).toBe(dp);
          expect(plan.maxPaidOutM).toBeLessThanOrEqual(tether + 1e-9);
          plan.swaps.forEach((s, i) => {
            expect(marks[s.index]).toBe(true);
            if (s.index === 0) expect(startSwap).toBe(true);
            if (i > 0) expect(s.atM).toBeGreaterThan(plan.swaps[i - 1].atM);
            const clipM = i > 0 ? plan.swaps[i - 1].atM : -startPaidOutM;
            expect(s.paidOutM).toBeCloseTo(s.atM - clipM, 9);
          });
        },
      ),
      { numRuns: 500 },
    );
  });
});
