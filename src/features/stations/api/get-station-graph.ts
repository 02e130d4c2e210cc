import { queryOptions, useQuery } from '@tanstack/react-query';
import { fromGraphColumns, type GraphColumns } from '@shared/compute/graph-columns';
import type { StationGraph } from '@shared/schemas/station-edits';
import { api } from '@/lib/api-client';
import { stationKeys } from './keys';

/**
 * The station graph, read in columns (parsed several times faster than one object per node, and
 * smaller on the wire) and turned back into the graph endpoint's shape; the 3D view draws from the
 * typed arrays kept beside it (graphArraysOf).
 */
export async function getStationGraph(id: number): Promise<StationGraph> {
  return fromGraphColumns(await api.get<GraphColumns>(`/stations/${id}/graph/columns`));
}

export const getStationGraphQueryOptions = (id: number) =>
  queryOptions({ queryKey: stationKeys.graph(id), queryFn: () => getStationGraph(id) });

export function useStationGraph(id: number) {
  return useQuery(getStationGraphQueryOptions(id));
}
