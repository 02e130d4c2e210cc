import type { RouteRequest } from '@shared/schemas/route';

/** Computed routes are keyed by station id, station version and the request, so an edit recomputes them. */
export const routeKeys = {
  all: ['routes'] as const,
  station: (stationId: number) => [...routeKeys.all, stationId] as const,
  version: (stationId: number, version: number) => [...routeKeys.station(stationId), version] as const,
  route: (stationId: number, version: number, request: RouteRequest) =>
    [...routeKeys.version(stationId, version), request] as const,
};
