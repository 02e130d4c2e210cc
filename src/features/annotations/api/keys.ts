export const annotationKeys = {
  all: ['annotations'] as const,
  lists: () => [...annotationKeys.all, 'list'] as const,
  list: (stationId: number) => [...annotationKeys.lists(), stationId] as const,
};
