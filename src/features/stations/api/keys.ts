export const stationKeys = {
  all: ['stations'] as const,
  lists: () => [...stationKeys.all, 'list'] as const,
  list: () => [...stationKeys.lists()] as const,
  details: () => [...stationKeys.all, 'detail'] as const,
  graph: (id: number) => [...stationKeys.details(), id, 'graph'] as const,
};
