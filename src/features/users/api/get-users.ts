import { queryOptions, useQuery } from '@tanstack/react-query';
import type { UserAdminView } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { userKeys } from './keys';

export function getUsers(): Promise<UserAdminView[]> {
  return api.get('/users');
}

export const getUsersQueryOptions = () => queryOptions({ queryKey: userKeys.list(), queryFn: getUsers });

export function useUsers() {
  return useQuery(getUsersQueryOptions());
}
