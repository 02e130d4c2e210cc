import { queryOptions } from '@tanstack/react-query';
import type { SeriesListItem, SeriesView } from '@shared/schemas/series';
import { api } from '@/lib/api-client';

export const seriesKeys = {
  all: ['series'] as const,
  lists: () => [...seriesKeys.all, 'list'] as const,
  detail: (id: number) => [...seriesKeys.all, 'detail', id] as const,
};

export const getSeriesList = (): Promise<SeriesListItem[]> => api.get('/series');
export const getSeries = (id: number): Promise<SeriesView> => api.get(`/series/${id}`);

export const getSeriesListQueryOptions = () =>
  queryOptions({ queryKey: seriesKeys.lists(), queryFn: getSeriesList });
export const getSeriesQueryOptions = (id: number) =>
  queryOptions({ queryKey: seriesKeys.detail(id), queryFn: () => getSeries(id) });
