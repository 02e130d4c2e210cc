/**
 * Tether swaps along a fixed walk. The paid-out length is the distance along the walk since the
 * current clip (retracing a stretch does not reel the tether back in). The walk starts from a
 * tether state: `startPaidOutM` already out from an anchor behind, 0 when freshly clipped at the
 * start. A start that is not an attach point and has no state of its own counts as the first clip
 * point; callers say so in the route's warnings.
 */

/** Lengths within this of the tether still fit: float sums of leg lengths must not flip feasibility. */
export const TETHER_EPS_M = 1e-9;

export interface PlannedSwap {
  /** index into the walk's nodes */
  index: number;
  atM: number;
  paidOutM: number;
}

export type SwapPlan =
  | { feasible: true; swaps: PlannedSwap[]; maxPaidOutM: number }
  | {
      feasible: false;
      /** walk index of the attach point (or start) where the stretch that is too long begins */
      gapStartIndex: number;
      gapStartM: number;
      /** length of that stretch up to the next attach point or the walk's end */
      gapM: number;
      /** the shortest tether that would make this walk feasible: its longest attach-to-attach stretch */
      requiredTetherM: number;
    };

/** Where the walk starts, tether-wise. */
export interface WalkStart {
  /** metres already paid out from the anchor the crew member is clipped to (default 0) */
  startPaidOutM?: number;
  /** whether the start may take a swap (it is an attach point): a swap there brings the paid-out length back to 0 */
  startSwap?: boolean;
}

/**
 * Longest stretch between consecutive attach points (start and end count as ends of stretches);
 * the first stretch counts the length already paid out unless the start may take a swap.
 */
export function longestAttachGap(
  legs: readonly number[],
  isAttach: readonly boolean[],
  start: WalkStart = {},
): { startIndex: number; startM: number; gapM: number } {
  const carried = start.startSwap ? 0 : (start.startPaidOutM ?? 0);
  let best = { startIndex: 0, startM: 0, gapM: legs.length ? 0 : carried };
  let startIndex = 0;
  let startM = -carried;
  let pos = 0;
  for (let i = 0; i < legs.length; i++) {
    pos += legs[i];
    if (isAttach[i + 1] || i === legs.length - 1) {
      if (pos - startM > best.gapM) best = { startIndex, startM: Math.max(0, startM), gapM: pos - startM };
      startIndex = i + 1;
      startM = pos;
    }
  }
  return best;
}

/**
 * Fewest swaps for a fixed walk: swap at the last attach point before the paid-out length would
 * pass the tether length (the classic refuelling argument makes this optimal, the start state
 * being the fuel in the tank at the start). `legs[i]` is the length from walk node i to i + 1;
 * `isAttach` has one entry per walk node; the start takes a swap only when `start.startSwap`.
 * Swaps' `paidOutM` and `maxPaidOutM` count the length already out at the start.
 */
export function placeSwapsGreedy(
  legs: readonly number[],
  isAttach: readonly boolean[],
  tetherLengthM: number,
  start: WalkStart = {},
): SwapPlan {
  const startPaid = start.startPaidOutM ?? 0;
  const swaps: PlannedSwap[] = [];
  // the clip's position along the walk: behind the start by what is already paid out
  let clipM = -startPaid;
  let lastAttach = start.startSwap && startPaid > 0 ? 0 : -1;
  let lastAttachM = 0;
  let stretchStart = 0;
  let stretchStartM = 0;
  let pos = 0;
  let maxPaidOutM = startPaid;
  for (let i = 0; i < legs.length; i++) {
    if (i > 0 && isAttach[i]) {
      lastAttach = stretchStart = i;
      lastAttachM = stretchStartM = pos;
    }
    const len = legs[i];
    if (pos + len - clipM > tetherLengthM + TETHER_EPS_M) {
      if (lastAttach >= 0) {
        swaps.push({ index: lastAttach, atM: lastAttachM, paidOutM: lastAttachM - clipM });
        clipM = lastAttachM;
        lastAttach = -1;
      }
      if (pos + len - clipM > tetherLengthM + TETHER_EPS_M) {
        let end = pos + len;
        for (let j = i + 1; j < legs.length && !isAttach[j]; j++) end += legs[j];
        const carried = stretchStart === 0 && !start.startSwap ? startPaid : 0;
        return {
          feasible: false,
          gapStartIndex: stretchStart,
          gapStartM: stretchStartM,
          gapM: end - stretchStartM + carried,
          requiredTetherM: longestAttachGap(legs, isAttach, start).gapM,
        };
      }
    }
    pos += len;
  }
  // swaps are placed looking back, so paid-out is measured once they are all known
  let next = 0;
  clipM = -startPaid;
  pos = 0;
  for (let i = 0; i < legs.length; i++) {
    if (next < swaps.length && swaps[next].index === i) clipM = swaps[next++].atM;
    pos += legs[i];
    if (pos - clipM > maxPaidOutM) maxPaidOutM = pos - clipM;
  }
  return { feasible: true, swaps, maxPaidOutM };
}
