import type { SocketPlanRequest } from '@shared/schemas/sockets';

/** Socket plans are computations, keyed by station id, station version and the request. */
export const socketKeys = {
  all: ['sockets'] as const,
  station: (stationId: number) => [...socketKeys.all, stationId] as const,
  plan: (stationId: number, version: number, request: SocketPlanRequest) =>
    [...socketKeys.station(stationId), version, 'plan', request] as const,
};
