export interface WalkthroughListFilters {
  planId?: number;
  stationId?: number;
}

export const walkthroughKeys = {
  all: ['walkthroughs'] as const,
  lists: () => [...walkthroughKeys.all, 'list'] as const,
  list: (filters: WalkthroughListFilters = {}) => [...walkthroughKeys.lists(), filters] as const,
  details: () => [...walkthroughKeys.all, 'detail'] as const,
  detail: (id: number) => [...walkthroughKeys.details(), id] as const,
};
