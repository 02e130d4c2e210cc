import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Annotation } from '@shared/schemas/annotations';
import { api } from '@/lib/api-client';
import { annotationKeys } from './keys';

/** Every note on the station, newest first, with replies and attachments: the list, threads and pins share it. */
export function getAnnotations(stationId: number): Promise<Annotation[]> {
  return api.get(`/stations/${stationId}/annotations`);
}

export const getAnnotationsQueryOptions = (stationId: number) =>
  queryOptions({ queryKey: annotationKeys.list(stationId), queryFn: () => getAnnotations(stationId) });

export function useAnnotations(stationId: number) {
  return useQuery(getAnnotationsQueryOptions(stationId));
}
