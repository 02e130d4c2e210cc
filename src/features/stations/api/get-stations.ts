import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StationSummary } from '@shared/schemas/station-edits';
import { api } from '@/lib/api-client';
import { stationKeys } from './keys';

export function getStations(): Promise<StationSummary[]> {
  return api.get('/stations');
}

export const getStationsQueryOptions = () =>
  queryOptions({ queryKey: stationKeys.list(), queryFn: getStations });

export function useStations() {
  return useQuery(getStationsQueryOptions());
}
