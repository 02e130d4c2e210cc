import type { QueryClient } from '@tanstack/react-query';
import { redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { safeRedirectTo } from '@/config/paths';
import { userQueryOptions } from '@/lib/authorization';
import { SignInForm } from '@/features/auth/components/sign-in-form';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const user = await queryClient.ensureQueryData(userQueryOptions());
    if (user) throw redirect(safeRedirectTo(new URL(request.url).searchParams.get('redirectTo')));
    return null;
  };

export default function SignInRoute() {
  const navigate = useNavigate();
  const [searchParams] = useSearchParams();
  const redirectTo = safeRedirectTo(searchParams.get('redirectTo'));
  return (
    <AuthLayout title="Sign in">
      <SignInForm onSuccess={() => navigate(redirectTo, { replace: true })} />
      <p className="mt-6 text-sm text-text-muted">
        New here? Your admin sends you an invitation by e-mail with a link to set your password.
      </p>
    </AuthLayout>
  );
}
