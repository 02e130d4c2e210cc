import { useState } from 'react';
import type { Role } from '@shared/auth/permissions';
import type { UserAdminView } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/form-error';
import { Select } from '@/components/ui/select';
import { Table, Td, Th } from '@/components/ui/table';
import { formatDateTime } from '@/lib/format';
import { useResendInvite } from '../api/resend-invite';
import { useUpdateUser } from '../api/update-user';
import { ROLE_OPTIONS } from './role-options';

function StatusBadge({ person }: { person: UserAdminView }) {
  if (person.disabled) return <Badge tone="danger">Disabled</Badge>;
  if (person.invitePending) return <Badge tone="review">Invite pending</Badge>;
  return <Badge tone="approved">Active</Badge>;
}

export function PeopleTable({ people, currentUserId }: { people: UserAdminView[]; currentUserId: number }) {
  const [notice, setNotice] = useState<string | null>(null);
  const update = useUpdateUser({ onSuccess: (user) => setNotice(`Saved ${user.name}.`) });
  const resend = useResendInvite({
    onSuccess: (id) =>
      setNotice(`Invitation sent again to ${people.find((p) => p.id === id)?.email ?? 'them'}.`),
  });
  const error = update.error ?? resend.error;
  const startChange = () => {
    setNotice(null);
    update.reset();
    resend.reset();
  };

  return (
    <div className="space-y-3">
      <FormError error={error} fallback="The change could not be saved." />
      <div aria-live="polite">{!error && notice && <Alert tone="success">{notice}</Alert>}</div>
      <Table caption="People with access to Tetherwise">
        <thead>
          <tr>
            <Th>Name</Th>
            <Th>E-mail</Th>
            <Th>Role</Th>
            <Th>Status</Th>
            <Th>Added</Th>
            <Th>
              <span className="sr-only">Actions</span>
            </Th>
          </tr>
        </thead>
        <tbody>
          {people.map((person) => {
            const isSelf = person.id === currentUserId;
            const busy =
              (update.isPending && update.variables?.id === person.id) ||
              (resend.isPending && resend.variables === person.id);
            return (
              <tr key={person.id} data-testid={`person-${person.email}`}>
                <Td className="font-medium text-text-strong">
                  {person.name}
                  {isSelf && <span className="ml-2 text-xs text-text-muted">(you)</span>}
                </Td>
                <Td>{person.email}</Td>
                <Td>
                  <Select
                    aria-label={`Role of ${person.name}`}
                    options={ROLE_OPTIONS}
                    value={person.role}
                    disabled={isSelf || busy}
                    title={isSelf ? 'You cannot change your own role' : undefined}
                    className="h-9 w-36"
                    onChange={(event) => {
                      startChange();
                      update.mutate({ id: person.id, data: { role: event.target.value as Role } });
                    }}
                  />
                </Td>
                <Td>
                  <StatusBadge person={person} />
                </Td>
                <Td className="text-text-muted">{formatDateTime(person.createdAt)}</Td>
                <Td>
                  <div className="flex justify-end gap-2">
                    {person.invitePending && !person.disabled && (
                      <Button
                        variant="secondary"
                        size="sm"
                        disabled={busy}
                        onClick={() => {
                          startChange();
                          resend.mutate(person.id);
                        }}
                      >
                        Resend invite
                      </Button>
                    )}
                    {!isSelf && (
                      <Button
                        variant={person.disabled ? 'secondary' : 'ghost'}
                        size="sm"
                        disabled={busy}
                        aria-label={`${person.disabled ? 'Enable' : 'Disable'} ${person.name}`}
                        onClick={() => {
                          startChange();
                          update.mutate({ id: person.id, data: { disabled: !person.disabled } });
                        }}
                      >
                        {person.disabled ? 'Enable' : 'Disable'}
                      </Button>
                    )}
                  </div>
                </Td>
              </tr>
            );
          })}
        </tbody>
      </Table>
    </div>
  );
}
