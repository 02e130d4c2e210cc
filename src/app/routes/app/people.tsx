import { useState } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/layouts/app-layout';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { PageSpinner } from '@/components/ui/spinner';
import { requirePermission, useUser } from '@/lib/authorization';
import { getUsersQueryOptions, useUsers } from '@/features/users/api/get-users';
import { InviteUserForm } from '@/features/users/components/invite-user-form';
import { PeopleTable } from '@/features/users/components/people-table';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'users:manage');
    await queryClient.ensureQueryData(getUsersQueryOptions());
    return null;
  };

export default function PeopleRoute() {
  const { data: me } = useUser();
  const people = useUsers();
  const [inviting, setInviting] = useState(false);
  const [invited, setInvited] = useState<string | null>(null);

  return (
    <>
      <PageHeader
        title="People"
        description="Invite colleagues, set their role and disable accounts that should no longer sign in."
        actions={
          <Button
            onClick={() => {
              setInvited(null);
              setInviting(true);
            }}
          >
            Invite a person
          </Button>
        }
      />
      <div aria-live="polite">
        {invited && (
          <Alert tone="success" className="mb-4">
            Invitation sent to {invited}. The set-password link is in their e-mail.
          </Alert>
        )}
      </div>
      <Panel>
        {people.data && me ? <PeopleTable people={people.data} currentUserId={me.id} /> : <PageSpinner />}
      </Panel>
      <Dialog open={inviting} title="Invite a person" onClose={() => setInviting(false)}>
        <InviteUserForm
          onCancel={() => setInviting(false)}
          onSuccess={(user) => {
            setInviting(false);
            setInvited(user.email);
          }}
        />
      </Dialog>
    </>
  );
}
