import type { Segment, Vec3 } from '../schemas/station';

/**
 * The outward faces of the station's segment boxes, for placing candidate sockets on a grid and
 * for snapping a clicked point to the truss surface.
 *
 * A segment is a box with `center`, full `size` and optional `rotationDeg`: Euler angles in degrees
 * applied as the 3D scene applies them (three.js order 'XYZ'), i.e. the rotation matrix is
 * Rx·Ry·Rz and a local vector v maps to world `center + Rx·Ry·Rz·v`.
 */

/** Points on or inside another segment by less than this are treated as inside it. */
const INSIDE_TOLERANCE_M = 1e-6;
/** A segment overlapping more hash cells than this is checked against every point instead. */
const MAX_CELLS_PER_SEGMENT = 512;

type Mat3 = [number, number, number, number, number, number, number, number, number];

export interface TrussFace {
  segment: string;
  segmentIndex: number;
  /** the local axis (0 x, 1 y, 2 z) the face is normal to, and which end of it */
  axis: 0 | 1 | 2;
  sign: 1 | -1;
  center: Vec3;
  /** outward unit normal; u × v = normal */
  normal: Vec3;
  u: Vec3;
  v: Vec3;
  /** half the face's extent along u and along v, metres */
  halfU: number;
  halfV: number;
}

export interface FaceCandidate {
  position: Vec3;
  normal: Vec3;
  segment: string;
}

export interface FacePoint {
  point: Vec3;
  normal: Vec3;
  segment: string;
  segmentIndex: number;
  /** from the query point to `point`, metres */
  distanceM: number;
}

export interface GridOptions {
  /** only faces that come within `withinM` of one of these points are gridded */
  near?: readonly Vec3[];
  withinM?: number;
  /** refuse (GridTooLargeError) before making more than this many grid points */
  maxPoints?: number;
}

/** The grid would have more points than allowed; `points` counts them before any are made. */
export class GridTooLargeError extends RangeError {
  constructor(
    readonly points: number,
    readonly maxPoints: number,
  ) {
    super(`a grid of ${points} points is more than the ${maxPoints} allowed`);
    this.name = 'GridTooLargeError';
  }
}

function rotationMatrix(deg: Vec3 | undefined): Mat3 {
  if (!deg) return [1, 0, 0, 0, 1, 0, 0, 0, 1];
  const [a, b, c] = deg.map((d) => (d * Math.PI) / 180);
  const cx = Math.cos(a),
    sx = Math.sin(a),
    cy = Math.cos(b),
    sy = Math.sin(b),
    cz = Math.cos(c),
    sz = Math.sin(c);
  return [
    cy * cz,
    -cy * sz,
    sy,
    cx * sz + sx * sy * cz,
    cx * cz - sx * sy * sz,
    -sx * cy,
    sx * sz - cx * sy * cz,
    sx * cz + cx * sy * sz,
    cx * cy,
  ];
}

const rotate = (m: Mat3, v: Vec3): Vec3 => [
  m[0] * v[0] + m[1] * v[1] + m[2] * v[2],
  m[3] * v[0] + m[4] * v[1] + m[5] * v[2],
  m[6] * v[0] + m[7] * v[1] + m[8] * v[2],
];

const unrotate = (m: Mat3, v: Vec3): Vec3 => [
  m[0] * v[0] + m[3] * v[1] + m[6] * v[2],
  m[1] * v[0] + m[4] * v[1] + m[7] * v[2],
  m[2] * v[0] + m[5] * v[1] + m[8] * v[2],
];

const axisVector = (axis: number, sign: number): Vec3 => {
  const v: Vec3 = [0, 0, 0];
  v[axis] = sign;
  return v;
};

/** The six outward faces of one segment box. */
export function segmentFaces(segment: Segment, segmentIndex = 0): TrussFace[] {
  const m = rotationMatrix(segment.rotationDeg);
  const faces: TrussFace[] = [];
  for (const axis of [0, 1, 2] as const) {
    for (const sign of [1, -1] as const) {
      const j = (axis + 1) % 3;
      const k = (axis + 2) % 3;
      const [uAxis, vAxis] = sign === 1 ? [j, k] : [k, j];
      const half = segment.size[axis] / 2;
      const offset = rotate(m, axisVector(axis, sign * half));
      faces.push({
        segment: segment.key,
        segmentIndex,
        axis,
        sign,
        center: [segment.center[0] + offset[0], segment.center[1] + offset[1], segment.center[2] + offset[2]],
        normal: rotate(m, axisVector(axis, sign)),
        u: rotate(m, axisVector(uAxis, 1)),
        v: rotate(m, axisVector(vAxis, 1)),
        halfU: segment.size[uAxis] / 2,
        halfV: segment.size[vAxis] / 2,
      });
    }
  }
  return faces;
}

export function trussFaces(segments: readonly Segment[]): TrussFace[] {
  return segments.flatMap((s, i) => segmentFaces(s, i));
}

/** Distance from `q` to the face rectangle. */
export function faceDistance(face: TrussFace, q: Vec3): number {
  const d: Vec3 = [q[0] - face.center[0], q[1] - face.center[1], q[2] - face.center[2]];
  const a = d[0] * face.u[0] + d[1] * face.u[1] + d[2] * face.u[2];
  const b = d[0] * face.v[0] + d[1] * face.v[1] + d[2] * face.v[2];
  const h = d[0] * face.normal[0] + d[1] * face.normal[1] + d[2] * face.normal[2];
  const da = Math.max(0, Math.abs(a) - face.halfU);
  const db = Math.max(0, Math.abs(b) - face.halfV);
  return Math.hypot(da, db, h);
}

const offsetCount = (half: number, spacing: number) => Math.max(1, Math.floor((2 * half) / spacing + 1e-9));

/** Grid offsets along an extent: `spacing` apart, centred, at least spacing/2 in from each edge. */
function gridOffsets(half: number, spacing: number): number[] {
  const count = offsetCount(half, spacing);
  return Array.from({ length: count }, (_, i) => (i - (count - 1) / 2) * spacing);
}

interface PlacedBox {
  m: Mat3;
  center: Vec3;
  half: Vec3;
}

/** A uniform hash over the segments' bounding boxes, for "is this point inside another segment". */
class SegmentHash {
  private readonly boxes: PlacedBox[];
  private readonly cells = new Map<string, number[]>();
  private readonly large: number[] = [];
  private readonly cellM: number;

  constructor(segments: readonly Segment[]) {
    this.boxes = segments.map((s) => ({
      m: rotationMatrix(s.rotationDeg),
      center: s.center,
      half: [s.size[0] / 2, s.size[1] / 2, s.size[2] / 2],
    }));
    const extents = this.boxes.map((b) => this.aabbHalf(b));
    const sizes = extents.map((e) => 2 * Math.max(e[0], e[1], e[2])).sort((x, y) => x - y);
    this.cellM = Math.max(sizes[Math.floor(sizes.length / 2)] ?? 1, 1e-3);
    this.boxes.forEach((b, i) => {
      const e = extents[i];
      const lo = b.center.map((c, a) => Math.floor((c - e[a] - INSIDE_TOLERANCE_M) / this.cellM));
      const hi = b.center.map((c, a) => Math.floor((c + e[a] + INSIDE_TOLERANCE_M) / this.cellM));
      if ((hi[0] - lo[0] + 1) * (hi[1] - lo[1] + 1) * (hi[2] - lo[2] + 1) > MAX_CELLS_PER_SEGMENT) {
        this.large.push(i);
        return;
      }
      for (let x = lo[0]; x <= hi[0]; x++)
        for (let y = lo[1]; y <= hi[1]; y++)
          for (let z = lo[2]; z <= hi[2]; z++) {
            const key = `${x},${y},${z}`;
            const list = this.cells.get(key);
            if (list) list.push(i);
            else this.cells.set(key, [i]);
          }
    });
  }

  private aabbHalf(b: PlacedBox): Vec3 {
    const { m, half } = b;
    return [0, 1, 2].map(
      (r) =>
        Math.abs(m[3 * r]) * half[0] + Math.abs(m[3 * r + 1]) * half[1] + Math.abs(m[3 * r + 2]) * half[2],
    ) as Vec3;
  }

  /** Is `p` inside or on the surface of any segment other than `except`? */
  insideOther(p: Vec3, except: number): boolean {
    const key = p.map((c) => Math.floor(c / this.cellM)).join(',');
    const near = this.cells.get(key) ?? [];
    for (const list of [near, this.large]) {
      for (const i of list) {
        if (i === except) continue;
        const b = this.boxes[i];
        const q = unrotate(b.m, [p[0] - b.center[0], p[1] - b.center[1], p[2] - b.center[2]]);
        if (q.every((c, a) => Math.abs(c) <= b.half[a] + INSIDE_TOLERANCE_M)) return true;
      }
    }
    return false;
  }
}

/**
 * Candidate socket positions on a grid over every segment face, each with the face's outward unit
 * normal. Points are `spacingM` apart, centred on the face and at least spacingM/2 in from its edges
 * (a face narrower than the spacing gets one row through its middle). Points that lie inside or on
 * the surface of another segment are skipped, so the faces two bays share and faces buried in a
 * neighbour yield nothing; a face only partly covered keeps its exposed points.
 */
export function gridCandidates(
  segments: readonly Segment[],
  spacingM: number,
  options: GridOptions = {},
): FaceCandidate[] {
  if (!(spacingM > 0) || !Number.isFinite(spacingM))
    throw new RangeError('grid spacing must be a positive number');
  const { near, withinM = Infinity, maxPoints = Infinity } = options;
  const faces = trussFaces(segments).filter(
    (face) => !near || near.some((q) => faceDistance(face, q) <= withinM),
  );
  // counted from the faces' extents first, so a fine grid over a huge face is refused, not built
  let points = 0;
  for (const face of faces) points += offsetCount(face.halfU, spacingM) * offsetCount(face.halfV, spacingM);
  if (points > maxPoints) throw new GridTooLargeError(points, maxPoints);
  const hash = new SegmentHash(segments);
  const out: FaceCandidate[] = [];
  for (const face of faces) {
    const us = gridOffsets(face.halfU, spacingM);
    const vs = gridOffsets(face.halfV, spacingM);
    for (const a of us) {
      for (const b of vs) {
        const position: Vec3 = [
          face.center[0] + a * face.u[0] + b * face.v[0],
          face.center[1] + a * face.u[1] + b * face.v[1],
          face.center[2] + a * face.u[2] + b * face.v[2],
        ];
        if (hash.insideOther(position, face.segmentIndex)) continue;
        out.push({ position, normal: face.normal, segment: face.segment });
      }
    }
  }
  return out;
}

/**
 * The closest point on any segment's surface to `point`, with that face's outward normal; null when
 * there are no segments. From inside a box the nearest face of that box wins; faces shared with a
 * neighbouring box are not excluded (a click lands on a visible face, which is nearer anyway).
 */
export function nearestFacePoint(segments: readonly Segment[], point: Vec3): FacePoint | null {
  let best: FacePoint | null = null;
  for (let segmentIndex = 0; segmentIndex < segments.length; segmentIndex++) {
    const s = segments[segmentIndex];
    const m = rotationMatrix(s.rotationDeg);
    const half = [s.size[0] / 2, s.size[1] / 2, s.size[2] / 2];
    const q = unrotate(m, [point[0] - s.center[0], point[1] - s.center[1], point[2] - s.center[2]]);
    const excess = q.map((c, a) => Math.abs(c) - half[a]);
    const local: Vec3 = [q[0], q[1], q[2]];
    let axis = 0;
    for (let a = 1; a < 3; a++) if (excess[a] > excess[axis]) axis = a;
    const sign = q[axis] < 0 ? -1 : 1;
    if (excess[axis] > 0) {
      for (let a = 0; a < 3; a++) local[a] = Math.max(-half[a], Math.min(half[a], q[a]));
    }
    local[axis] = sign * half[axis];
    const world = rotate(m, local);
    const p: Vec3 = [s.center[0] + world[0], s.center[1] + world[1], s.center[2] + world[2]];
    const distanceM = Math.hypot(p[0] - point[0], p[1] - point[1], p[2] - point[2]);
    if (!best || distanceM < best.distanceM) {
      best = { point: p, normal: rotate(m, axisVector(axis, sign)), segment: s.key, segmentIndex, distanceM };
    }
  }
  return best;
}
