import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/layouts/app-layout';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/form-error';
import { PageSpinner } from '@/components/ui/spinner';
import { requirePermission } from '@/lib/authorization';
import { useClearMailbox } from '@/features/mailbox/api/clear-mailbox';
import { getMailboxQueryOptions, useMailbox } from '@/features/mailbox/api/get-mailbox';
import { MailboxView } from '@/features/mailbox/components/mailbox-view';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'mailbox:read');
    await queryClient.ensureQueryData(getMailboxQueryOptions());
    return null;
  };

export default function MailboxRoute() {
  const mailbox = useMailbox();
  const clear = useClearMailbox();
  const error = mailbox.error ?? clear.error;

  return (
    <>
      <PageHeader
        title="Mailbox"
        description="Mail the local development mail service has received. Nothing here left this machine."
        actions={
          <>
            <Button variant="secondary" isLoading={mailbox.isFetching} onClick={() => void mailbox.refetch()}>
              Refresh
            </Button>
            <Button
              variant="danger"
              disabled={!mailbox.data?.length}
              isLoading={clear.isPending}
              onClick={() => clear.mutate()}
            >
              Clear mailbox
            </Button>
          </>
        }
      />
      <FormError error={error} fallback="The mailbox could not be read." className="mb-4" />
      {mailbox.data ? <MailboxView messages={mailbox.data} /> : <PageSpinner />}
    </>
  );
}
