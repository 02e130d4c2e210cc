/**
 * Tether swaps along a fixed walk (DESIGN §3). The crew member is clipped where the walk starts.
 * When the start is not an attach point we cannot know which earlier anchor they are on, so the
 * start itself counts as the first clip point; callers say so in the route's warnings.
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

/** Longest stretch between consecutive attach points (start and end count as ends of stretches). */
export function longestAttachGap(
  legs: readonly number[],
  isAttach: readonly boolean[],
): { startIndex: number; startM: number; gapM: number } {
  let best = { startIndex: 0, startM: 0, gapM: 0 };
  let startIndex = 0;
  let startM = 0;
  let pos = 0;
  for (let i = 0; i < legs.length; i++) {
    pos += legs[i];
    if (isAttach[i + 1] || i === legs.length - 1) {
      if (pos - startM > best.gapM) best = { startIndex, startM, gapM: pos - startM };
      startIndex = i + 1;
      startM = pos;
    }
  }
  return best;
}

/**
 * Fewest swaps for a fixed walk: swap at the last attach point before the paid-out length would
 * pass the tether length (the classic refuelling argument makes this optimal).
 * `legs[i]` is the length from walk node i to i + 1; `isAttach` has one entry per walk node.
 */
export function placeSwapsGreedy(
  legs: readonly number[],
  isAttach: readonly boolean[],
  tetherLengthM: number,
): SwapPlan {
  const swaps: PlannedSwap[] = [];
  let clipM = 0;
  let lastAttach = -1;
  let lastAttachM = 0;
  let stretchStart = 0;
  let stretchStartM = 0;
  let pos = 0;
  let maxPaidOutM = 0;
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
        return {
          feasible: false,
          gapStartIndex: stretchStart,
          gapStartM: stretchStartM,
          gapM: end - stretchStartM,
          requiredTetherM: longestAttachGap(legs, isAttach).gapM,
        };
      }
    }
    pos += len;
  }
  // swaps are placed looking back, so paid-out is measured once they are all known
  let next = 0;
  clipM = 0;
  pos = 0;
  for (let i = 0; i < legs.length; i++) {
    if (next < swaps.length && swaps[next].index === i) clipM = swaps[next++].atM;
    pos += legs[i];
    if (pos - clipM > maxPaidOutM) maxPaidOutM = pos - clipM;
  }
  return { feasible: true, swaps, maxPaidOutM };
}
