import { queryOptions, useQuery } from '@tanstack/react-query';
import type { FlownEstimate } from '@shared/compute/day/flown-estimates';
import { api } from '@/lib/api-client';
import { planKeys } from './keys';

/** What each kind of task took at each worksite of the station in runs that ended. */
export function getFlownEstimates(stationId: number): Promise<FlownEstimate[]> {
  return api.get(`/stations/${stationId}/flown-estimates`);
}

export const getFlownEstimatesQueryOptions = (stationId: number) =>
  queryOptions({
    queryKey: planKeys.flownEstimates(stationId),
    queryFn: () => getFlownEstimates(stationId),
  });

export function useFlownEstimates(stationId: number) {
  return useQuery(getFlownEstimatesQueryOptions(stationId));
}
