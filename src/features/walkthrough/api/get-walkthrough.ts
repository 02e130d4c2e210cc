import { queryOptions, useQuery } from '@tanstack/react-query';
import type { WalkthroughDetail } from '@shared/schemas/walkthrough';
import { api } from '@/lib/api-client';
import { walkthroughKeys } from './keys';

export function getWalkthrough(id: number): Promise<WalkthroughDetail> {
  return api.get(`/walkthroughs/${id}`);
}

export const getWalkthroughQueryOptions = (id: number) =>
  queryOptions({ queryKey: walkthroughKeys.detail(id), queryFn: () => getWalkthrough(id) });

export function useWalkthrough(id: number) {
  return useQuery(getWalkthroughQueryOptions(id));
}
