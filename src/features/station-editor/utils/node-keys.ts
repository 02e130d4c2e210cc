import type { NodeKind, StationEdge, Vec3 } from '@shared/schemas/station';

/** The letter a node's key carries for its kind, as in `PB3-A07` (anchor 7 on port bay 3). */
export const KIND_KEY_LETTERS: Record<NodeKind, string> = {
  airlock: 'AL',
  junction: 'J',
  anchor: 'A',
  socket: 'S',
  worksite: 'W',
};

const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/**
 * The next free key for a node of `kind` on `prefix` (a segment key such as `PB3`): one past the
 * highest number already used with that prefix and letter, two digits at least.
 */
export function suggestNodeKey(existing: Iterable<string>, prefix: string, kind: NodeKind): string {
  const letter = KIND_KEY_LETTERS[kind];
  const pattern = new RegExp(`^${escape(prefix)}-${letter}(\\d+)$`);
  const taken = new Set<string>();
  let highest = 0;
  for (const key of existing) {
    taken.add(key);
    const match = pattern.exec(key);
    if (match) highest = Math.max(highest, Number(match[1]));
  }
  for (let n = highest + 1; ; n++) {
    const key = `${prefix}-${letter}${String(n).padStart(2, '0')}`;
    if (!taken.has(key)) return key;
  }
}

/** The segment part of a key (`PB3` of `PB3-A07`), or undefined when the key has no such part. */
export function keyPrefix(key: string): string | undefined {
  const dash = key.lastIndexOf('-');
  return dash > 0 ? key.slice(0, dash) : undefined;
}

export function normalise(v: Vec3): Vec3 | null {
  const len = Math.hypot(v[0], v[1], v[2]);
  if (!Number.isFinite(len) || len < 1e-9) return null;
  return [v[0] / len, v[1] / len, v[2] / len];
}

/** The edges that go with a node when it is deleted. */
export function edgesOfNode<E extends Pick<StationEdge, 'from' | 'to'>>(
  edges: readonly E[],
  key: string,
): E[] {
  return edges.filter((e) => e.from === key || e.to === key);
}

export function describeEdge(e: Pick<StationEdge, 'from' | 'to' | 'kind'>): string {
  return `${e.from} – ${e.to} (${e.kind})`;
}
