import type { QueryClient } from '@tanstack/react-query';
import { useLoaderData, useNavigate, type LoaderFunctionArgs } from 'react-router-dom';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { Alert } from '@/components/ui/alert';
import { TextLink } from '@/components/ui/text-link';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { getInvitationQueryOptions, type Invitation } from '@/features/auth/api/get-invitation';
import { SetPasswordForm } from '@/features/auth/components/set-password-form';

type LoaderData = { status: 'ok'; token: string; invitation: Invitation } | { status: 'missing' | 'expired' };

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs): Promise<LoaderData> => {
    const token = new URL(request.url).searchParams.get('token');
    if (!token) return { status: 'missing' };
    try {
      const invitation = await queryClient.fetchQuery(getInvitationQueryOptions(token));
      return { status: 'ok', token, invitation };
    } catch (error) {
      if (isApiError(error) && error.status === 404) return { status: 'expired' };
      throw error;
    }
  };

function InvitationForm({ token, invitation }: { token: string; invitation: Invitation }) {
  const navigate = useNavigate();
  return (
    <>
      <p className="mb-5 text-sm text-text-muted">
        Welcome, {invitation.name}. Choose a password for{' '}
        <strong className="text-text-strong">{invitation.email}</strong>.
      </p>
      <SetPasswordForm
        token={token}
        email={invitation.email}
        onSuccess={() => navigate(paths.home.getHref(), { replace: true })}
      />
    </>
  );
}

export default function SetPasswordRoute() {
  const data = useLoaderData() as LoaderData;
  return (
    <AuthLayout title="Set your password">
      {data.status === 'ok' ? (
        <InvitationForm token={data.token} invitation={data.invitation} />
      ) : (
        <>
          <Alert tone="caution" title="This link cannot be used">
            {data.status === 'missing'
              ? 'The address has no invitation token. Open the link from your invitation e-mail.'
              : 'The invitation has expired or was already used. Ask your admin to send it again.'}
          </Alert>
          <TextLink to={paths.signIn.getHref()} className="mt-6">
            Go to sign-in
          </TextLink>
        </>
      )}
    </AuthLayout>
  );
}
