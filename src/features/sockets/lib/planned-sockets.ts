import type { SocketPlanResult } from '@shared/schemas/sockets';
import type { Vec3 } from '@shared/schemas/station';
import { REACH_TOLERANCE_M } from '@shared/compute/reach';

export interface PlanTarget {
  label: string;
  position: Vec3;
  /** a worksite node, or a point picked on the model */
  nodeKey?: string;
}

export interface PlannedSocketView {
  index: number;
  /** the existing socket's key; new sockets have none until accepted */
  key?: string;
  isNew: boolean;
  /** "PB3-S02", or "New 1" for the first new socket */
  name: string;
  position: Vec3;
  normal: Vec3;
  /** the centre of the work envelope, p + n·h */
  workPoint: Vec3;
  radiusM: number;
  /** indices of the targets this socket serves */
  targets: number[];
}

export interface SocketNodeLike {
  key: string;
  position: Vec3;
  normal?: Vec3;
}

export interface ReachSettings {
  standOffM: number;
  radiusM: number;
}

const unit = (v: Vec3): Vec3 => {
  const len = Math.hypot(v[0], v[1], v[2]);
  return [v[0] / len, v[1] / len, v[2] / len];
};

/** The plan's sockets with their envelopes (centre p + n·h, radius R) and the targets each serves. */
export function plannedSocketViews(
  result: SocketPlanResult,
  nodes: ReadonlyMap<string, SocketNodeLike>,
  reach: ReachSettings,
): PlannedSocketView[] {
  let newCount = 0;
  return result.sockets.map((s, index) => {
    const existing = typeof s === 'string' ? nodes.get(s) : undefined;
    if (typeof s === 'string' && !existing?.normal)
      throw new Error(`the plan names socket ${s}, which the loaded model does not have`);
    const position = typeof s === 'string' ? existing!.position : s.position;
    const normal = unit(typeof s === 'string' ? existing!.normal! : s.normal);
    const name = typeof s === 'string' ? s : `New ${++newCount}`;
    return {
      index,
      ...(typeof s === 'string' ? { key: s } : {}),
      isNew: typeof s !== 'string',
      name,
      position,
      normal,
      workPoint: [0, 1, 2].map((i) => position[i] + normal[i] * reach.standOffM) as Vec3,
      radiusM: reach.radiusM,
      targets: result.assignments.filter((a) => a.socket === index).map((a) => a.target),
    };
  });
}

export interface AssignmentRow {
  target: number;
  targetLabel: string;
  socketName: string | null;
  distanceM: number | null;
  reachable: boolean;
  yawDeg: number | null;
  yawSetDeg: number | null;
  pitchDeg: number | null;
  pitchSetDeg: number | null;
}

/** One row per target, in target order; an uncovered target has no socket and is not reachable. */
export function assignmentRows(
  result: SocketPlanResult,
  targets: readonly PlanTarget[],
  sockets: readonly PlannedSocketView[],
): AssignmentRow[] {
  const byTarget = new Map(result.assignments.map((a) => [a.target, a]));
  return targets.map((t, i) => {
    const a = byTarget.get(i);
    return {
      target: i,
      targetLabel: t.label,
      socketName: a ? sockets[a.socket].name : null,
      distanceM: a?.distanceM ?? null,
      reachable: a !== undefined && a.distanceM <= sockets[a.socket].radiusM + REACH_TOLERANCE_M,
      yawDeg: a?.yawDeg ?? null,
      yawSetDeg: a?.yawSetDeg ?? null,
      pitchDeg: a?.pitchDeg ?? null,
      pitchSetDeg: a?.pitchSetDeg ?? null,
    };
  });
}

/**
 * The body of the accept request: only the new sockets, with the targets they serve as notes (the
 * server names and labels them after their bay, like the model's own sockets).
 */
export function newSocketsToAccept(sockets: readonly PlannedSocketView[], targets: readonly PlanTarget[]) {
  return sockets
    .filter((s) => s.isNew)
    .map((s) => ({
      position: s.position,
      normal: s.normal,
      notes: `Planned to serve ${s.targets.map((t) => targets[t].label).join(', ') || 'no target'}.`.slice(
        0,
        4000,
      ),
    }));
}

export function exactnessText(result: SocketPlanResult): string {
  return result.exact
    ? `exact: the fewest sockets among ${result.candidateCount} candidates`
    : `greedy: close to the fewest, more than 30 candidates could serve these targets (${result.candidateCount} in all), or the exact search was cut short`;
}
