/** A label's box on screen, in CSS pixels from the canvas's top left. */
export interface ScreenRect {
  left: number;
  top: number;
  width: number;
  height: number;
}

export interface LabelCandidate {
  rect: ScreenRect;
  /** lower first: the selection before the hovered node before crew tags before node names */
  priority: number;
  /** distance from the camera: among equals, the nearest is placed first */
  depth: number;
  /** a marker's own shape: always drawn, and no less important label may cover it */
  obstacle?: boolean;
  /** a marker and its own tag share a group: the tag may sit against its own marker */
  group?: unknown;
}

/** Labels the scene draws, most important first (a lower number wins a place on screen). */
export const LABEL_PRIORITY = {
  selected: 0,
  hovered: 1,
  crew: 2,
  marker: 3,
  item: 4,
  node: 5,
} as const;

/** Room kept between two labels, so they read as two. */
const GAP_PX = 2;

const overlaps = (a: ScreenRect, b: ScreenRect) =>
  a.left < b.left + b.width + GAP_PX &&
  b.left < a.left + a.width + GAP_PX &&
  a.top < b.top + b.height + GAP_PX &&
  b.top < a.top + a.height + GAP_PX;

/**
 * Which labels to draw so that no two cover each other: obstacles first, then by priority and,
 * among equals, nearest first; a label that would touch one already placed (or a marker at least
 * as important as it) is left out.
 * Returns one flag per candidate, in their order.
 */
export function declutter(candidates: readonly LabelCandidate[]): boolean[] {
  const order = candidates
    .map((c, i) => i)
    .sort((a, b) => {
      const ca = candidates[a];
      const cb = candidates[b];
      return (
        Number(!!cb.obstacle) - Number(!!ca.obstacle) || ca.priority - cb.priority || ca.depth - cb.depth
      );
    });
  const placed: LabelCandidate[] = [];
  const shown = candidates.map(() => false);
  for (const i of order) {
    const c = candidates[i];
    // a marker's shape keeps off only the tags less important than it, and never its own tag
    const blocked = (p: LabelCandidate) =>
      !(p.obstacle && (p.priority >= c.priority || (c.group !== undefined && p.group === c.group))) &&
      overlaps(p.rect, c.rect);
    if (!c.obstacle && placed.some(blocked)) continue;
    placed.push(c);
    shown[i] = true;
  }
  return shown;
}
