import type { Vec3 } from '@shared/schemas/station';

type V = readonly [number, number, number] | readonly number[];

const sub = (a: V, b: V): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const dot = (a: V, b: V) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const len = (a: V) => Math.sqrt(dot(a, a));

/** Draw calls one boom costs: pedestal, two links, elbow, end plate and its key label. */
export const BOOM_DRAW_CALLS = 6;

/**
 * Where the elbow of a two-link boom is when its base is at `base` and its tip at `tip`: two links of
 * half the reach each, bent away from the base–tip line towards `up` (or, when that line is along
 * `up`, towards the first axis it is not along). Out of reach, the boom is straight, pointing at the
 * tip, and the elbow sits half a reach along it.
 */
export function boomElbow(base: V, tip: V, reachM: number, up: V = [0, 0, 1]): Vec3 {
  const half = reachM / 2;
  const d = sub(tip, base);
  const dist = len(d);
  if (dist < 1e-9) return [base[0] + up[0] * half, base[1] + up[1] * half, base[2] + up[2] * half];
  const u: Vec3 = [d[0] / dist, d[1] / dist, d[2] / dist];
  if (dist >= reachM) return [base[0] + u[0] * half, base[1] + u[1] * half, base[2] + u[2] * half];
  // the part of `up` across the base–tip line; another axis when `up` is along it
  let n = sub(
    up,
    u.map((c) => c * dot(up, u)),
  );
  if (len(n) < 1e-6) {
    const axis: Vec3 = Math.abs(u[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
    n = sub(
      axis,
      u.map((c) => c * dot(axis, u)),
    );
  }
  const nl = len(n);
  const rise = Math.sqrt(Math.max(0, half * half - (dist / 2) * (dist / 2)));
  return [
    base[0] + d[0] / 2 + (n[0] / nl) * rise,
    base[1] + d[1] / 2 + (n[1] / nl) * rise,
    base[2] + d[2] / 2 + (n[2] / nl) * rise,
  ];
}

/** Where an arm nobody rides is drawn: folded, its tip at 40 % of the reach, out along +x and up. */
export function boomRestTip(base: V, reachM: number): Vec3 {
  const r = (0.4 * reachM) / Math.SQRT2;
  return [base[0] + r, base[1], base[2] + r];
}
