import { describe, expect, it } from 'vitest';
import {
  distancePointToSegment,
  segmentIntersectsAabb,
  segmentIntersectsSphere,
} from '@shared/compute/geometry';

// Hand-worked: the segment (0,0,0)→(10,0,0) passes 3 m from (5,3,0) at its midpoint.
describe('hazard intersection geometry', () => {
  it('segment against sphere', () => {
    expect(distancePointToSegment([5, 3, 0], [0, 0, 0], [10, 0, 0])).toBeCloseTo(3, 12);
    expect(segmentIntersectsSphere([0, 0, 0], [10, 0, 0], [5, 3, 0], 2.9)).toBe(false);
    expect(segmentIntersectsSphere([0, 0, 0], [10, 0, 0], [5, 3, 0], 3.1)).toBe(true);
    // beyond the end the closest point is the end itself: |(13,4,0) − (10,0,0)| = 5
    expect(segmentIntersectsSphere([0, 0, 0], [10, 0, 0], [13, 4, 0], 4.9)).toBe(false);
    expect(segmentIntersectsSphere([0, 0, 0], [10, 0, 0], [13, 4, 0], 5.1)).toBe(true);
  });
  it('segment against box', () => {
    const min = [4, -1, -1] as const;
    const max = [6, 1, 1] as const;
    expect(segmentIntersectsAabb([0, 0, 0], [10, 0, 0], min, max)).toBe(true);
    expect(segmentIntersectsAabb([0, 0, 0], [3.9, 0, 0], min, max)).toBe(false);
    // diagonal in the xy plane: y = x − 4.5 is inside |y| ≤ 1 for x in [4, 5.5]
    expect(segmentIntersectsAabb([0, -4.5, 0], [10, 5.5, 0], min, max)).toBe(true);
    // y = x − 8 would need x ≥ 7 to reach y ≥ −1, past the box's x ≤ 6
    expect(segmentIntersectsAabb([0, -8, 0], [10, 2, 0], min, max)).toBe(false);
    expect(segmentIntersectsAabb([5, 0, 0], [5, 0, 0], min, max)).toBe(true);
    expect(segmentIntersectsAabb([5, 2, 0], [5, 3, 0], min, max)).toBe(false);
  });
});
