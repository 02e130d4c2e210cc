import { queryOptions, useQueries } from '@tanstack/react-query';
import { ROUTE_MODES, type RouteMode, type RouteRequest, type RouteResult } from '@shared/schemas/route';
import { api } from '@/lib/api-client';
import { routeKeys } from './keys';

export type RouteParams = Omit<RouteRequest, 'mode'>;

export function getRoute(
  stationId: number,
  request: RouteRequest,
  signal?: AbortSignal,
): Promise<RouteResult> {
  return api.post(`/stations/${stationId}/routes`, request, { signal });
}

// a route of one station version never changes, so it is never refetched
export const getRouteQueryOptions = (stationId: number, version: number, request: RouteRequest) =>
  queryOptions({
    queryKey: routeKeys.route(stationId, version, request),
    queryFn: ({ signal }) => getRoute(stationId, request, signal),
    staleTime: Infinity,
  });

/** The same from/to/tether in all three modes, one query each, for the side-by-side comparison. */
export function useRouteComparison(stationId: number, version: number, params: RouteParams | null) {
  return useQueries({
    queries: ROUTE_MODES.map((mode) => ({
      ...getRouteQueryOptions(stationId, version, { ...(params ?? { from: '', to: '' }), mode }),
      enabled: params !== null,
    })),
    combine: (results) => ({
      byMode: Object.fromEntries(ROUTE_MODES.map((mode, i) => [mode, results[i]])) as Record<
        RouteMode,
        (typeof results)[number]
      >,
      isFetching: results.some((r) => r.isFetching),
    }),
  });
}
