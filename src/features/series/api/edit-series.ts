import type { CreateSeriesInput, SeriesView, UpdateSeriesInput } from '@shared/schemas/series';
import { api } from '@/lib/api-client';
import { useInvalidatingMutation } from '@/lib/mutation';
import { seriesKeys } from './get-series';

export function createSeries(input: CreateSeriesInput): Promise<SeriesView> {
  return api.post('/series', input);
}

/** Renames the series or gives its EVAs in their new order (added and removed plans included). */
export function updateSeries({ id, ...input }: UpdateSeriesInput & { id: number }): Promise<SeriesView> {
  return api.patch(`/series/${id}`, input);
}

export function useCreateSeries({ onSuccess }: { onSuccess?: (series: SeriesView) => void } = {}) {
  return useInvalidatingMutation({ mutationFn: createSeries, invalidates: [seriesKeys.all], onSuccess });
}

export function useUpdateSeries() {
  return useInvalidatingMutation({ mutationFn: updateSeries, invalidates: [seriesKeys.all] });
}
