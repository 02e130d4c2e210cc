import type { Segment, StationNode, Vec3 } from '../schemas/station';

/** The face a normal points out of, in the station frame (+x starboard, +y fore, +z zenith). */
export function faceOf(normal: Vec3): string {
  const axis = [0, 1, 2].reduce((best, i) => (Math.abs(normal[i]) > Math.abs(normal[best]) ? i : best), 0);
  const names = [
    ['starboard', 'port'],
    ['fore', 'aft'],
    ['zenith', 'nadir'],
  ];
  return names[axis][normal[axis] >= 0 ? 0 : 1];
}

/** How far a point is from a segment's box (0 inside it); a rotated segment is taken as unrotated. */
function distanceToBox(p: Vec3, s: Pick<Segment, 'center' | 'size'>): number {
  const d = [0, 1, 2].map((i) => Math.max(0, Math.abs(p[i] - s.center[i]) - s.size[i] / 2));
  return Math.hypot(d[0], d[1], d[2]);
}

/** The segment (bay) a point is on or nearest to, or null when the station has none. */
export function bayOf<S extends Pick<Segment, 'center' | 'size'>>(p: Vec3, segments: readonly S[]): S | null {
  let best: S | null = null;
  let bestD = Infinity;
  for (const s of segments) {
    const d = distanceToBox(p, s);
    if (d < bestD) [best, bestD] = [s, d];
  }
  return best;
}

/**
 * Keys and labels for new sockets named like the rest of the model: `<bay>-S<nn>`, the next number
 * that bay does not use yet (PB3-S05 after PB3-S04), and "<bay label> <face> foot restraint socket".
 * Without segments: `SKT-<nnn>`. `taken` holds every key in use and gets the new ones.
 */
export function socketNameFor(
  socket: { position: Vec3; normal: Vec3 },
  segments: readonly Pick<Segment, 'key' | 'label' | 'center' | 'size'>[],
  taken: Set<string>,
): Pick<StationNode, 'key' | 'label'> {
  const near = bayOf(socket.position, segments);
  // a key is at most 64 characters: a bay key too long for a suffix falls back to SKT-
  const bay = near && near.key.length <= 56 ? near : null;
  const prefix = bay ? `${bay.key}-S` : 'SKT-';
  const digits = bay ? 2 : 3;
  let key = '';
  for (let i = 1; ; i++) {
    key = `${prefix}${String(i).padStart(digits, '0')}`;
    if (!taken.has(key)) break;
  }
  taken.add(key);
  const face = faceOf(socket.normal);
  const label = bay
    ? `${bay.label ?? bay.key} ${face} foot restraint socket (planned)`
    : `Planned ${face} foot restraint socket`;
  return { key, label: label.slice(0, 200) };
}
