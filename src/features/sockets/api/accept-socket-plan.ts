import type { QueryKey } from '@tanstack/react-query';
import type {
  AcceptSocketPlanInput,
  AcceptSocketPlanPreview,
  AcceptSocketPlanResult,
} from '@shared/schemas/sockets';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';

export function acceptSocketPlan({
  stationId,
  ...body
}: AcceptSocketPlanInput & { stationId: number }): Promise<AcceptSocketPlanResult> {
  return api.post(`/stations/${stationId}/socket-plan/accept`, body);
}

/** What the accept would add (keys, labels, joins) and the reviewed plans it touches; nothing is written. */
export function previewSocketPlanAccept({
  stationId,
  ...body
}: AcceptSocketPlanInput & { stationId: number }): Promise<AcceptSocketPlanPreview> {
  return api.post(`/stations/${stationId}/socket-plan/accept?dryRun=1`, body);
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
