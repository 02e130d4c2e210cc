import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SocketPlanRequest, SocketPlanResult } from '@shared/schemas/sockets';
import { api } from '@/lib/api-client';
import { socketKeys } from './keys';

export function getSocketPlan(
  stationId: number,
  request: SocketPlanRequest,
  signal?: AbortSignal,
): Promise<SocketPlanResult> {
  return api.post(`/stations/${stationId}/socket-plan`, request, { signal });
}

export const getSocketPlanQueryOptions = (stationId: number, version: number, request: SocketPlanRequest) =>
  queryOptions({
    queryKey: socketKeys.plan(stationId, version, request),
    queryFn: ({ signal }) => getSocketPlan(stationId, request, signal),
    staleTime: Infinity,
  });

/** The plan for `request` on station version `version`; nothing is asked while `request` is null. */
export function useSocketPlan(stationId: number, version: number, request: SocketPlanRequest | null) {
  return useQuery({
    ...getSocketPlanQueryOptions(stationId, version, request ?? { targets: [] }),
    enabled: request !== null,
  });
}
