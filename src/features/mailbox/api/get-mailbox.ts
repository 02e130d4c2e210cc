import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MailboxMessage } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { mailboxKeys } from './keys';

export function getMailbox(): Promise<MailboxMessage[]> {
  return api.get('/mailbox');
}

// mail arrives from elsewhere (invitations, reviews), so never trust a cached list on mount
export const getMailboxQueryOptions = () =>
  queryOptions({ queryKey: mailboxKeys.list(), queryFn: getMailbox, staleTime: 0 });

export function useMailbox() {
  return useQuery(getMailboxQueryOptions());
}
