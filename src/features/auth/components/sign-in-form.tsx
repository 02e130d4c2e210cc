import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { SignInInputSchema, type SignInInput, type User } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { isApiError } from '@/lib/api-client';
import { useSignIn } from '../api/sign-in';

export function SignInForm({ onSuccess }: { onSuccess: (user: User) => void }) {
  const signIn = useSignIn({ onSuccess });
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm<SignInInput>({
    resolver: zodResolver(SignInInputSchema),
    defaultValues: { email: '', password: '' },
  });
  const serverError = signIn.error
    ? isApiError(signIn.error)
      ? signIn.error.message
      : 'Signing in failed. Retry in a moment.'
    : null;

  return (
    <form noValidate onSubmit={handleSubmit((values) => signIn.mutate(values))} className="space-y-4">
      <div aria-live="assertive">{serverError && <Alert tone="danger">{serverError}</Alert>}</div>
      <Field label="E-mail" error={errors.email?.message}>
        <Input type="email" autoComplete="username" autoFocus {...register('email')} />
      </Field>
      <Field label="Password" error={errors.password?.message}>
        <Input type="password" autoComplete="current-password" {...register('password')} />
      </Field>
      <Button type="submit" className="w-full" isLoading={signIn.isPending}>
        Sign in
      </Button>
    </form>
  );
}
