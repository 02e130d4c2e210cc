import { queryOptions, useQuery } from '@tanstack/react-query';
import { fromGraphColumns, type GraphColumns } from '@shared/compute/graph-columns';
import type { StationGraph } from '@shared/schemas/station-edits';
import { api } from '@/lib/api-client';
import { stationKeys } from './keys';

/**
 * The station graph, read in columns (parsed several times faster than one object per node, and
 * smaller on the wire) and turned back into the graph endpoint's shape, its node and edge objects
 * made only when first read; the 3D view, the node finder and the tables read the typed arrays kept
 * beside it (graphArraysOf).
 */
export async function getStationGraph(id: number): Promise<StationGraph> {
  return fromGraphColumns(await api.get<GraphColumns>(`/stations/${id}/graph/columns`));
}

export const getStationGraphQueryOptions = (id: number) =>
  queryOptions({
    queryKey: stationKeys.graph(id),
    queryFn: () => getStationGraph(id),
    // a new version is a new graph: comparing it item by item with the last would make every node
    // and edge object the graph otherwise makes only when asked
    structuralSharing: false,
  });

export function useStationGraph(id: number) {
  return useQuery(getStationGraphQueryOptions(id));
}
