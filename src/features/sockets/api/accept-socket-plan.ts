import type { QueryKey } from '@tanstack/react-query';
import type { StationNode, Vec3 } from '@shared/schemas/station';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';

export interface AcceptSocketPlanInput {
  stationId: number;
  /** the station version the plan was computed on: a later edit makes the accept a 409 */
  version: number;
  sockets: { position: Vec3; normal: Vec3; key?: string; label?: string }[];
}

export interface AcceptedSocket extends StationNode {
  /** the handrail node the new socket is joined to by a hop */
  joinedTo: string;
  hopM: number;
}

export interface AcceptSocketPlanResult {
  version: number;
  sockets: AcceptedSocket[];
}

export function acceptSocketPlan({
  stationId,
  ...body
}: AcceptSocketPlanInput): Promise<AcceptSocketPlanResult> {
  return api.post(`/stations/${stationId}/socket-plan/accept`, body);
}

/**
 * `invalidates`: the caller's queries the new sockets make stale (the station graph). Socket plans
 * and routes need no invalidation: they are keyed by station version, which the accept bumps.
 */
export function useAcceptSocketPlan({
  invalidates = [],
  onSuccess,
}: {
  invalidates?: readonly QueryKey[];
  onSuccess?: (result: AcceptSocketPlanResult) => void;
}) {
  return useInvalidatingMutation({
    mutationFn: acceptSocketPlan,
    invalidates,
    onSuccess,
  });
}
