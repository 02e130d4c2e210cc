import type { Vec3 } from '../schemas/station';

/**
 * Foot-restraint reach. A crew member in a restraint on a socket at `p` with outward
 * normal `n` works around the point `c = p + n·h`; a target `t` is within reach when `|t − c| ≤ R`.
 * The default `h` and `R` (DEFAULT_SETTINGS.reach) are planning defaults from memory: the suited
 * work envelope's dimensions are not verified (the concept is NASA-STD-3000 Vol. I §14.3–14.5).
 *
 * Angle conventions (the UI draws with `restraintFrame`, so they must agree):
 * - The restraint frame has `up` = n (unit), `ref` = the projection of the station +x axis onto the
 *   socket plane (or of +y when n is within 1e-6 of ±x), `side` = n × ref, so (ref, side, up) is
 *   right-handed.
 * - Yaw is the rotation about n from `ref` to the target's direction in the socket plane, positive
 *   by the right-hand rule about n (counter-clockwise seen from outside the structure looking back
 *   along −n), in (−180°, 180°]. Yaw is the same seen from the socket or the work point, since the
 *   two differ only along n. A target straight above or below c has yaw 0.
 * - Pitch is the elevation of the direction from the work point c to the target above the socket
 *   plane, positive away from the structure, in [−90°, 90°]. A target at c has pitch 0.
 * - The set angles are the raw angles rounded to the restraint's setting steps, half away from
 *   zero; yaw is then normalised to (−180°, 180°] and pitch kept to the largest multiple of its
 *   step within ±90°.
 */

/** Slack on `|t − c| ≤ R` so a target placed exactly on the envelope is not lost to rounding. */
export const REACH_TOLERANCE_M = 1e-9;
const PARALLEL_TOLERANCE = 1e-6;
/** Rounds half away from zero even when the raw angle lands a hair under the half step. */
const STEP_TOLERANCE = 1e-9;

export interface ReachInput {
  socketPosition: Vec3;
  socketNormal: Vec3;
  target: Vec3;
  standOffM: number;
  radiusM: number;
  yawStepDeg: number;
  pitchStepDeg: number;
}

export interface ReachCheck {
  reachable: boolean;
  /** |t − c|, metres */
  distanceM: number;
  yawDeg: number;
  pitchDeg: number;
  yawSetDeg: number;
  pitchSetDeg: number;
}

export interface RestraintFrame {
  up: Vec3;
  ref: Vec3;
  side: Vec3;
}

const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const toDeg = (rad: number) => (rad * 180) / Math.PI;

function unit(v: Vec3): Vec3 {
  const len = Math.hypot(v[0], v[1], v[2]);
  if (!(len > 0) || !Number.isFinite(len))
    throw new RangeError('a socket normal must be a non-zero finite vector');
  return [v[0] / len, v[1] / len, v[2] / len];
}

function planeProjection(axis: Vec3, up: Vec3): Vec3 {
  const k = dot(axis, up);
  return [axis[0] - k * up[0], axis[1] - k * up[1], axis[2] - k * up[2]];
}

export function restraintFrame(normal: Vec3): RestraintFrame {
  const up = unit(normal);
  let ref = planeProjection([1, 0, 0], up);
  if (Math.hypot(ref[0], ref[1], ref[2]) < PARALLEL_TOLERANCE) ref = planeProjection([0, 1, 0], up);
  ref = unit(ref);
  const side: Vec3 = [
    up[1] * ref[2] - up[2] * ref[1],
    up[2] * ref[0] - up[0] * ref[2],
    up[0] * ref[1] - up[1] * ref[0],
  ];
  return { up, ref, side };
}

/** c = p + n̂·h (the normal is normalised, so h is the true stand-off). */
export function workPoint(p: Vec3, n: Vec3, standOffM: number): Vec3 {
  const u = unit(n);
  return [p[0] + u[0] * standOffM, p[1] + u[1] * standOffM, p[2] + u[2] * standOffM];
}

/** Rounds to a multiple of `step`, half away from zero. */
export function roundToStep(value: number, step: number): number {
  if (!(step > 0)) throw new RangeError('a setting step must be greater than 0');
  const q = Math.abs(value) / step;
  const r = Math.floor(q + 0.5 + STEP_TOLERANCE) * step;
  return value < 0 && r !== 0 ? -r : r;
}

/** Maps an angle in degrees to (−180, 180]. */
export function normalizeYawDeg(deg: number): number {
  let a = deg % 360;
  if (a <= -180) a += 360;
  else if (a > 180) a -= 360;
  return a === 0 ? 0 : a;
}

/** Raw yaw and pitch (degrees) facing `target` from a restraint at work point `c` with frame `f`. */
export function restraintAngles(
  f: RestraintFrame,
  c: Vec3,
  target: Vec3,
): { yawDeg: number; pitchDeg: number } {
  const d: Vec3 = [target[0] - c[0], target[1] - c[1], target[2] - c[2]];
  const x = dot(d, f.ref);
  const y = dot(d, f.side);
  const z = dot(d, f.up);
  const horizontal = Math.hypot(x, y);
  const yawDeg = horizontal === 0 ? 0 : normalizeYawDeg(toDeg(Math.atan2(y, x)));
  const pitchDeg = horizontal === 0 && z === 0 ? 0 : toDeg(Math.atan2(z, horizontal));
  return { yawDeg, pitchDeg };
}

export function reachCheck(input: ReachInput): ReachCheck {
  const frame = restraintFrame(input.socketNormal);
  const c = workPoint(input.socketPosition, frame.up, input.standOffM);
  const t = input.target;
  const distanceM = Math.hypot(t[0] - c[0], t[1] - c[1], t[2] - c[2]);
  const { yawDeg, pitchDeg } = restraintAngles(frame, c, t);
  const pitchLimit = Math.floor(90 / input.pitchStepDeg + STEP_TOLERANCE) * input.pitchStepDeg;
  const pitchSet = roundToStep(pitchDeg, input.pitchStepDeg);
  return {
    reachable: distanceM <= input.radiusM + REACH_TOLERANCE_M,
    distanceM,
    yawDeg,
    pitchDeg,
    yawSetDeg: normalizeYawDeg(roundToStep(yawDeg, input.yawStepDeg)),
    pitchSetDeg: Math.max(-pitchLimit, Math.min(pitchLimit, pitchSet)),
  };
}
