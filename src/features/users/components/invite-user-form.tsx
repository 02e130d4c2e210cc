import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { InviteUserInputSchema, type InviteUserInput, type UserAdminView } from '@shared/schemas/auth';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { FormError } from '@/components/ui/form-error';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { useInviteUser } from '../api/invite-user';
import { ROLE_OPTIONS } from './role-options';

interface InviteUserFormProps {
  onSuccess: (user: UserAdminView) => void;
  onCancel: () => void;
}

export function InviteUserForm({ onSuccess, onCancel }: InviteUserFormProps) {
  const invite = useInviteUser({ onSuccess });
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm<InviteUserInput>({
    resolver: zodResolver(InviteUserInputSchema),
    defaultValues: { email: '', name: '', role: 'viewer' },
  });

  return (
    <form noValidate onSubmit={handleSubmit((values) => invite.mutate(values))} className="space-y-4">
      <FormError error={invite.error} fallback="The invitation could not be sent." />
      <Field label="Name" error={errors.name?.message}>
        <Input autoComplete="off" {...register('name')} />
      </Field>
      <Field label="E-mail" error={errors.email?.message}>
        <Input type="email" autoComplete="off" {...register('email')} />
      </Field>
      <Field label="Role" error={errors.role?.message}>
        <Select options={ROLE_OPTIONS} {...register('role')} />
      </Field>
      <div className="flex justify-end gap-2 pt-2">
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
        <Button type="submit" isLoading={invite.isPending}>
          Send invitation
        </Button>
      </div>
    </form>
  );
}
