import { z } from 'zod';
import { PasswordSchema, type User } from '@shared/schemas/auth';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Form, useZodForm } from '@/components/ui/form';
import { FormError } from '@/components/ui/form-error';
import { Input } from '@/components/ui/input';
import { useSetPassword } from '../api/set-password';

const SetPasswordFormSchema = z
  .object({ password: PasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'the two passwords differ' });

interface SetPasswordFormProps {
  token: string;
  email: string;
  onSuccess: (user: User) => void;
}

export function SetPasswordForm({ token, email, onSuccess }: SetPasswordFormProps) {
  const setPassword = useSetPassword({ onSuccess });
  const form = useZodForm(SetPasswordFormSchema, { defaultValues: { password: '', confirm: '' } });
  const {
    register,
    formState: { errors },
  } = form;

  return (
    <Form form={form} onSubmit={({ password }) => setPassword.mutate({ token, password })}>
      <FormError error={setPassword.error} fallback="Setting the password failed. Retry in a moment." />
      {/* lets password managers file the new password under the right account */}
      <input type="email" name="email" autoComplete="username" value={email} readOnly hidden />
      <Field
        label="New password"
        error={errors.password?.message}
        hint="At least 10 characters; a long passphrase is best."
      >
        <Input type="password" autoComplete="new-password" autoFocus {...register('password')} />
      </Field>
      <Field label="Repeat the password" error={errors.confirm?.message}>
        <Input type="password" autoComplete="new-password" {...register('confirm')} />
      </Field>
      <Button type="submit" className="w-full" isLoading={setPassword.isPending}>
        Set password and sign in
      </Button>
    </Form>
  );
}
