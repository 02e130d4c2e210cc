import { SignInInputSchema, type User } from '@shared/schemas/auth';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Form, useZodForm } from '@/components/ui/form';
import { FormError } from '@/components/ui/form-error';
import { Input } from '@/components/ui/input';
import { useSignIn } from '../api/sign-in';

export function SignInForm({ onSuccess }: { onSuccess: (user: User) => void }) {
  const signIn = useSignIn({ onSuccess });
  const form = useZodForm(SignInInputSchema, { defaultValues: { email: '', password: '' } });
  const {
    register,
    formState: { errors },
  } = form;

  return (
    <Form form={form} onSubmit={(values) => signIn.mutate(values)}>
      <FormError error={signIn.error} fallback="Signing in failed. Retry in a moment." />
      <Field label="E-mail" error={errors.email?.message}>
        <Input type="email" autoComplete="username" autoFocus {...register('email')} />
      </Field>
      <Field label="Password" error={errors.password?.message}>
        <Input type="password" autoComplete="current-password" {...register('password')} />
      </Field>
      <Button type="submit" className="w-full" isLoading={signIn.isPending}>
        Sign in
      </Button>
    </Form>
  );
}
