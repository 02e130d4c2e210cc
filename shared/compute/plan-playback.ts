import type { CrewMember, Plan } from '../schemas/plan';
import type { Vec3 } from '../schemas/station';
import type { PlanPlayback } from '../schemas/walkthrough';
import type { Timeline } from './day/types';
import { planWalkthrough, type CrewTrack } from './walkthrough';

const CREW: readonly CrewMember[] = ['EV1', 'EV2'];

/** A station node as the playback reads it: where it is, and a socket's outward normal. */
export interface PlaybackNode {
  key: string;
  position: Vec3 | readonly number[];
  normal?: Vec3 | readonly number[];
}

type PlaybackDay = Pick<
  Timeline,
  'crew' | 'routes' | 'endSeconds' | 'equipment' | 'timeLimitSeconds' | 'nightWindows' | 'warnings'
> &
  Partial<Pick<Timeline, 'arms'>>;

/**
 * A plan's day as a playback — crew tracks, tether states, items and installed restraints on the
 * clock — derived from the timeline the engine computed, nothing recomputed. The walkthrough and
 * the plan screen both play it. `positions` holds only the nodes the playback names.
 */
export function planPlaybackOf(
  timeline: PlaybackDay,
  plan: Pick<Plan, 'tasks' | 'crew'>,
  airlockKey: string,
  nodes: readonly PlaybackNode[],
): PlanPlayback {
  const byKey = new Map(nodes.map((n) => [n.key, n]));
  const position = (key: string): Vec3 => (byKey.get(key)?.position as Vec3 | undefined) ?? [0, 0, 0];
  const walk = planWalkthrough(timeline, plan.tasks, airlockKey, position);
  const placed = new Set(
    timeline.equipment.flatMap((e) =>
      e.states.flatMap((s) => (s.where.kind === 'at' || s.where.kind === 'installed' ? [s.where.node] : [])),
    ),
  );
  const normals: Record<string, Vec3> = {};
  for (const key of placed) {
    const normal = byKey.get(key)?.normal;
    if (normal) normals[key] = normal as Vec3;
  }
  return {
    kind: 'plan',
    crews: walk.crews,
    crewNames: { EV1: plan.crew.EV1.name, EV2: plan.crew.EV2.name },
    tetherLengthM: { EV1: plan.crew.EV1.tetherLengthM, EV2: plan.crew.EV2.tetherLengthM },
    endSeconds: walk.endSeconds,
    timeLimitSeconds: timeline.timeLimitSeconds,
    airlockKey,
    nightWindows: timeline.nightWindows,
    positions: positionsOf(
      byKey,
      CREW.map((c) => walk.crews[c]),
      [airlockKey, ...placed],
    ),
    equipment: timeline.equipment,
    normals,
    arms: timeline.arms ?? [],
    warnings: timeline.warnings.map((w) => w.message),
  };
}

/** Every node key the tracks name (and `extra`), with its position, to draw anchors, tethers and items. */
export function positionsOf(
  byKey: ReadonlyMap<string, PlaybackNode>,
  tracks: readonly CrewTrack[],
  extra: readonly string[] = [],
): Record<string, Vec3> {
  const out: Record<string, Vec3> = {};
  const add = (key: string | undefined) => {
    if (!key) return;
    const n = byKey.get(key);
    if (n) out[key] = n.position as Vec3;
  };
  extra.forEach(add);
  for (const t of tracks) {
    for (const s of t.steps)
      [s.nodeKey, s.fromKey, s.anchorKey, s.clipKey, s.releaseKey, s.socketKey].forEach(add);
  }
  return out;
}
