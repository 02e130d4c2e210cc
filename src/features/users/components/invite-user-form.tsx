import { InviteUserInputSchema, type UserAdminView } from '@shared/schemas/auth';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
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
  const form = useZodForm(InviteUserInputSchema, {
    defaultValues: { email: '', name: '', role: 'viewer' },
  });
  const {
    register,
    formState: { errors },
  } = form;

  return (
    <Form form={form} onSubmit={(values) => invite.mutate(values)}>
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
      <FormActions submit="Send invitation" onCancel={onCancel} isLoading={invite.isPending} />
    </Form>
  );
}
