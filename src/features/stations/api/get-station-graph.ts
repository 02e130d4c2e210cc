import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StationGraph } from '@shared/schemas/station-edits';
import { api } from '@/lib/api-client';
import { stationKeys } from './keys';

export function getStationGraph(id: number): Promise<StationGraph> {
  return api.get(`/stations/${id}/graph`);
}

export const getStationGraphQueryOptions = (id: number) =>
  queryOptions({ queryKey: stationKeys.graph(id), queryFn: () => getStationGraph(id) });

export function useStationGraph(id: number) {
  return useQuery(getStationGraphQueryOptions(id));
}
