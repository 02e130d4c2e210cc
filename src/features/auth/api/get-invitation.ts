import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { invitationKeys } from './keys';

export interface Invitation {
  email: string;
  name: string;
}

export function getInvitation(token: string): Promise<Invitation> {
  return api.get(`/auth/invitations/${encodeURIComponent(token)}`);
}

export const getInvitationQueryOptions = (token: string) =>
  queryOptions({
    queryKey: invitationKeys.detail(token),
    queryFn: () => getInvitation(token),
    staleTime: Infinity,
  });
