import type { Arm, Hazard } from '../schemas/station';
import type { ArmBlock } from './day/types';
import { dist, segmentIntersectsAabb, segmentIntersectsSphere, type ReadonlyVec3 } from './geometry';

/** Metres: a point this close to the shell's surface counts as inside it. */
const SHELL_EPS_M = 1e-9;

export interface ShellCheck {
  /** |p − base| */
  distanceM: number;
  within: boolean;
  /** metres outside the shell (beyond the reach, or inside the minimum reach); 0 within it */
  outsideByM: number;
  /** which side of the shell a point outside it is on */
  side?: 'beyond' | 'too-close';
}

/** Whether the arm's tip can be at `p`: within the shell minReachM ≤ |p − base| ≤ reachM. */
export function armShellCheck(
  arm: Pick<Arm, 'reachM' | 'minReachM'>,
  base: ReadonlyVec3,
  p: ReadonlyVec3,
): ShellCheck {
  const distanceM = dist(base, p);
  const min = arm.minReachM ?? 0;
  if (distanceM > arm.reachM + SHELL_EPS_M)
    return { distanceM, within: false, outsideByM: distanceM - arm.reachM, side: 'beyond' };
  if (distanceM < min - SHELL_EPS_M)
    return { distanceM, within: false, outsideByM: min - distanceM, side: 'too-close' };
  return { distanceM, within: true, outsideByM: 0 };
}

/**
 * Seconds for the tip to move from `a` to `b` in a straight line: distance / tip speed, then the
 * settle time. Staying put is no move and takes no time.
 */
export function armTipMoveSeconds(
  arm: Pick<Arm, 'tipSpeedMps' | 'settleSeconds'>,
  a: ReadonlyVec3,
  b: ReadonlyVec3,
): number {
  const d = dist(a, b);
  return d === 0 ? 0 : d / arm.tipSpeedMps + arm.settleSeconds;
}

/** The keep-out volumes the tip's straight path from `a` to `b` touches (surface included), by key. */
export function armPathKeepOuts(a: ReadonlyVec3, b: ReadonlyVec3, hazards: readonly Hazard[]): string[] {
  return hazards
    .filter(
      (h) =>
        h.kind === 'keep-out' &&
        (h.shape === 'sphere'
          ? segmentIntersectsSphere(a, b, h.center, h.radiusM)
          : segmentIntersectsAabb(a, b, h.min, h.max)),
    )
    .map((h) => h.key);
}

/** The tip's position at time `t` of a move from `a` (at `start`) to `b` (reached by `end − settle`). */
export function armTipAt(
  a: ReadonlyVec3,
  b: ReadonlyVec3,
  start: number,
  travelEnd: number,
  t: number,
): [number, number, number] {
  const f = travelEnd <= start ? 1 : Math.min(1, Math.max(0, (t - start) / (travelEnd - start)));
  return [a[0] + (b[0] - a[0]) * f, a[1] + (b[1] - a[1]) * f, a[2] + (b[2] - a[2]) * f];
}

/**
 * Where an arm's tip is at time `t` of the day, from its moves (in time order): at the start point
 * before the first, along a move while it travels, at the move's end from then until the next.
 * Null for an arm the day never moves or boards.
 */
export function armTipAtTime(
  lane: {
    startPoint: ReadonlyVec3 | null;
    blocks: readonly Pick<ArmBlock, 'start' | 'travelEnd' | 'fromPoint' | 'toPoint'>[];
  },
  t: number,
): [number, number, number] | null {
  let lo = 0;
  let hi = lane.blocks.length;
  // the first move that starts after t
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (lane.blocks[mid].start <= t) lo = mid + 1;
    else hi = mid;
  }
  if (lo === 0) return lane.startPoint ? [...lane.startPoint] : null;
  const b = lane.blocks[lo - 1];
  return armTipAt(b.fromPoint, b.toPoint, b.start, b.travelEnd, t);
}
